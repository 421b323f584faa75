import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** One visit's offset readings around a collar rim; mean and SD are derived here. */
@Entity({ name: 'offset_set' })
export class OffsetSetEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'uuid', name: 'visit_id' }) visitId!: string;
  @Column({ type: 'uuid', name: 'collar_id' }) collarId!: string;
  @Column({ type: 'uuid', name: 'campaign_id' }) campaignId!: string;
  @Column({ type: 'timestamptz', name: 'taken_at' }) takenAt!: Date;
  @Column({ type: 'double precision', name: 'readings_cm', array: true }) readingsCm!: number[];
  @Column({ type: 'double precision', name: 'mean_cm' }) meanCm!: number;
  @Column({ type: 'double precision', name: 'sd_cm' }) sdCm!: number;
  @Column({ type: 'uuid', name: 'supersedes_id', nullable: true }) supersedesId!: string | null;
}
