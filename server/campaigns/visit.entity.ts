import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** One crew's stop at one collar in one round. */
@Entity({ name: 'visit' })
export class VisitEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'uuid', name: 'campaign_id' }) campaignId!: string;
  @Column({ type: 'integer', name: 'round' }) round!: number;
  @Column({ type: 'uuid', name: 'collar_id' }) collarId!: string;
  @Column({ type: 'uuid', name: 'crew_id', nullable: true }) crewId!: string | null;
  @Column({ type: 'timestamptz', name: 'arrived_at' }) arrivedAt!: Date;
  /** Weather and disturbance at the visit, and the air temperature (airTempC, °C) closures without a chamber temperature use. */
  @Column({ type: 'jsonb', name: 'conditions' }) conditions!: Record<string, unknown>;
  @Column({ type: 'boolean', name: 'skipped', default: false }) skipped!: boolean;
  @Column({ type: 'text', name: 'skip_reason', nullable: true }) skipReason!: string | null;
}
