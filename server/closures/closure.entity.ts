import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** One chamber placement: raw series (never changed by review), engine results, and the lab's review fields. */
@Entity({ name: 'closure' })
export class ClosureEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'uuid', name: 'visit_id' }) visitId!: string;
  @Column({ type: 'uuid', name: 'collar_id' }) collarId!: string;
  @Column({ type: 'uuid', name: 'campaign_id' }) campaignId!: string;
  @Column({ type: 'uuid', name: 'profile_id', nullable: true }) profileId!: string | null;
  @Column({ type: 'uuid', name: 'analyzer_id', nullable: true }) analyzerId!: string | null;
  @Column({ type: 'timestamptz', name: 'started_at' }) startedAt!: Date;
  @Column({ type: 'timestamptz', name: 'ended_at', nullable: true }) endedAt!: Date | null;
  @Column({ type: 'double precision', name: 'settle_s' }) settleS!: number;
  @Column({ type: 'jsonb', name: 'series' }) series!: Record<string, unknown>;
  @Column({ type: 'timestamptz', name: 'chamber_on_at', nullable: true }) chamberOnAt!: Date | null;
  @Column({ type: 'timestamptz', name: 'chamber_off_at', nullable: true }) chamberOffAt!: Date | null;
  @Column({ type: 'uuid', name: 'source_attachment_id', nullable: true }) sourceAttachmentId!: string | null;
  @Column({ type: 'uuid', name: 'redo_of_id', nullable: true }) redoOfId!: string | null;
  @Column({ type: 'text', name: 'review_state', default: 'unreviewed' }) reviewState!: string;
  @Column({ type: 'text', name: 'review_reason', nullable: true }) reviewReason!: string | null;
  @Column({ type: 'double precision', name: 'review_settle_s', nullable: true }) reviewSettleS!: number | null;
  @Column({ type: 'double precision', name: 'review_window_end_s', nullable: true }) reviewWindowEndS!: number | null;
  @Column({ type: 'text', name: 'review_model', nullable: true }) reviewModel!: string | null;
  /** Samples the lab left out of the fit ({index, reason}); the series keeps them. */
  @Column({ type: 'jsonb', name: 'review_exclusions', default: () => "'[]'::jsonb" }) reviewExclusions!: {
    index: number;
    reason: string;
  }[];
  /** Engine output for the raw fields and for the review fields; derived, never sent by a client. */
  @Column({ type: 'jsonb', name: 'results', nullable: true }) results!: Record<string, unknown> | null;
  @Column({ type: 'text', name: 'flags', array: true, default: () => "'{}'" }) flags!: string[];
  @Column({ type: 'double precision', name: 'flux_umol_m2_s', nullable: true }) fluxUmolM2S!: number | null;
}
