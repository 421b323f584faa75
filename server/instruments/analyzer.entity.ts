import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** A gas analyzer unit. */
@Entity({ name: 'analyzer' })
export class AnalyzerEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'text', name: 'name' }) name!: string;
  @Column({ type: 'text', name: 'serial', default: '' }) serial!: string;
  @Column({ type: 'double precision', name: 'range_min_ppm' }) rangeMinPpm!: number;
  @Column({ type: 'double precision', name: 'range_max_ppm' }) rangeMaxPpm!: number;
  /** Stated precision, µmol/mol; null when unknown (the engine then uses a 1 ppm default and says so). */
  @Column({ type: 'double precision', name: 'precision_ppm', nullable: true }) precisionPpm!: number | null;
  @Column({ type: 'double precision', name: 'calibration_interval_days' }) calibrationIntervalDays!: number;
}
