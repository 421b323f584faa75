import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** One round or more of visits over a site, with what each collar is due. */
@Entity({ name: 'campaign' })
export class CampaignEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'text', name: 'name' }) name!: string;
  @Column({ type: 'date', name: 'starts_on' }) startsOn!: string;
  @Column({ type: 'date', name: 'ends_on' }) endsOn!: string;
  @Column({ type: 'integer', name: 'rounds' }) rounds!: number;
  @Column({ type: 'boolean', name: 'due_offset' }) dueOffset!: boolean;
  @Column({ type: 'integer', name: 'due_closures' }) dueClosures!: number;
  @Column({ type: 'boolean', name: 'due_probes' }) dueProbes!: boolean;
  @Column({ type: 'jsonb', name: 'routes', default: () => "'[]'" }) routes!: unknown[];
  @Column({ type: 'jsonb', name: 'round_windows', default: () => "'[]'" }) roundWindows!: unknown[];
  @Column({ type: 'boolean', name: 'locked', default: false }) locked!: boolean;
}
