import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** A research site. Thresholds and defaults live here so every flux at the site uses the same ones. */
@Entity({ name: 'site' })
export class SiteEntity extends SyncedColumns {
  @Column({ type: 'text', name: 'name' })
  name!: string;

  /** IANA time zone; local times (digest, logger timestamps) are read in it. */
  @Column({ type: 'text', name: 'timezone', default: 'UTC' })
  timezone!: string;

  @Column({ type: 'double precision', name: 'elevation_m', nullable: true })
  elevationM!: number | null;

  @Column({ type: 'double precision', name: 'latitude', nullable: true }) latitude!: number | null;
  @Column({ type: 'double precision', name: 'longitude', nullable: true }) longitude!: number | null;
  @Column({ type: 'uuid', name: 'default_profile_id', nullable: true }) defaultProfileId!: string | null;
  @Column({ type: 'text', name: 'safety_note', default: '' }) safetyNote!: string;
  @Column({ type: 'jsonb', name: 'moisture_calibration' }) moistureCalibration!: Record<string, unknown>;
  @Column({ type: 'double precision', name: 'temp_depth_cm' }) tempDepthCm!: number;
  /** ± cm around tempDepthCm within which a soil temperature counts in a visit's mean (shared/model/probe-replicates.ts). */
  @Column({ type: 'double precision', name: 'temp_depth_tolerance_cm' }) tempDepthToleranceCm!: number;
  @Column({ type: 'double precision', name: 'settling_days_hard' }) settlingDaysHard!: number;
  @Column({ type: 'double precision', name: 'settling_days_warn' }) settlingDaysWarn!: number;
  @Column({ type: 'double precision', name: 'offset_spread_pct' }) offsetSpreadPct!: number;
  @Column({ type: 'double precision', name: 'offset_move_cm' }) offsetMoveCm!: number;
  @Column({ type: 'double precision', name: 'leak_slope_umol_mol_s' }) leakSlopeUmolMolS!: number;
  @Column({ type: 'double precision', name: 'ambient_margin_ppm' }) ambientMarginPpm!: number;
  /** Chamber air temperature when neither the file nor the visit has one (shared/flux/chamber-air-temperature.ts). */
  @Column({ type: 'double precision', name: 'default_air_temp_c', default: 15 }) defaultAirTempC!: number;
  /** 'closure' (slope of curved models at t = 0) or 'settle_end'; see shared/flux closure-input.ts. */
  @Column({ type: 'text', name: 'slope_basis', default: 'closure' }) slopeBasis!: 'closure' | 'settle_end';
  @Column({ type: 'double precision', name: 'calibration_drift_limit_pct' }) calibrationDriftLimitPct!: number;
  @Column({ type: 'text', name: 'digest_local_time' }) digestLocalTime!: string;
  @Column({ type: 'text', name: 'tile_url', nullable: true }) tileUrl!: string | null;
  @Column({ type: 'text', name: 'tile_attribution', nullable: true }) tileAttribution!: string | null;

  /** A site's own id is its site id: lets the generic record code treat sites like other records. */
  get siteId(): string {
    return this.id;
  }
}
