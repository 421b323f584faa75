import type { DataSource } from 'typeorm';
import type { CsvValue } from '../../shared/csv/csv-cell';
import type { z } from 'zod';
import type { closureSeriesSchema } from '../../shared/model/field-records';
import type { SiteResults } from './results-service';
import type { CellTotal } from './seasonal-totals';
import { probeFlags } from '../../shared/model/probe-plausibility';
import { tempAtProbeDepth } from '../../shared/model/probe-replicates';

/** Rows of each export table, in the field order of export-schema.ts; big tables are read in keyset pages. */
export type Rows = AsyncIterable<CsvValue[]>;
const PAGE = 500;

const iso = (d: Date | null) => (d ? d.toISOString() : null);

/**
 * A row of one of the SELECTs below, read by column name: the export's one boundary where a row's
 * shape is the SELECT list's rather than a checked type (each row goes straight into CSV cells).
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type SqlRow = Record<string, any>;

async function* query(ds: DataSource, sql: string, params: unknown[], map: (r: SqlRow) => CsvValue[]): Rows {
  for (const r of await ds.query(sql, params)) yield map(r);
}

export function collarRows(ds: DataSource, siteId: string): Rows {
  return query(
    ds,
    `SELECT c.*, c.installed_on::text AS installed_day, p.code AS plot_code, b.code AS block_code, pt.code AS pt_code, ct.code AS ct_code
      FROM collar c JOIN plot p ON p.id = c.plot_id LEFT JOIN block b ON b.id = p.block_id
      LEFT JOIN treatment pt ON pt.id = p.treatment_id LEFT JOIN treatment ct ON ct.id = c.treatment_id
     WHERE c.site_id = $1 AND NOT c.deleted ORDER BY c.code`,
    [siteId],
    (r) => [
      r.id,
      r.code,
      r.plot_id,
      r.plot_code,
      r.block_code,
      r.pt_code,
      r.ct_code,
      r.shape,
      r.diameter_cm,
      r.area_cm2,
      r.height_cm,
      r.insertion_cm,
      r.latitude,
      r.longitude,
      r.installed_day,
      r.status,
    ],
  );
}

export function collarEventRows(ds: DataSource, siteId: string): Rows {
  return query(
    ds,
    `SELECT id, collar_id, kind, date::text AS date, note FROM collar_event WHERE site_id = $1 AND NOT deleted ORDER BY date, id`,
    [siteId],
    (r) => [r.id, r.collar_id, r.kind, r.date, r.note],
  );
}

export function analyzerRows(ds: DataSource, siteId: string): Rows {
  return query(ds, `SELECT * FROM analyzer WHERE site_id = $1 AND NOT deleted ORDER BY name, id`, [siteId], (r) => [
    r.id,
    r.name,
    r.serial,
    r.range_min_ppm,
    r.range_max_ppm,
    r.precision_ppm,
    r.calibration_interval_days,
  ]);
}

/** Checks other than calibrations (calibration-rows.ts writes those). */
export function analyzerCheckRows(ds: DataSource, siteId: string): Rows {
  return query(
    ds,
    `SELECT * FROM analyzer_check WHERE site_id = $1 AND kind <> 'calibration' AND NOT deleted ORDER BY at, id`,
    [siteId],
    (r) => [
      r.id,
      r.analyzer_id,
      r.kind,
      iso(r.at),
      r.skipped,
      r.skip_reason,
      r.passed,
      r.co2_ppm,
      r.slope_umol_mol_s,
      r.clock_offset_s,
      r.note,
    ],
  );
}

/** Profile versions with the last day each applies: the day before the next version of the same name. */
export function chamberProfileRows(ds: DataSource, siteId: string): Rows {
  return query(
    ds,
    `SELECT *, valid_from::text AS from_day,
      (lead(valid_from) OVER (PARTITION BY name ORDER BY valid_from) - 1)::text AS to_day
      FROM chamber_profile WHERE site_id = $1 AND NOT deleted ORDER BY name, valid_from`,
    [siteId],
    (r) => [
      r.id,
      r.name,
      r.from_day,
      r.to_day,
      r.chamber_volume_cm3,
      r.loop_volume_cm3,
      r.footprint_area_cm2,
      r.settle_s,
      r.closure_length_s,
    ],
  );
}

export function visitRows(ds: DataSource, siteId: string): Rows {
  return query(
    ds,
    `SELECT v.*, c.name AS campaign_name FROM visit v JOIN campaign c ON c.id = v.campaign_id
     WHERE v.site_id = $1 AND NOT v.deleted ORDER BY v.arrived_at, v.id`,
    [siteId],
    (r) => [
      r.id,
      r.campaign_id,
      r.campaign_name,
      r.round,
      r.collar_id,
      iso(r.arrived_at),
      r.skipped,
      r.skip_reason,
      JSON.stringify(r.conditions),
    ],
  );
}

export function offsetSetRows(ds: DataSource, siteId: string): Rows {
  return query(ds, `SELECT * FROM offset_set WHERE site_id = $1 AND NOT deleted ORDER BY taken_at, id`, [siteId], (r) => [
    r.id,
    r.visit_id,
    r.collar_id,
    iso(r.taken_at),
    r.mean_cm,
    r.sd_cm,
    r.readings_cm.length,
    r.readings_cm.join(';'),
    r.supersedes_id,
  ]);
}

export function probeRows(ds: DataSource, siteId: string, depth: { depthCm: number; toleranceCm: number }): Rows {
  return query(ds, `SELECT * FROM probe_reading WHERE site_id = $1 AND NOT deleted ORDER BY taken_at, id`, [siteId], (r) => {
    const kind = r.moisture_kind as 'vwc' | 'permittivity' | null;
    const flags = probeFlags({
      soilTemps: r.soil_temps,
      moistureRaw: r.moisture_raw,
      moistureKind: kind,
      vwcPct: r.vwc_pct,
      probeDepth: depth,
    });
    return [
      r.id,
      r.visit_id,
      r.collar_id,
      iso(r.taken_at),
      tempAtProbeDepth(r.soil_temps, depth.depthCm, depth.toleranceCm),
      r.vwc_pct,
      kind,
      kind === 'vwc' ? r.moisture_raw : null,
      kind === 'permittivity' ? r.moisture_raw : null,
      flags.join(';'),
    ];
  });
}

export async function* probeTempRows(ds: DataSource, siteId: string): Rows {
  const rows = await ds.query(`SELECT id, soil_temps FROM probe_reading WHERE site_id = $1 AND NOT deleted ORDER BY taken_at, id`, [
    siteId,
  ]);
  for (const r of rows) for (const s of r.soil_temps as { depthCm: number; tempC: number }[]) yield [r.id, s.depthCm, s.tempC];
}

/** Closures in keyset pages (id order), so a season of 20 000 never loads at once; `onPage` reports progress. */
async function* closurePages(
  ds: DataSource,
  siteId: string,
  columns: string,
  onPage?: (n: number) => Promise<void>,
): AsyncIterable<SqlRow[]> {
  let after = '00000000-0000-0000-0000-000000000000';
  for (;;) {
    const page = await ds.query(`SELECT ${columns} FROM closure WHERE site_id = $1 AND NOT deleted AND id > $2 ORDER BY id LIMIT ${PAGE}`, [
      siteId,
      after,
    ]);
    if (!page.length) return;
    yield page;
    after = page[page.length - 1].id;
    await onPage?.(page.length);
  }
}

interface Fit {
  selected?: { model: string; basis?: string; fluxUmolM2S: number; slopePpmS: number } | null;
  minDetectableFluxUmolM2S?: number | null;
  precisionPpm?: number;
  fluxPerSlope?: number;
  window?: { firstTS: number; lastTS: number; n: number } | null;
  [model: string]: unknown;
}

/** The lab's excluded samples as "45;46;47" (null when none). */
function excludedSamples(v: unknown): string | null {
  const list = Array.isArray(v) ? (v as { index: number }[]).map((e) => e.index).sort((a, b) => a - b) : [];
  return list.length ? list.join(';') : null;
}

export async function* closureRows(ds: DataSource, siteId: string, onPage?: (n: number) => Promise<void>): Rows {
  const cols = `id, visit_id, collar_id, campaign_id, started_at, settle_s, review_state, review_reason, review_settle_s, review_window_end_s,
    review_model, review_exclusions, results, flags, flux_umol_m2_s, analyzer_id`;
  for await (const page of closurePages(ds, siteId, cols, onPage)) {
    for (const r of page) {
      const res = (r.results ?? {}) as {
        raw?: Fit;
        review?: Fit | null;
        volumeCm3?: number;
        areaCm2?: number;
        meanOffsetCm?: number;
        pressureIsDefault?: boolean;
        profileId?: string | null;
        profileName?: string | null;
        ambientPpm?: number | null;
        airTempSource?: string | null;
        airTempC?: number | null;
      };
      const raw = res.raw?.selected ?? null;
      const review = res.review?.selected ?? null;
      yield [
        r.id,
        r.visit_id,
        r.collar_id,
        r.campaign_id,
        iso(r.started_at),
        r.settle_s,
        r.review_state,
        r.review_reason,
        r.review_settle_s,
        r.review_window_end_s,
        r.review_model,
        excludedSamples(r.review_exclusions),
        raw?.model ?? null,
        raw?.slopePpmS ?? null,
        raw?.fluxUmolM2S ?? null,
        raw ? ((res.raw?.[raw.model] as { r2?: number } | undefined)?.r2 ?? null) : null,
        review?.model ?? null,
        review?.fluxUmolM2S ?? null,
        r.flux_umol_m2_s,
        // Results stored before slope bases existed were on the end of the settle time.
        r.flux_umol_m2_s === null ? null : ((review ?? raw)?.basis ?? 'settle_end'),
        ...fitNumbers(review ? res.review! : raw ? res.raw! : null),
        (r.flags as string[]).join(';'),
        res.volumeCm3 ?? null,
        res.areaCm2 ?? null,
        res.meanOffsetCm ?? null,
        res.pressureIsDefault ?? null,
        res.profileId ?? null,
        res.profileName ?? null,
        r.analyzer_id ?? null,
        res.ambientPpm ?? null,
        // Results stored before the temperature order existed always had the file's own column.
        res.airTempSource ?? (r.flux_umol_m2_s === null ? null : 'series'),
        res.airTempC ?? null,
      ];
    }
  }
}

/** Detection limit, precision, fit window and flux-per-slope factor of the fit behind a closure's flux. */
function fitNumbers(f: Fit | null): (number | null)[] {
  if (!f) return [null, null, null, null, null, null];
  return [
    f.minDetectableFluxUmolM2S ?? null,
    f.precisionPpm ?? null,
    f.window?.firstTS ?? null,
    f.window?.lastTS ?? null,
    f.window?.n ?? null,
    f.fluxPerSlope ?? null,
  ];
}

/** A closure's stored series as seriesRows selects it (jsonb written through the closure schema). */
interface SeriesRow {
  id: string;
  series: z.input<typeof closureSeriesSchema>;
}

export async function* seriesRows(ds: DataSource, siteId: string, onPage?: (n: number) => Promise<void>): Rows {
  for await (const page of closurePages(ds, siteId, 'id, series', onPage)) {
    for (const r of page as SeriesRow[]) {
      const s = r.series;
      const t = s.tS;
      for (let i = 0; i < t.length; i++) {
        yield [r.id, t[i], s.co2Ppm[i] ?? null, s.h2oMmolMol?.[i] ?? null, s.tempC?.[i] ?? null, s.pressureKpa?.[i] ?? null];
      }
    }
  }
}

export async function* temperatureLogRows(ds: DataSource, siteId: string): Rows {
  const logs = await ds.query(
    `SELECT plot_id, depth_cm, series FROM temperature_log WHERE site_id = $1 AND NOT deleted ORDER BY plot_id, depth_cm`,
    [siteId],
  );
  for (const l of logs) for (let i = 0; i < l.series.t.length; i++) yield [l.plot_id, l.depth_cm, l.series.t[i], l.series.tempC[i]];
}

export async function* visitMeanRows(r: SiteResults): Rows {
  for (const v of r.aggregate.visitMeans) {
    const p = v.probe;
    yield [
      v.visitId,
      v.collarId,
      v.plotId,
      v.cellKey,
      v.campaignId,
      v.nClosures,
      v.fluxUmolM2S,
      v.soilTempC,
      p?.soilTempSdC ?? null,
      p?.soilTempN ?? 0,
      p?.offDepthN ?? 0,
      v.vwcPct,
      p?.vwcSdPct ?? null,
      p?.vwcN ?? 0,
    ];
  }
}

export async function* plotMeanRows(r: SiteResults): Rows {
  for (const p of r.aggregate.plotMeans) {
    yield [
      p.plotId,
      p.plotCode,
      p.blockCode,
      p.cellKey,
      p.campaignId,
      p.nCollars,
      p.nVisits,
      p.nClosures,
      p.fluxUmolM2S,
      p.soilTempC,
      p.vwcPct,
    ];
  }
}

export async function* treatmentMeanRows(r: SiteResults): Rows {
  const cells = new Map(r.aggregate.cells.map((c) => [c.key, c]));
  const campaigns = new Map(r.design.campaigns.map((c) => [c.campaignId, c.name]));
  for (const m of r.aggregate.cellMeans) {
    const c = cells.get(m.cellKey)!;
    yield [
      m.cellKey,
      c.label,
      c.level,
      m.campaignId,
      campaigns.get(m.campaignId) ?? null,
      m.nPlots,
      m.nCollars,
      m.nVisits,
      m.nClosures,
      m.meanUmolM2S,
      m.sdUmolM2S,
      m.seUmolM2S,
      m.seBlockUmolM2S,
      m.soilTempC,
      m.vwcPct,
    ];
  }
}

export async function* responseRows(r: SiteResults): Rows {
  for (const c of r.responses) {
    const q = c.q10;
    const l = c.lloydTaylor;
    const ql = c.q10Log;
    const ll = c.lloydTaylorLog;
    const est = (e: { value: number; ciLow: number; ciHigh: number } | null | undefined) =>
      e ? [e.value, e.ciLow, e.ciHigh] : [null, null, null];
    yield [
      c.cellKey,
      'q10',
      q.ok,
      q.ok ? null : q.reason,
      q.ok ? q.n : null,
      c.nPlots,
      q.ok ? q.tempSpanC : null,
      ...est(q.ok ? q.r10 : null),
      ...est(q.ok ? q.q10 : null),
      null,
      null,
      null,
      q.ok ? q.rmse : null,
      null,
      q.ok ? q.warnings.join(';') : null,
    ];
    yield [
      c.cellKey,
      'lloyd-taylor',
      l.ok,
      l.ok ? null : l.reason,
      l.ok ? l.n : null,
      c.nPlots,
      l.ok ? l.tempSpanC : null,
      ...est(l.ok ? l.r10 : null),
      null,
      null,
      null,
      ...est(l.ok ? l.e0K : null),
      l.ok ? l.rmse : null,
      null,
      l.ok ? l.warnings.join(';') : null,
    ];
    for (const [name, f] of [
      ['q10-log', ql],
      ['lloyd-taylor-log', ll],
    ] as const) {
      yield [
        c.cellKey,
        name,
        f.ok,
        f.ok ? null : f.reason,
        f.ok ? f.n : null,
        c.nPlots,
        f.ok ? f.tempSpanC : null,
        ...est(f.ok ? f.r10 : null),
        ...est(f.ok ? f.q10 : null),
        ...est(f.ok ? f.e0K : null),
        null,
        f.ok ? f.rmseLog : null,
        f.ok ? f.warnings.join(';') : null,
      ];
    }
  }
}

const dayCount = (fromDay: string, toDay: string) =>
  Math.round((Date.parse(`${toDay}T00:00:00Z`) - Date.parse(`${fromDay}T00:00:00Z`)) / 86_400_000) + 1;

export async function* seasonalRows(totals: CellTotal[], fromDay: string, toDay: string): Rows {
  for (const t of totals) {
    const responseDepth = t.plots[0]?.responseDepthCm ?? null;
    const days = dayCount(fromDay, toDay);
    // Cell rows leave the day counts to the plot rows: summed over plots they would be plot-days, more than the period has.
    yield [
      t.cellKey,
      null,
      null,
      fromDay,
      toDay,
      t.status,
      t.totalGCM2,
      t.ciLowGCM2,
      t.ciHighGCM2,
      days,
      t.plots.length,
      null,
      null,
      null,
      null,
      null,
      responseDepth,
      t.flags.join(';'),
    ];
    for (const p of t.plots) {
      yield [
        t.cellKey,
        p.plotId,
        p.plotCode,
        fromDay,
        toDay,
        p.status,
        p.totalGCM2,
        null,
        null,
        days,
        1,
        p.days.logged,
        p.days.interpolated,
        p.days.missing,
        p.days.outsideRange,
        p.logDepthCm,
        p.responseDepthCm,
        p.flags.join(';'),
      ];
    }
  }
}
