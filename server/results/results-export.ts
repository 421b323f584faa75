import { createHash } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { engineVersion, RESPONSE_LIMITS, SELECTION_MARGIN } from '../../shared/flux';
import { defineJob } from '../jobs/job-registry';
import { csvLine, type CsvValue } from '../../shared/csv/csv-cell';
import { CALIBRATION_METHOD, calibrationRows } from './calibration-rows';
import { dataPackage, type Provenance } from './data-package';
import { emlDocument } from './eml-document';
import * as rows from './export-rows';
import { TABLES, tablePath } from './export-schema';
import type { ClosureSelection } from './results-data';
import { SEASONAL_METHOD, seasonalSummary, siteResults, TOTAL_INTERVAL_METHOD } from './results-service';
import type { ResponseModelName } from './temperature-responses';
import { ZipWriter } from './zip-archive';

export const EXPORT_JOB = 'results-export';

export interface ExportRequest {
  siteId: string; selection: ClosureSelection; model: ResponseModelName; userId: string;
}

export interface ExportResult { exportId: string; fileName: string; sizeBytes: number; sha256: string; rows: Record<string, number> }

interface JobHooks { jobId: string; progress?: (done: number, total: number | null) => Promise<void> }

/**
 * Builds the zipped data package of one site: tidy CSVs, datapackage.json, EML, provenance; stores
 * it under the job id. Closures and their series are read in pages with progress after each page,
 * so a season of 20 000 closures streams through and the Bench can show how far the job got.
 */
export async function runResultsExport(ds: DataSource, req: ExportRequest, hooks: JobHooks): Promise<ExportResult> {
  const [user] = await ds.query(`SELECT id, display_name, email FROM app_user WHERE id = $1`, [req.userId]);
  const results = await siteResults(ds, req.siteId, req.selection);
  const seasonal = await seasonalSummary(ds, req.siteId, req.selection, { model: req.model });
  const [{ n }] = await ds.query(`SELECT count(*)::int AS n FROM closure WHERE site_id = $1 AND NOT deleted`, [req.siteId]);
  const total = 2 * n + TABLES.length;
  let done = 0;
  const step = async (k: number) => { done += k; await hooks.progress?.(done, total); };
  await hooks.progress?.(0, total);

  const site = results.design.site;
  const sources: Record<string, () => rows.Rows> = {
    collars: () => rows.collarRows(ds, site.id),
    collar_events: () => rows.collarEventRows(ds, site.id),
    calibrations: () => calibrationRows(ds, site.id),
    visits: () => rows.visitRows(ds, site.id),
    offset_sets: () => rows.offsetSetRows(ds, site.id),
    probe_readings: () => rows.probeRows(ds, site.id, site.tempDepthCm),
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
  for (const t of TABLES) {
    let count = 0;
    let size = 0;
    async function* csv() {
      const head = csvLine(t.fields.map((f) => f.name));
      size += Buffer.byteLength(head);
      yield head;
      for await (const r of sources[t.name]()) {
        if (r.length !== t.fields.length) throw new Error(`${t.name}: a row has ${r.length} values for ${t.fields.length} fields`);
        const line = csvLine(r as CsvValue[]);
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
    engineVersion, generatedAt: now.toISOString(), jobId: hooks.jobId,
    generatedBy: { id: user?.id ?? req.userId, name: user?.display_name ?? 'unknown', email: user?.email ?? '' },
    site: { id: site.id, name: site.name, timezone: site.timezone, tempDepthCm: site.tempDepthCm },
    parameters: {
      closureSelection: req.selection, responseModelForTotals: req.model, totalInterval: TOTAL_INTERVAL_METHOD,
      seasonFrom: seasonal.fromDay, seasonTo: seasonal.toDay, responseLimits: RESPONSE_LIMITS, lloydTaylorT0K: 227.13,
      carbonMolarMassGPerMol: 12.011, fluxSlopeBasis: slopeBasis, aggregation: 'closure → visit mean → collar mean → plot mean (replicate) → treatment cell mean ± SE over plots',
    },
    counts: rowCounts,
  };
  const methods = [
    `Fluxes: ideal gas law on the rate of change of dry CO2 mole fraction, fitted to the samples after the settle time (linear, exponential after Kutzbach et al. 2007, or quadratic after Wagner et al. 1997; the exponential only when it saturates and its AICc (Hurvich & Tsai 1989) is lower by more than ${SELECTION_MARGIN}); curved models take the ${slopeBasis === 'closure' ? 'slope at chamber closure (t = 0)' : 'slope at the end of the settle time'} (site setting; column flux_basis names the basis of each closure's flux). Soil area is the collar's inside area. The lab reviews each closure.`,
    `Aggregation: ${String(provenance.parameters['aggregation'])}; closures: ${req.selection}. Least-squares additive models per stratum: plot-level treatments with block as a factor; collar-level treatments (split plot) paired by plot.`,
    'Temperature response per treatment cell on plot × campaign × round means (the experimental unit): Q10 and Lloyd & Taylor (1994) with T0 = 227.13 K fixed, on the flux scale and on the log scale; 95 % CIs from t(n − 2) with n = units.',
    `Seasonal totals (${seasonal.fromDay} to ${seasonal.toDay}, ${req.model}): ${SEASONAL_METHOD}`,
    CALIBRATION_METHOD,
  ];
  const cov = coverage(await ds.query(`SELECT min(latitude) s, max(latitude) n, min(longitude) w, max(longitude) e FROM collar WHERE site_id = $1 AND NOT deleted`, [site.id]),
    seasonal.fromDay, seasonal.toDay);
  await zip.add('provenance.json', JSON.stringify(provenance, null, 2));
  await zip.add('metadata.eml.xml', emlDocument(provenance, cov, rowCounts, bytes, methods));
  await zip.add('datapackage.json', JSON.stringify(dataPackage(provenance, rowCounts, bytes), null, 2));
  const file = zip.finish();
  const sha256 = createHash('sha256').update(file).digest('hex');
  const fileName = `fluxwalk-results-${site.name.toLowerCase().replace(/[^a-z0-9]+/g, '-')}-${now.toISOString().slice(0, 10)}.zip`;
  await ds.query(`INSERT INTO result_export (id, site_id, created_by, file_name, size_bytes, sha256, bytes) VALUES ($1, $2, $3, $4, $5, $6, $7)
    ON CONFLICT (id) DO UPDATE SET file_name = EXCLUDED.file_name, size_bytes = EXCLUDED.size_bytes, sha256 = EXCLUDED.sha256, bytes = EXCLUDED.bytes, created_at = now()`,
    [hooks.jobId, site.id, req.userId, fileName, file.length, sha256, file]);
  return { exportId: hooks.jobId, fileName, sizeBytes: file.length, sha256, rows: rowCounts };
}

function coverage(r: { s: number | null; n: number | null; w: number | null; e: number | null }[], fromDay: string, toDay: string) {
  const [b] = r;
  return b && b.s !== null ? { south: b.s, north: b.n!, west: b.w!, east: b.e!, fromDay, toDay } : null;
}

export function defineExportJob(): void {
  defineJob({ name: EXPORT_JOB, retryLimit: 1, handler: (data, ctx) => runResultsExport(ctx.ds, data as unknown as ExportRequest, { jobId: ctx.jobId, progress: ctx.progress }) });
}
