import type { DataSource, EntityManager } from 'typeorm';
import type { Anomaly, AnomalyKind } from '../../shared/board/board-wire';
import { flagAdvice } from '../../shared/flux/flag-advice';
import type { QcFlag } from '../../shared/flux/qc-flags';
import { calibrationAgeDays, worstDriftPct } from '../../shared/model/calibration';
import { collarSettling, DISTURBING_EVENT_KINDS, newestDisturbance, type SettlingLimits } from '../../shared/model/collar-settling';
import { counted } from '../../shared/text/counted';
import { localDay, siteDayStartOf } from '../../shared/time/site-time';
import { pgDay } from '../core/pg-day';

export type { Anomaly, AnomalyKind };

export interface AnomalyOptions {
  /** The campaign whose readings are checked; default: the site's latest campaign by start date. */
  campaignId?: string | null;
  /** Reference time for "not visited for N days", settling and calibration; default now. */
  now?: Date;
  /** A collar with no visit for more than this many days is reported. */
  notVisitedDays?: number;
}

/**
 * Flags that ask for a look at the closure. Information-only flags (no water data, default
 * pressure, low R², dropped gaps, exponential not used, offset taken after, temperature from the
 * visit) stay on the Bench; a site-default temperature is listed because the crew can still note
 * the visit's air temperature before leaving.
 */
export const REVIEW_FLAGS: readonly QcFlag[] = [
  'invalid-input',
  'too-few-points',
  'short-window',
  'flat',
  'negative-flux',
  'spike',
  'exp-linear-ratio-high',
  'start-above-ambient',
  'temp-site-default',
];

type Db = DataSource | EntityManager;
const iso = (v: Date | null) => (v === null ? null : v.toISOString());
const round = (x: number, d = 2) => Math.round(x * 10 ** d) / 10 ** d;

/** The site's own thresholds the anomalies are judged by (all double precision). */
interface SiteRow {
  id: string;
  timezone: string;
  settling_days_hard: number;
  settling_days_warn: number;
  offset_move_cm: number;
  offset_spread_pct: number;
  leak_slope_umol_mol_s: number;
  calibration_drift_limit_pct: number;
}
interface CampaignRow {
  id: string;
  starts_on: string;
  ends_on: string;
}

/**
 * Everything on a site the lead should look at before the crew leaves: offsets that moved since
 * the last campaign or spread widely, flagged closures, settling or long-unvisited collars,
 * start-of-day checks skipped or failed, overdue calibrations. Thresholds are the site's own.
 * A plain function so the daily digest can reuse it.
 */
export async function findAnomalies(
  db: Db,
  siteId: string,
  opts: AnomalyOptions = {},
): Promise<{ campaignId: string | null; items: Anomaly[] }> {
  const now = opts.now ?? new Date();
  const [site]: SiteRow[] = await db.query(
    `SELECT id, timezone, settling_days_hard, settling_days_warn, offset_move_cm, offset_spread_pct, leak_slope_umol_mol_s,
            calibration_drift_limit_pct
       FROM site WHERE id = $1 AND NOT deleted`,
    [siteId],
  );
  if (!site) return { campaignId: null, items: [] };
  const [camp]: CampaignRow[] = opts.campaignId
    ? await db.query(`SELECT id, starts_on, ends_on FROM campaign WHERE id = $1 AND site_id = $2 AND NOT deleted`, [
        opts.campaignId,
        siteId,
      ])
    : await db.query(`SELECT id, starts_on, ends_on FROM campaign WHERE site_id = $1 AND NOT deleted ORDER BY starts_on DESC LIMIT 1`, [
        siteId,
      ]);
  const items: Anomaly[] = [];
  if (camp) {
    items.push(...(await offsetAnomalies(db, site, camp.id)));
    items.push(...(await closureAnomalies(db, camp.id)));
    items.push(...(await checkAnomalies(db, site, camp)));
  }
  items.push(...(await collarAnomalies(db, site, now, opts.notVisitedDays ?? 30)));
  items.push(...(await calibrationAnomalies(db, site, now)));
  const order = { problem: 0, warn: 1 };
  items.sort(
    (a, b) =>
      order[a.severity] - order[b.severity] || a.kind.localeCompare(b.kind) || (a.collarCode ?? '').localeCompare(b.collarCode ?? ''),
  );
  return { campaignId: camp?.id ?? null, items };
}

/**
 * Offset sets of the campaign (the latest unsuperseded set per collar) against the collar's last
 * set before the campaign, and each set's spread. Spread is reported as the volume the range of
 * readings spans, (max − min) × collar area, in % of the headspace volume (chamber + loop + area ×
 * mean offset) under the profile valid that day — the share of the flux the rim tilt could move.
 */
interface OffsetRow {
  id: string;
  collar_id: string;
  code: string;
  mean_cm: number;
  taken_at: Date;
  range_cm: number;
  area_cm2: number | null;
  fixed_volume_cm3: number | null;
  prev_mean_cm: number | null;
  prev_taken_at: Date | null;
}

async function offsetAnomalies(db: Db, site: SiteRow, campaignId: string): Promise<Anomaly[]> {
  const rows: OffsetRow[] = await db.query(
    `
    WITH cur AS (
      SELECT DISTINCT ON (o.collar_id) o.id, o.collar_id, o.mean_cm, o.taken_at, o.readings_cm
        FROM offset_set o
       WHERE o.campaign_id = $1 AND NOT o.deleted
         AND NOT EXISTS (SELECT 1 FROM offset_set x WHERE x.supersedes_id = o.id AND NOT x.deleted)
       ORDER BY o.collar_id, o.taken_at DESC)
    SELECT cur.id, cur.collar_id, k.code, cur.mean_cm, cur.taken_at,
           (SELECT max(r) - min(r) FROM unnest(cur.readings_cm) r) AS range_cm,
           k.area_cm2,
           pf.chamber_volume_cm3 + pf.loop_volume_cm3 AS fixed_volume_cm3,
           prev.mean_cm AS prev_mean_cm, prev.taken_at AS prev_taken_at
      FROM cur JOIN collar k ON k.id = cur.collar_id
      LEFT JOIN LATERAL (SELECT p.chamber_volume_cm3, p.loop_volume_cm3 FROM chamber_profile p
                          WHERE p.site_id = k.site_id AND NOT p.deleted
                            AND p.valid_from <= (cur.taken_at AT TIME ZONE (SELECT timezone FROM site WHERE id = k.site_id))::date
                          ORDER BY p.valid_from DESC LIMIT 1) pf ON true
      LEFT JOIN LATERAL (SELECT o.mean_cm, o.taken_at FROM offset_set o
                          WHERE o.collar_id = cur.collar_id AND o.campaign_id <> $1 AND o.taken_at < cur.taken_at AND NOT o.deleted
                            AND NOT EXISTS (SELECT 1 FROM offset_set x WHERE x.supersedes_id = o.id AND NOT x.deleted)
                          ORDER BY o.taken_at DESC LIMIT 1) prev ON true`,
    [campaignId],
  );
  const moveCm = site.offset_move_cm;
  const spreadPct = site.offset_spread_pct;
  const out: Anomaly[] = [];
  for (const r of rows) {
    const base = { collarId: r.collar_id, collarCode: r.code, recordId: r.id, at: iso(r.taken_at) };
    if (r.prev_mean_cm !== null) {
      const moved = r.mean_cm - r.prev_mean_cm;
      if (Math.abs(moved) > moveCm) {
        out.push({
          ...base,
          kind: 'offset-moved',
          severity: 'problem',
          value: round(moved),
          threshold: moveCm,
          message: `Mean offset moved ${moved > 0 ? '+' : ''}${round(moved)} cm since the last campaign (limit ${moveCm} cm): reseated, frost heave or a misread?`,
        });
      }
    }
    if (r.area_cm2 !== null && r.fixed_volume_cm3 !== null) {
      const volume = r.fixed_volume_cm3 + r.area_cm2 * r.mean_cm;
      const pct = (r.range_cm * r.area_cm2 * 100) / volume;
      if (pct > spreadPct) {
        out.push({
          ...base,
          kind: 'offset-spread',
          severity: 'warn',
          value: round(pct, 1),
          threshold: spreadPct,
          message: `Offset readings span ${round(r.range_cm, 1)} cm, ${round(pct, 1)} % of the headspace volume (limit ${spreadPct} %)`,
        });
      }
    }
  }
  return out;
}

interface FlaggedClosureRow {
  id: string;
  collar_id: string;
  code: string;
  started_at: Date;
  flags: string[];
  flux_umol_m2_s: number | null;
}

async function closureAnomalies(db: Db, campaignId: string): Promise<Anomaly[]> {
  const rows: FlaggedClosureRow[] = await db.query(
    `
    SELECT z.id, z.collar_id, k.code, z.started_at, z.flags, z.flux_umol_m2_s
      FROM closure z JOIN collar k ON k.id = z.collar_id
     WHERE z.campaign_id = $1 AND NOT z.deleted AND z.review_state <> 'rejected' AND z.flags && $2::text[]`,
    [campaignId, REVIEW_FLAGS],
  );
  return rows.map((r): Anomaly => {
    const flags = r.flags.filter((f) => (REVIEW_FLAGS as readonly string[]).includes(f));
    return {
      kind: 'closure-flag',
      severity: flags.includes('invalid-input') ? 'problem' : 'warn',
      collarId: r.collar_id,
      collarCode: r.code,
      recordId: r.id,
      at: iso(r.started_at),
      value: r.flux_umol_m2_s,
      threshold: null,
      flags,
      // In words from the one flag table, so the Board and the digest read like the Walk's closure card.
      message: `Closure flagged: ${flags.map((f) => flagAdvice(f).words).join(' ')}`,
    };
  });
}

/** Start-of-day checks during the campaign that were skipped, failed, or whose leak slope is above the site's limit. */
interface CheckRow {
  id: string;
  kind: string;
  at: Date;
  skipped: boolean;
  skip_reason: string | null;
  passed: boolean | null;
  slope_umol_mol_s: number | null;
  analyzer: string | null;
}

async function checkAnomalies(db: Db, site: SiteRow, camp: CampaignRow): Promise<Anomaly[]> {
  const leak = site.leak_slope_umol_mol_s;
  const rows: CheckRow[] = await db.query(
    `
    SELECT c.id, c.kind, c.at, c.skipped, c.skip_reason, c.passed, c.slope_umol_mol_s, a.name AS analyzer
      FROM analyzer_check c LEFT JOIN analyzer a ON a.id = c.analyzer_id
     WHERE c.site_id = $1 AND NOT c.deleted AND c.at >= $2::date AND c.at < $3::date + 1
       AND (c.skipped OR c.passed = false OR (c.kind = 'leak' AND abs(c.slope_umol_mol_s) > $4))
     ORDER BY c.at`,
    [site.id, camp.starts_on, camp.ends_on, leak],
  );
  return rows.map((r): Anomaly => {
    const who = r.analyzer ? ` on ${r.analyzer}` : '';
    const message = r.skipped
      ? `${r.kind} check skipped${who}: ${r.skip_reason ?? 'no reason given'}`
      : r.kind === 'leak' && r.slope_umol_mol_s !== null && Math.abs(r.slope_umol_mol_s) > leak
        ? `Leak check${who}: slope ${r.slope_umol_mol_s} µmol/mol/s above the limit ${leak}`
        : `${r.kind} check failed${who}`;
    return {
      kind: 'check-problem',
      severity: r.skipped ? 'warn' : 'problem',
      collarId: null,
      collarCode: null,
      recordId: r.id,
      at: iso(r.at),
      value: r.slope_umol_mol_s,
      threshold: r.kind === 'leak' ? leak : null,
      message,
    };
  });
}

interface CollarRow {
  id: string;
  code: string;
  event_kind: string | null;
  event_date: Date | string | null;
  installed_on: Date | string | null;
  last_visit: Date | null;
}

/**
 * Live collars still settling after an install or a reseat, by the one rule Walk uses too
 * (shared/model/collar-settling.ts: whole site days, the site's hard and warning limits), and
 * collars nobody has visited for more than `days` days.
 */
async function collarAnomalies(db: Db, site: SiteRow, now: Date, days: number): Promise<Anomaly[]> {
  const rows: CollarRow[] = await db.query(
    `
    SELECT k.id, k.code, ev.kind AS event_kind, ev.date AS event_date, lv.arrived_at AS last_visit, k.installed_on
      FROM collar k
      LEFT JOIN LATERAL (SELECT e.kind, e.date FROM collar_event e WHERE e.collar_id = k.id AND NOT e.deleted
                           AND e.kind = ANY($2::text[]) ORDER BY e.date DESC LIMIT 1) ev ON true
      LEFT JOIN LATERAL (SELECT max(v.arrived_at) AS arrived_at FROM visit v WHERE v.collar_id = k.id AND NOT v.deleted) lv ON true
     WHERE k.site_id = $1 AND NOT k.deleted AND k.status = 'active'`,
    [site.id, DISTURBING_EVENT_KINDS],
  );
  const limits: SettlingLimits = { settlingDaysHard: site.settling_days_hard, settlingDaysWarn: site.settling_days_warn };
  const dayMs = 86_400_000;
  const out: Anomaly[] = [];
  for (const r of rows) {
    const events = r.event_kind && r.event_date ? [{ kind: r.event_kind, date: pgDay(r.event_date) }] : [];
    const note = collarSettling(newestDisturbance(events, r.installed_on && pgDay(r.installed_on)), limits, site.timezone, now);
    if (note) {
      const hard = note.level === 'hard';
      out.push({
        kind: 'settling',
        severity: hard ? 'problem' : 'warn',
        collarId: r.id,
        collarCode: r.code,
        recordId: r.id,
        // The site's midnight that starts the disturbance's day.
        at: siteDayStartOf(note.since, site.timezone),
        value: note.days,
        threshold: hard ? limits.settlingDaysHard : limits.settlingDaysWarn,
        message: `Settling: ${note.what} ${counted(note.days, 'day')} ago (hard limit ${limits.settlingDaysHard}, warning ${limits.settlingDaysWarn} days)`,
      });
    }
    const idle = r.last_visit === null ? null : (now.getTime() - r.last_visit.getTime()) / dayMs;
    if (idle === null || idle > days) {
      out.push({
        kind: 'not-visited',
        severity: 'warn',
        collarId: r.id,
        collarCode: r.code,
        recordId: r.id,
        at: iso(r.last_visit),
        value: idle === null ? null : Math.floor(idle),
        threshold: days,
        message: idle === null ? 'Never visited' : `Not visited for ${Math.floor(idle)} days (limit ${days})`,
      });
    }
  }
  return out;
}

/**
 * Analyzers whose last passed calibration is older than their own interval, or that have none;
 * and analyzers whose latest calibration found them drifted beyond the site's limit (in % of the
 * span gas): the fluxes since the calibration before it need a look.
 */
interface AnalyzerRow {
  id: string;
  name: string;
  calibration_interval_days: number;
  last_cal: Date | null;
  drift_check_id: string | null;
  drift_at: Date | null;
  drift_ppm: number | null;
  zero_drift_ppm: number | null;
  span_gas_ppm: number | null;
}

async function calibrationAnomalies(db: Db, site: SiteRow, now: Date): Promise<Anomaly[]> {
  const rows: AnalyzerRow[] = await db.query(
    `
    SELECT a.id, a.name, a.calibration_interval_days,
           (SELECT max(c.at) FROM analyzer_check c WHERE c.analyzer_id = a.id AND c.kind = 'calibration' AND NOT c.deleted
                AND NOT c.skipped AND c.passed IS DISTINCT FROM false) AS last_cal,
           d.id AS drift_check_id, d.at AS drift_at, d.drift_ppm, d.zero_drift_ppm, d.span_gas_ppm
      FROM analyzer a
      LEFT JOIN LATERAL (
        SELECT c.id, c.at, c.drift_ppm, c.zero_drift_ppm, c.span_gas_ppm FROM analyzer_check c
         WHERE c.analyzer_id = a.id AND c.kind = 'calibration' AND NOT c.deleted AND NOT c.skipped
         ORDER BY c.at DESC LIMIT 1) d ON true
     WHERE a.site_id = $1 AND NOT a.deleted`,
    [site.id],
  );
  const limitPct = site.calibration_drift_limit_pct;
  const out: Anomaly[] = [];
  for (const r of rows) {
    const interval = r.calibration_interval_days;
    const age = r.last_cal ? calibrationAgeDays(r.last_cal, now) : null;
    if (age === null || age >= interval) {
      out.push({
        kind: 'calibration-overdue',
        severity: 'problem',
        collarId: null,
        collarCode: null,
        recordId: r.id,
        at: iso(r.last_cal),
        value: age,
        threshold: interval,
        message:
          age === null ? `${r.name}: no calibration on record` : `${r.name}: last calibrated ${age} days ago (interval ${interval} days)`,
      });
    }
    const pct = worstDriftPct({ driftPpm: r.drift_ppm, zeroDriftPpm: r.zero_drift_ppm, spanGasPpm: r.span_gas_ppm });
    if (pct !== null && pct > limitPct) {
      const drifts = (
        [
          ['zero', r.zero_drift_ppm],
          ['span', r.drift_ppm],
        ] as const
      )
        .flatMap(([w, v]) => (v === null ? [] : [`${w} ${v > 0 ? '+' : ''}${v} µmol/mol`]))
        .join(', ');
      out.push({
        kind: 'calibration-drift',
        severity: 'problem',
        collarId: null,
        collarCode: null,
        recordId: r.drift_check_id!,
        at: iso(r.drift_at),
        value: pct,
        threshold: limitPct,
        message: `${r.name}: drift found at calibration on ${localDay(r.drift_at!, site.timezone)} was ${drifts} (${pct} % of the ${r.span_gas_ppm} µmol/mol span gas, limit ${limitPct} %): check the closures since the calibration before it`,
      });
    }
  }
  return out;
}
