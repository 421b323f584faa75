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
}
