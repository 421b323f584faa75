import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** Chamber + analyzer geometry, versioned by validFrom: a change of tubing is a new record. */
@Entity({ name: 'chamber_profile' })
export class ChamberProfileEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'text', name: 'name' }) name!: string;
  @Column({ type: 'date', name: 'valid_from' }) validFrom!: string;
  @Column({ type: 'double precision', name: 'chamber_volume_cm3' }) chamberVolumeCm3!: number;
  @Column({ type: 'double precision', name: 'loop_volume_cm3' }) loopVolumeCm3!: number;
  @Column({ type: 'double precision', name: 'settle_s' }) settleS!: number;
  @Column({ type: 'double precision', name: 'closure_length_s' }) closureLengthS!: number;
  @Column({ type: 'double precision', name: 'footprint_area_cm2', nullable: true }) footprintAreaCm2!: number | null;
}
