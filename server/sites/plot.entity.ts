import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** A plot: the replicate of a plot-level treatment. */
@Entity({ name: 'plot' })
export class PlotEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'text', name: 'code' }) code!: string;
  @Column({ type: 'uuid', name: 'block_id', nullable: true }) blockId!: string | null;
  @Column({ type: 'uuid', name: 'treatment_id', nullable: true }) treatmentId!: string | null;
  @Column({ type: 'jsonb', name: 'outline', nullable: true }) outline!: unknown;
}
