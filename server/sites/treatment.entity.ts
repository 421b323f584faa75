import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** A treatment applied to whole plots or to single collars. */
@Entity({ name: 'treatment' })
export class TreatmentEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'text', name: 'code' }) code!: string;
  @Column({ type: 'text', name: 'name', default: '' }) name!: string;
  @Column({ type: 'text', name: 'level' }) level!: 'plot' | 'collar';
  @Column({ type: 'text', name: 'description', default: '' }) description!: string;
}
