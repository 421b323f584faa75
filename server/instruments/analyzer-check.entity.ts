import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** Calibration, leak, ambient, clock, warm-up and safety checks (start of day), with who and when. */
@Entity({ name: 'analyzer_check' })
export class AnalyzerCheckEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'uuid', name: 'analyzer_id', nullable: true }) analyzerId!: string | null;
  @Column({ type: 'text', name: 'kind' }) kind!: string;
  @Column({ type: 'timestamptz', name: 'at' }) at!: Date;
  @Column({ type: 'boolean', name: 'skipped', default: false }) skipped!: boolean;
  @Column({ type: 'text', name: 'skip_reason', nullable: true }) skipReason!: string | null;
  @Column({ type: 'boolean', name: 'passed', nullable: true }) passed!: boolean | null;
  @Column({ type: 'double precision', name: 'co2_ppm', nullable: true }) co2Ppm!: number | null;
  @Column({ type: 'double precision', name: 'slope_umol_mol_s', nullable: true }) slopeUmolMolS!: number | null;
  @Column({ type: 'double precision', name: 'clock_offset_s', nullable: true }) clockOffsetS!: number | null;
  @Column({ type: 'double precision', name: 'zero_gas_ppm', nullable: true }) zeroGasPpm!: number | null;
  @Column({ type: 'text', name: 'zero_cylinder', nullable: true }) zeroCylinder!: string | null;
  @Column({ type: 'double precision', name: 'zero_before_ppm', nullable: true }) zeroBeforePpm!: number | null;
  @Column({ type: 'double precision', name: 'zero_after_ppm', nullable: true }) zeroAfterPpm!: number | null;
  @Column({ type: 'double precision', name: 'span_gas_ppm', nullable: true }) spanGasPpm!: number | null;
  @Column({ type: 'text', name: 'span_cylinder', nullable: true }) spanCylinder!: string | null;
  @Column({ type: 'double precision', name: 'span_before_ppm', nullable: true }) spanBeforePpm!: number | null;
  @Column({ type: 'double precision', name: 'span_after_ppm', nullable: true }) spanAfterPpm!: number | null;
  @Column({ type: 'double precision', name: 'zero_drift_ppm', nullable: true }) zeroDriftPpm!: number | null;
  @Column({ type: 'double precision', name: 'drift_ppm', nullable: true }) driftPpm!: number | null;
  @Column({ type: 'text', name: 'note', default: '' }) note!: string;
}
