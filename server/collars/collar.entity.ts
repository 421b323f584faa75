import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** A permanent ring in the soil. Area is derived from its shape and size. */
@Entity({ name: 'collar' })
export class CollarEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'text', name: 'code' }) code!: string;
  @Column({ type: 'uuid', name: 'plot_id' }) plotId!: string;
  @Column({ type: 'uuid', name: 'treatment_id', nullable: true }) treatmentId!: string | null;
  @Column({ type: 'double precision', name: 'latitude', nullable: true }) latitude!: number | null;
  @Column({ type: 'double precision', name: 'longitude', nullable: true }) longitude!: number | null;
  @Column({ type: 'double precision', name: 'accuracy_m', nullable: true }) accuracyM!: number | null;
  @Column({ type: 'text', name: 'shape', default: 'round' }) shape!: string;
  @Column({ type: 'double precision', name: 'diameter_cm', nullable: true }) diameterCm!: number | null;
  @Column({ type: 'double precision', name: 'side_a_cm', nullable: true }) sideACm!: number | null;
  @Column({ type: 'double precision', name: 'side_b_cm', nullable: true }) sideBCm!: number | null;
  @Column({ type: 'double precision', name: 'area_cm2', nullable: true }) areaCm2!: number | null;
  @Column({ type: 'double precision', name: 'height_cm', nullable: true }) heightCm!: number | null;
  @Column({ type: 'double precision', name: 'insertion_cm', nullable: true }) insertionCm!: number | null;
  @Column({ type: 'date', name: 'installed_on', nullable: true }) installedOn!: string | null;
  @Column({ type: 'text', name: 'notes', default: '' }) notes!: string;
  @Column({ type: 'text', name: 'status', default: 'active' }) status!: string;
  @Column({ type: 'text', name: 'status_reason', nullable: true }) statusReason!: string | null;
}
