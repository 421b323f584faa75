import { CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';

/** A user ↔ site membership: crew and leads see only the sites they belong to. */
@Entity({ name: 'site_member' })
export class SiteMemberEntity {
  @PrimaryColumn({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @PrimaryColumn({ type: 'uuid', name: 'user_id' })
  userId!: string;

  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' })
  createdAt!: Date;
}
