import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { seesAllSites, type SessionUser } from '../../shared/auth/roles';
import type { ChangedMark, QueueFilter, QueueItem, RecomputedMark, ReviewState } from '../../shared/bench/review-wire';
import { queueFilterSchema } from '../../shared/bench/review-wire';
import type { ClosureModel } from '../../shared/flux/closure-input';
import { worstDriftPct } from '../../shared/model/calibration';
import { parse } from '../core/validate';
import { pgDay } from '../core/pg-day';

const pageSchema = z.object({
  limit: z.coerce.number().int().min(1).max(500).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});

/**
 * The closures with their context, filtered and paged in ONE query: design labels, visit
 * conditions, days since install/reseat and clipping (latest event on or before the closure's
 * local day), the analyzer's latest calibration (age, drift) and a failed leak check that day.
 * `idsOnly` serves bulk actions over the same filter.
 */
function queueSql(filter: QueueFilter & { id?: string }, readable: string[] | null) {
  const args: unknown[] = [];
  const p = (v: unknown) => {
    args.push(v);
    return `$${args.length}`;
  };
  const where: string[] = ['NOT c.deleted'];
  if (readable) where.push(`c.site_id = ANY(${p(readable)}::uuid[])`);
  if (filter.id) where.push(`c.id = ${p(filter.id)}`);
  if (filter.siteId) where.push(`c.site_id = ${p(filter.siteId)}`);
  if (filter.campaignId) where.push(`c.campaign_id = ${p(filter.campaignId)}`);
  if (filter.round) where.push(`v.round = ${p(filter.round)}`);
  if (filter.treatmentId) where.push(`coalesce(k.treatment_id, pl.treatment_id) = ${p(filter.treatmentId)}`);
  if (filter.plotId) where.push(`k.plot_id = ${p(filter.plotId)}`);
  if (filter.collarId) where.push(`c.collar_id = ${p(filter.collarId)}`);
  if (filter.flag === 'none') where.push(`c.flags = '{}'`);
  else if (filter.flag === 'any') where.push(`c.flags <> '{}'`);
  else if (filter.flag) where.push(`c.flags @> ARRAY[${p(filter.flag)}]::text[]`);
  if (filter.reviewState) where.push(`c.review_state = ${p(filter.reviewState)}`);
  if (filter.rain24h !== undefined) where.push(`coalesce((v.conditions->>'rain24h')::boolean, false) = ${p(filter.rain24h)}`);
  if (filter.recomputedSinceReview !== undefined) where.push(`(c.results ? 'recomputedSinceReview') = ${p(filter.recomputedSinceReview)}`);
  const ctx: string[] = [];
  if (filter.installedWithinDays !== undefined) ctx.push(`days_since_install <= ${p(filter.installedWithinDays)}`);
  if (filter.clippedWithinDays !== undefined) ctx.push(`days_since_clipping <= ${p(filter.clippedWithinDays)}`);
  if (filter.calibrationOlderThanDays !== undefined)
    ctx.push(`(calibration_age_days IS NULL OR calibration_age_days >= ${p(filter.calibrationOlderThanDays)})`);
  if (filter.driftAtLeastPpm !== undefined) ctx.push(`abs(calibration_drift_ppm) >= ${p(filter.driftAtLeastPpm)}`);
  if (filter.leakFailed !== undefined) ctx.push(`leak_failed = ${p(filter.leakFailed)}`);
  const sql = `
    WITH q AS (
      SELECT c.id, c.rev, c.site_id, c.campaign_id, c.visit_id, c.collar_id, c.started_at, c.settle_s, c.flags, c.flux_umol_m2_s,
             c.review_state, c.review_reason, c.review_settle_s, c.review_window_end_s, c.review_model, c.redo_of_id,
             c.results->'recomputedSinceReview' AS recomputed_since_review, chg.changed AS changed_since_review,
             k.code AS collar_code, pl.code AS plot_code, b.code AS block_code, t.code AS treatment_code, cp.name AS campaign_name,
             cp.locked AS campaign_locked, v.round, coalesce((v.conditions->>'rain24h')::boolean, false) AS rain24h,
             d.day, d.day - inst.date AS days_since_install, d.day - clip.date AS days_since_clipping,
             -- Site days from the calibration to the closure (not the database session's calendar).
             (d.day - (cal.at AT TIME ZONE s.timezone)::date) AS calibration_age_days, cal.drift_ppm AS calibration_drift_ppm,
             cal.zero_drift_ppm AS calibration_zero_drift_ppm, cal.span_gas_ppm AS calibration_span_gas_ppm,
             an.calibration_interval_days, s.calibration_drift_limit_pct, s.timezone AS site_timezone,
             EXISTS (SELECT 1 FROM analyzer_check l WHERE l.site_id = c.site_id AND l.kind = 'leak' AND l.passed = false AND NOT l.deleted
                        AND (l.analyzer_id IS NULL OR c.analyzer_id IS NULL OR l.analyzer_id = c.analyzer_id)
                        AND (l.at AT TIME ZONE s.timezone)::date = d.day) AS leak_failed
        FROM closure c
        JOIN site s ON s.id = c.site_id
        JOIN collar k ON k.id = c.collar_id
        JOIN plot pl ON pl.id = k.plot_id
        LEFT JOIN block b ON b.id = pl.block_id
        LEFT JOIN treatment t ON t.id = coalesce(k.treatment_id, pl.treatment_id)
        JOIN campaign cp ON cp.id = c.campaign_id
        JOIN visit v ON v.id = c.visit_id
        CROSS JOIN LATERAL (SELECT (c.started_at AT TIME ZONE s.timezone)::date AS day) d
        -- Raw data changed after the last decision (the change reset the review): when, by whom, which fields.
        LEFT JOIN LATERAL (
          SELECT json_build_object('at', h.at, 'userName', u.display_name,
                   'fields', json_agg(h.field ORDER BY h.id) FILTER (WHERE h.field NOT IN ('reviewState', 'reviewReason')),
                   'previousState', max(h.old_value #>> '{}') FILTER (WHERE h.field = 'reviewState')) AS changed
            FROM closure_review_history h LEFT JOIN app_user u ON u.id = h.user_id
           WHERE h.closure_id = c.id AND h.kind = 'raw-change'
             AND NOT EXISTS (SELECT 1 FROM closure_review_history x WHERE x.closure_id = c.id AND x.kind = 'decision' AND x.id > h.id)
           GROUP BY h.at, u.display_name ORDER BY h.at DESC LIMIT 1) chg ON true
        LEFT JOIN LATERAL (
          SELECT max(x.date) AS date FROM (
            SELECT e.date FROM collar_event e WHERE e.collar_id = c.collar_id AND NOT e.deleted AND e.kind IN ('installed', 'reseated') AND e.date <= d.day
            UNION ALL SELECT k.installed_on WHERE k.installed_on <= d.day) x) inst ON true
        LEFT JOIN LATERAL (
          SELECT max(e.date) AS date FROM collar_event e
           WHERE e.collar_id = c.collar_id AND NOT e.deleted AND e.kind = 'clipped' AND e.date <= d.day) clip ON true
        LEFT JOIN LATERAL (
          SELECT a.at, a.drift_ppm, a.zero_drift_ppm, a.span_gas_ppm, a.analyzer_id FROM analyzer_check a
           WHERE a.site_id = c.site_id AND a.kind = 'calibration' AND NOT a.deleted AND NOT a.skipped AND a.at <= c.started_at
             AND (a.analyzer_id IS NULL OR c.analyzer_id IS NULL OR a.analyzer_id = c.analyzer_id)
           ORDER BY a.at DESC LIMIT 1) cal ON true
        LEFT JOIN analyzer an ON an.id = coalesce(c.analyzer_id, cal.analyzer_id)
       WHERE ${where.join(' AND ')})
    SELECT q.*, count(*) OVER () AS total FROM q ${ctx.length ? `WHERE ${ctx.join(' AND ')}` : ''}`;
  return { sql, args, p };
}

/** One row of the queue's query, as the driver hands it over (bigint as text, dates as Date). */
interface QueueRow {
  id: string;
  rev: string;
  site_id: string;
  campaign_id: string;
  visit_id: string;
  collar_id: string;
  started_at: Date;
  settle_s: number;
  flags: string[];
  flux_umol_m2_s: number | null;
  review_state: ReviewState;
  review_reason: string | null;
  review_settle_s: number | null;
  review_window_end_s: number | null;
  review_model: ClosureModel | null;
  redo_of_id: string | null;
  recomputed_since_review: RecomputedMark | null;
  changed_since_review: ChangedMark | null;
  collar_code: string;
  plot_code: string;
  block_code: string | null;
  treatment_code: string | null;
  campaign_name: string;
  campaign_locked: boolean;
  round: number;
  rain24h: boolean;
  day: Date | string;
  days_since_install: number | null;
  days_since_clipping: number | null;
  calibration_age_days: number | null;
  calibration_drift_ppm: number | null;
  calibration_zero_drift_ppm: number | null;
  calibration_span_gas_ppm: number | null;
  calibration_interval_days: number | null;
  calibration_drift_limit_pct: number;
  site_timezone: string;
  leak_failed: boolean;
  /** count(*) OVER (): bigint, handed over as text. */
  total: string;
}

const readableSites = (user: SessionUser) => (seesAllSites(user.roles) ? null : user.siteIds);

export async function reviewQueue(ds: DataSource, user: SessionUser, rawQuery: unknown) {
  const filter = parse(queueFilterSchema, rawQuery, 'Some queue filters are not valid');
  const page = parse(pageSchema, rawQuery, 'Some queue filters are not valid');
  const { sql, args, p } = queueSql(filter, readableSites(user));
  const rows: QueueRow[] = await ds.query(`${sql} ORDER BY started_at, id LIMIT ${p(page.limit)} OFFSET ${p(page.offset)}`, args);
  const [first] = rows;
  const total = first ? Number(first.total) : page.offset ? await countQueue(ds, filter, user) : 0;
  return { items: rows.map(toItem), total, limit: page.limit, offset: page.offset };
}

async function countQueue(ds: DataSource, filter: QueueFilter, user: SessionUser): Promise<number> {
  const { sql, args } = queueSql(filter, readableSites(user));
  const [r]: { n: number }[] = await ds.query(`SELECT count(*)::int AS n FROM (${sql}) z`, args);
  return r.n;
}

/** One closure's queue row (its context), or null when the user may not read it. */
export async function queueItem(ds: DataSource, user: SessionUser, id: string): Promise<QueueItem | null> {
  const { sql, args } = queueSql({ id }, readableSites(user));
  const [row]: QueueRow[] = await ds.query(sql, args);
  return row ? toItem(row) : null;
}

/** Ids (and revisions) of every closure a filter selects, for bulk actions; capped. */
export async function queueIds(
  ds: DataSource,
  user: SessionUser,
  filter: QueueFilter,
  cap: number,
): Promise<{ id: string; rev: number }[]> {
  const { sql, args, p } = queueSql(filter, readableSites(user));
  const rows: { id: string; rev: string }[] = await ds.query(`${sql} ORDER BY started_at, id LIMIT ${p(cap)}`, args);
  return rows.map((r) => ({ id: r.id, rev: Number(r.rev) }));
}

function toItem(r: QueueRow): QueueItem {
  return {
    id: r.id,
    rev: Number(r.rev),
    siteId: r.site_id,
    campaignId: r.campaign_id,
    visitId: r.visit_id,
    collarId: r.collar_id,
    startedAt: r.started_at.toISOString(),
    day: pgDay(r.day),
    settleS: r.settle_s,
    flags: r.flags,
    fluxUmolM2S: r.flux_umol_m2_s,
    reviewState: r.review_state,
    reviewReason: r.review_reason,
    reviewSettleS: r.review_settle_s,
    reviewWindowEndS: r.review_window_end_s,
    reviewModel: r.review_model,
    redoOfId: r.redo_of_id,
    recomputedSinceReview: r.recomputed_since_review,
    changedSinceReview: r.changed_since_review,
    collarCode: r.collar_code,
    plotCode: r.plot_code,
    blockCode: r.block_code,
    treatmentCode: r.treatment_code,
    campaignName: r.campaign_name,
    campaignLocked: r.campaign_locked,
    round: r.round,
    rain24h: r.rain24h,
    daysSinceInstall: r.days_since_install,
    daysSinceClipping: r.days_since_clipping,
    calibrationAgeDays: r.calibration_age_days,
    calibrationDriftPpm: r.calibration_drift_ppm,
    leakFailed: r.leak_failed,
    calibrationIntervalDays: r.calibration_interval_days,
    calibrationDriftLimitPct: r.calibration_drift_limit_pct,
    timezone: r.site_timezone,
    calibrationDriftPct: worstDriftPct({
      driftPpm: r.calibration_drift_ppm,
      zeroDriftPpm: r.calibration_zero_drift_ppm,
      spanGasPpm: r.calibration_span_gas_ppm,
    }),
  };
}
