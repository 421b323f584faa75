import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** A block of the experimental design (a factor in the analysis). */
@Entity({ name: 'block' })
export class BlockEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'text', name: 'code' }) code!: string;
  @Column({ type: 'text', name: 'name', default: '' }) name!: string;
}
