import { createHash } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { engineVersion, QC_FLAGS, QC_THRESHOLDS, RESPONSE_LIMITS, SELECTION_MARGIN } from '../../shared/flux';
import { dataLicence } from '../../shared/results/data-licences';
import { PROBE_FLAGS, PROBE_RANGES } from '../../shared/model/probe-plausibility';
import { defineJob } from '../jobs/job-registry';
import { csvLine, type CsvValue } from '../../shared/csv/csv-cell';
import { CALIBRATION_METHOD, calibrationRows } from './calibration-rows';
import { dataPackage, type Provenance } from './data-package';
import { emlDocument } from './eml-document';
import * as rows from './export-rows';
import { localDay, siteIsoLocal } from '../../shared/time/site-time';
import { sourceFields, TABLES, tablePath, tablesForSite, type FieldDef } from './export-schema';
import type { ClosureSelection } from './results-data';
import { SEASONAL_METHOD, seasonalSummary, siteResults, TOTAL_INTERVAL_METHOD } from './results-service';
import type { ResponseModelName } from './temperature-responses';
import { ZipWriter } from './zip-archive';

export const EXPORT_JOB = 'results-export';

export interface ExportRequest {
  siteId: string;
  selection: ClosureSelection;
  model: ResponseModelName;
  userId: string;
  /** SPDX id of the data licence (shared/results/data-licences.ts). */
  license: string;
}

export interface ExportResult {
  exportId: string;
  fileName: string;
  sizeBytes: number;
  sha256: string;
  rows: Record<string, number>;
}

interface JobHooks {
  jobId: string;
  progress?: (done: number, total: number | null) => Promise<void>;
}

/**
 * Builds the zipped data package of one site: tidy CSVs, datapackage.json, EML, provenance; stores
 * it under the job id. Closures and their series are read in pages with progress after each page,
 * so a season of 20 000 closures streams through and the Bench can show how far the job got.
 */
export async function runResultsExport(ds: DataSource, req: ExportRequest, hooks: JobHooks): Promise<ExportResult> {
  const licence = dataLicence(req.license);
  if (!licence) throw new Error(`The export needs a data licence (SPDX id); got ${String(req.license)}`);
  const [user] = await ds.query(`SELECT id, display_name, email FROM app_user WHERE id = $1`, [req.userId]);
  const results = await siteResults(ds, req.siteId, req.selection);
  const seasonal = await seasonalSummary(ds, req.siteId, req.selection, { model: req.model });
  const [{ n }] = await ds.query(`SELECT count(*)::int AS n FROM closure WHERE site_id = $1 AND NOT deleted`, [req.siteId]);
  const total = 2 * n + TABLES.length;
  let done = 0;
  const step = async (k: number) => {
    done += k;
    await hooks.progress?.(done, total);
  };
  await hooks.progress?.(0, total);

  const site = results.design.site;
  const sources: Record<string, () => rows.Rows> = {
    collars: () => rows.collarRows(ds, site.id),
    collar_events: () => rows.collarEventRows(ds, site.id),
    analyzers: () => rows.analyzerRows(ds, site.id),
    analyzer_checks: () => rows.analyzerCheckRows(ds, site.id),
    chamber_profiles: () => rows.chamberProfileRows(ds, site.id),
    calibrations: () => calibrationRows(ds, site.id),
    visits: () => rows.visitRows(ds, site.id),
    offset_sets: () => rows.offsetSetRows(ds, site.id),
    probe_readings: () => rows.probeRows(ds, site.id, { depthCm: site.tempDepthCm, toleranceCm: site.tempDepthToleranceCm }),
    probe_soil_temperatures: () => rows.probeTempRows(ds, site.id),
    closures: () => rows.closureRows(ds, site.id, step),
    closure_series: () => rows.seriesRows(ds, site.id, step),
    soil_temperature_logs: () => rows.temperatureLogRows(ds, site.id),
    visit_means: () => rows.visitMeanRows(results),
    plot_means: () => rows.plotMeanRows(results),
    treatment_means: () => rows.treatmentMeanRows(results),
    temperature_responses: () => rows.responseRows(results),
    seasonal_totals: () => rows.seasonalRows(seasonal.totals, seasonal.fromDay, seasonal.toDay),
  };
  const now = new Date();
  const zip = new ZipWriter(now);
  const rowCounts: Record<string, number> = {};
  const bytes: Record<string, number> = {};
  for (const t of tablesForSite(site)) {
    const raw = sourceFields(t);
    const local = localTimes(t.fields, raw, site.timezone);
    let count = 0;
    let size = 0;
    async function* csv() {
      const head = csvLine(t.fields.map((f) => f.name));
      size += Buffer.byteLength(head);
      yield head;
      for await (const r of sources[t.name]()) {
        if (r.length !== raw.length) throw new Error(`${t.name}: a row has ${r.length} values for ${raw.length} fields`);
        const line = csvLine(local(r as CsvValue[]).map((v, i) => tidy(v, t.fields[i])));
        count++;
        size += Buffer.byteLength(line);
        yield line;
      }
    }
    await zip.add(tablePath(t.name), csv());
    rowCounts[t.name] = count;
    bytes[t.name] = size;
    await step(1);
  }

  const [{ slope_basis: slopeBasis }] = await ds.query(`SELECT slope_basis FROM site WHERE id = $1`, [site.id]);
  const provenance: Provenance = {
    engineVersion,
    generatedAt: now.toISOString(),
    jobId: hooks.jobId,
    generatedBy: { id: user?.id ?? req.userId, name: user?.display_name ?? 'unknown', email: user?.email ?? '' },
    site: {
      id: site.id,
      name: site.name,
      timezone: site.timezone,
      tempDepthCm: site.tempDepthCm,
      tempDepthToleranceCm: site.tempDepthToleranceCm,
    },
    license: licence,
    parameters: {
      closureSelection: req.selection,
      responseModelForTotals: req.model,
      totalInterval: TOTAL_INTERVAL_METHOD,
      seasonFrom: seasonal.fromDay,
      seasonTo: seasonal.toDay,
      responseLimits: RESPONSE_LIMITS,
      lloydTaylorT0K: 227.13,
      carbonMolarMassGPerMol: 12.011,
      fluxSlopeBasis: slopeBasis,
      aggregation: AGGREGATION,
    },
    counts: rowCounts,
  };
  const methods = exportMethods(slopeBasis, site.tempDepthToleranceCm, req, seasonal.fromDay, seasonal.toDay, AGGREGATION);
  // The data's span in site days (the days the crews were out), as every other day of the package.
  const span = (
    await ds.query(
      `SELECT to_char(min(d) AT TIME ZONE $2, 'YYYY-MM-DD') AS from_day, to_char(max(d) AT TIME ZONE $2, 'YYYY-MM-DD') AS to_day
      FROM (SELECT started_at AS d FROM closure WHERE site_id = $1 AND NOT deleted
            UNION ALL SELECT arrived_at FROM visit WHERE site_id = $1 AND NOT deleted
            UNION ALL SELECT taken_at FROM probe_reading WHERE site_id = $1 AND NOT deleted) x`,
      [site.id, site.timezone],
    )
  )[0] as { from_day: string | null; to_day: string | null };
  const cov = coverage(
    await ds.query(
      `SELECT min(latitude) s, max(latitude) n, min(longitude) w, max(longitude) e FROM collar WHERE site_id = $1 AND NOT deleted`,
      [site.id],
    ),
    span.from_day ?? seasonal.fromDay,
    span.to_day ?? seasonal.toDay,
  );
  await zip.add('provenance.json', JSON.stringify(provenance, null, 2));
  await zip.add(
    'metadata.eml.xml',
    emlDocument(provenance, cov, rowCounts, bytes, methods, { seasonal_totals: { fromDay: seasonal.fromDay, toDay: seasonal.toDay } }),
  );
  await zip.add('datapackage.json', JSON.stringify(dataPackage(provenance, rowCounts, bytes), null, 2));
  const file = await zip.finish();
  const sha256 = createHash('sha256').update(file).digest('hex');
  const fileName = `fluxwalk-results-${site.name.toLowerCase().replace(/[^a-z0-9]+/g, '-')}-${localDay(now, site.timezone)}.zip`;
  await ds.query(
    `INSERT INTO result_export (id, site_id, created_by, file_name, size_bytes, sha256, bytes) VALUES ($1, $2, $3, $4, $5, $6, $7)
    ON CONFLICT (id) DO UPDATE SET file_name = EXCLUDED.file_name, size_bytes = EXCLUDED.size_bytes, sha256 = EXCLUDED.sha256, bytes = EXCLUDED.bytes, created_at = now()`,
    [hooks.jobId, site.id, req.userId, fileName, file.length, sha256, file],
  );
  return { exportId: hooks.jobId, fileName, sizeBytes: file.length, sha256, rows: rowCounts };
}

/** A number as the precision it carries: the field's decimals, else 12 significant digits (drops binary float noise such as 0.09999999999999998). */
function tidy(v: CsvValue, f: FieldDef): CsvValue {
  if (typeof v !== 'number' || !Number.isFinite(v) || f.type !== 'number') return v;
  const r = f.decimals !== undefined ? Number(v.toFixed(f.decimals)) : Number(v.toPrecision(12));
  return Object.is(r, -0) ? 0 : r;
}

/** The EML methods: enough for a reader to recompute every flux and total from the package alone. */
function exportMethods(
  slopeBasis: string,
  toleranceCm: number,
  req: ExportRequest,
  fromDay: string,
  toDay: string,
  aggregation: string,
): string[] {
  const flags = Object.entries(QC_FLAGS)
    .map(([k, v]) => `${k}: ${v}`)
    .join(' ');
  const probe = Object.entries(PROBE_FLAGS)
    .map(([k, v]) => `${k}: ${v}`)
    .join(' ');
  return [
    'Samples (closure_series.csv): CO2 as measured (wet), H2O, chamber air temperature and pressure per sample, t_s from chamber closure. ' +
      'Water-vapour (dilution) correction per sample: dry CO2 χc = CO2 / (1 − χw), χw = H2O [mmol mol-1] / 1000 (Webb, Pearman & Leuning 1980, Q. J. R. Meteorol. Soc. 106:85–100). ' +
      'The fit uses the samples from the settle time (closures.settle_s, or review_settle_s when the lab set one) to the end of the closure ' +
      '(or review_window_end_s); samples with a missing value are dropped (flag gaps-dropped), and so are the samples the lab left out ' +
      '(closures.review_excluded_samples, review fit only; the samples stay in closure_series.csv).',
    'Flux = slope × p·V·(1 − χw)/(R·T·A) × 10, in µmol m-2 s-1 with slope in µmol mol-1 s-1 of dry CO2, p in kPa, V in cm3 (closures.volume_cm3 = chamber volume + loop volume ' +
      "+ chamber footprint area × mean collar offset, mean_offset_cm), A in cm2 (closures.area_cm2, the collar's inside area), T in K (chamber °C + 273.15), R = 8.31446261815324 J mol-1 K-1 (Avogadro constant × Boltzmann constant, SI 2019); " +
      'p, T and χw are those of the first sample used by the fit (closures.fit_first_t_s); when the file had no chamber temperature, T is closures.air_temp_c ' +
      "(air_temp_source visit: noted at the visit; site-default: the site's default). closures.flux_per_slope gives the factor. " +
      'Pressure defaults to the US Standard Atmosphere 1976 at site elevation when not measured (pressure_is_default, flag default-pressure).',
    `Rate models fitted by least squares to dry CO2 against time since closure: linear; exponential χ = p1 + (p2 − p1)·exp(p3·t) (Kutzbach et al. 2007, Biogeosciences 4:1005–1025); ` +
      `quadratic (Wagner et al. 1997, Soil Biol. Biochem. 29:1329). Model choice: the exponential only when it saturates (p3 < 0) and its AICc (Hurvich & Tsai 1989, Biometrika 76:297) is lower ` +
      `than the linear one's by more than ${SELECTION_MARGIN}; otherwise linear, unless the lab chose a model (review_model). Slope basis: curved models take the ` +
      `${slopeBasis === 'closure' ? 'slope at chamber closure (t = 0)' : 'slope at the end of the settle time'} (site setting); closures.flux_basis names the basis of each flux ` +
      "(closure: t = 0; settle_end: end of the settle time); a line has one slope. raw_* columns are the automatic fit, review_* the lab's refit; flux_umol_m2_s is the review flux when reviewed, else the raw one.",
    `Detection limit (Christiansen et al. 2015, Agric. For. Meteorol. 211–212:48–57, after Parkin et al. 2012, J. Environ. Qual. 41:705–715): minimum detectable slope = analyzer precision ` +
      `(closures.precision_ppm; ${QC_THRESHOLDS.defaultPrecisionPpm} µmol mol-1 when the analyzer has none) / fit window length (fit_last_t_s − fit_first_t_s); ` +
      'min_detectable_flux_umol_m2_s = that slope × flux_per_slope. Fluxes below it are flagged flat and kept, as are negative fluxes.',
    `QC flags of a closure (closures.flags; none changes a value): ${flags}`,
    `Probe readings: soil temperature at the site's response depth and soil moisture; moisture_kind says whether the probe gave a VWC (moisture_vwc_reading_pct) ` +
      `or an apparent permittivity (moisture_permittivity, converted by Topp et al. 1980, Water Resour. Res. 16:574–582, unless the site set its own polynomial). ` +
      `Plausible-range flags (probe_readings.flags; common-practice range tests, readings kept): ${probe} Ranges: soil temperature ${PROBE_RANGES.soilTempC.min} … ${PROBE_RANGES.soilTempC.max} °C ` +
      `from ${PROBE_RANGES.soilTempC.fromDepthCm} cm down, VWC ${PROBE_RANGES.vwcPct.min} … ${PROBE_RANGES.vwcPct.max} %, permittivity ${PROBE_RANGES.permittivity.min} … ${PROBE_RANGES.permittivity.max}. ` +
      `Each probe reading is one insertion (replicate); a visit's soil temperature and moisture (visit_means, and every mean built on it) are the means of its replicates, ` +
      `with sample SD (n − 1) and n in visit_means; temperatures more than ±${toleranceCm} cm (the site's depth tolerance) from the response depth are flagged soil-temp-off-depth and left out of the mean.`,
    `Aggregation: ${aggregation}; closures: ${req.selection}. Least-squares additive models per stratum: plot-level treatments with block as a factor; collar-level treatments (split plot) paired by plot.`,
    'Temperature response per treatment cell on plot × campaign × round means (the experimental unit): Q10 and Lloyd & Taylor (1994, Funct. Ecol. 8:315–323) with T0 = 227.13 K fixed, on the flux scale and on the log scale; 95 % CIs from t(n − 2) with n = units.',
    `Seasonal totals (seasonal_totals.csv, ${fromDay} to ${toDay}, response model ${req.model}): ${SEASONAL_METHOD}`,
    CALIBRATION_METHOD,
    'Instruments: analyzers.csv (range, precision), analyzer_checks.csv (leak checks with the sealed-chamber slope, ambient CO2, clock offset, ' +
      'warm-up), chamber_profiles.csv (the geometry versions with the days each applies; closures.profile_id names the version used).',
    'Numbers are written to the precision they carry (12 significant digits at most; coordinates to 7 decimals, probe readings to 2); empty cells are missing values.',
  ];
}

function coverage(r: { s: number | null; n: number | null; w: number | null; e: number | null }[], fromDay: string, toDay: string) {
  const [b] = r;
  return b && b.s !== null ? { south: b.s, north: b.n!, west: b.w!, east: b.e!, fromDay, toDay } : null;
}

/** How the package's means are built, as its provenance and its methods text say. */
const AGGREGATION = 'closure → visit mean → collar mean → plot mean (replicate) → treatment cell mean ± SE over plots';

export function defineExportJob(): void {
  defineJob({
    name: EXPORT_JOB,
    retryLimit: 1,
    // The queue hands back, as JSON, the ExportRequest that POST /api/results/exports checked and enqueued.
    handler: (data, ctx) => runResultsExport(ctx.ds, data as unknown as ExportRequest, { jobId: ctx.jobId, progress: ctx.progress }),
  });
}

/** A source row (UTC only) → the table's row, each `*_local` field the same instant in the site's zone. */
function localTimes(fields: FieldDef[], raw: FieldDef[], timeZone: string): (r: CsvValue[]) => CsvValue[] {
  if (fields.length === raw.length) return (r) => r;
  const pick = fields.map((f) => raw.findIndex((x) => x.name === (f.localOf ?? f.name)));
  return (r) =>
    fields.map((f, i) =>
      f.localOf ? (r[pick[i]] === null || r[pick[i]] === '' ? null : siteIsoLocal(String(r[pick[i]]), timeZone)) : r[pick[i]],
    );
}
