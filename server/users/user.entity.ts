import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';
import type { Role } from '../../shared/auth/roles';

@Entity({ name: 'app_user' })
export class UserEntity {
  @PrimaryColumn({ type: 'uuid', name: 'id' })
  id!: string;

  /** Stored lower-case; unique. */
  @Column({ type: 'text', name: 'email', unique: true })
  email!: string;

  @Column({ type: 'text', name: 'display_name' })
  displayName!: string;

  @Column({ type: 'text', name: 'password_hash' })
  passwordHash!: string;

  @Column({ type: 'text', name: 'roles', array: true })
  roles!: Role[];

  @Column({ type: 'boolean', name: 'disabled', default: false })
  disabled!: boolean;

  @CreateDateColumn({ type: 'timestamptz', name: 'created_at' })
  createdAt!: Date;
}
