import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/**
 * One probe insertion (a replicate; a visit keeps several): soil temperature at one or more depths
 * and soil moisture, converted to VWC with the site calibration.
 */
@Entity({ name: 'probe_reading' })
export class ProbeReadingEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'uuid', name: 'visit_id' }) visitId!: string;
  @Column({ type: 'uuid', name: 'collar_id' }) collarId!: string;
  @Column({ type: 'uuid', name: 'campaign_id' }) campaignId!: string;
  @Column({ type: 'timestamptz', name: 'taken_at' }) takenAt!: Date;
  @Column({ type: 'uuid', name: 'taken_by_id', nullable: true }) takenById!: string | null;
  @Column({ type: 'jsonb', name: 'soil_temps' }) soilTemps!: { depthCm: number; tempC: number }[];
  @Column({ type: 'double precision', name: 'moisture_raw', nullable: true }) moistureRaw!: number | null;
  @Column({ type: 'text', name: 'moisture_kind', nullable: true }) moistureKind!: string | null;
  @Column({ type: 'double precision', name: 'rod_length_cm', nullable: true }) rodLengthCm!: number | null;
  @Column({ type: 'double precision', name: 'vwc_pct', nullable: true }) vwcPct!: number | null;
  @Column({ type: 'text', name: 'probe_id', default: '' }) probeId!: string;
}
