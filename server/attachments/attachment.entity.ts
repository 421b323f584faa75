import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';
import { bigintAsNumber } from '../core/bigint-column';

/** A file (logger export, photo) owned by a record; the bytes live in object storage under objectKey. */
@Entity({ name: 'attachment' })
export class AttachmentEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'text', name: 'owner_entity' }) ownerEntity!: string;
  @Column({ type: 'uuid', name: 'owner_id' }) ownerId!: string;
  @Column({ type: 'text', name: 'file_name', default: '' }) fileName!: string;
  @Column({ type: 'text', name: 'media_type' }) mediaType!: string;
  @Column({ type: 'bigint', name: 'size_bytes', transformer: bigintAsNumber }) sizeBytes!: number;
  @Column({ type: 'text', name: 'sha256' }) sha256!: string;
  @Column({ type: 'text', name: 'object_key', nullable: true }) objectKey!: string | null;
}
