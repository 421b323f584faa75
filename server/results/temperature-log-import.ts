/**
 * Soil-temperature logger files into temperature logs (one log per plot and depth). The file is read
 * by shared/logger's temperature reader (the one the Bench previews with); here the series is checked
 * whole and written for each plot it stands for. An existing log of the same plot and depth whose
 * period overlaps the file is either replaced over the file's period (its samples inside the period
 * go, the file's come in) or kept (append: stored samples win, the file adds only what lies outside
 * every stored log's period).
 */
import { randomUUID } from 'node:crypto';
import type { DataSource, EntityManager } from 'typeorm';
import { z } from 'zod';
import type { SessionUser } from '../../shared/auth/roles';
import { clipText as clip, readTemperatureSeries, TIMESTAMP_FORMATS } from '../../shared/logger';
import { AppError, badRequest } from '../core/errors';
import { ChangeBuffer, writeRecord } from '../records/record-writer';

export const TEMPERATURE_LOG_MODES = ['replace', 'append'] as const;
export const temperatureLogImportSchema = z
  .object({
    siteId: z.string().uuid(),
    /** One plot (older callers) or several: a logger in one spot may stand for neighbouring plots. */
    plotId: z.string().uuid().optional(),
    plotIds: z.array(z.string().uuid()).max(200).optional(),
    depthCm: z.number().min(0).max(200),
    source: z.string().max(255).default(''),
    text: z.string().min(1).max(900_000),
    timeColumn: z.string().min(1),
    tempColumn: z.string().min(1),
    timeZone: z.string().min(1).default('UTC'),
    /** Local wall time as the logger writes it, or ISO-8601 with an offset. */
    timeFormat: z.enum(TIMESTAMP_FORMATS).optional(),
    mode: z
      .enum(TEMPERATURE_LOG_MODES, { message: 'Choose "replace" or "append" for logs already stored for these plots' })
      .default('append'),
    /** Check and count only; nothing is stored. */
    dryRun: z.boolean().default(false),
  })
  .refine((b) => !!b.plotId || (b.plotIds?.length ?? 0) > 0, { path: ['plotIds'], message: 'Choose the plot(s) this log stands for' });
export type TemperatureLogImport = z.infer<typeof temperatureLogImportSchema>;

export function parseTemperatureText(body: Pick<TemperatureLogImport, 'text' | 'timeColumn' | 'tempColumn' | 'timeZone' | 'timeFormat'>): {
  t: string[];
  tempC: number[];
} {
  const read = readTemperatureSeries(body);
  if (read.missingColumn) {
    const m = read.missingColumn;
    throw badRequest(`The file has no column "${clip(m.name)}"`, [
      { path: m.path, message: clip(`Columns: ${m.headers.map((h) => clip(h, 40)).join(', ')}`, 600) },
    ]);
  }
  // A temperature log feeds seasonal totals: all of it or nothing, with every bad line named.
  if (read.problems.length) {
    throw badRequest(
      `${read.problems.length} line(s) could not be read; nothing was imported`,
      read.problems.slice(0, 50).map((p) => ({ path: 'text', message: `Line ${p.line}: ${p.message}` })),
    );
  }
  return { t: read.t, tempC: read.tempC };
}

interface StoredLog {
  id: string;
  rev: number;
  series: { t: string[]; tempC: number[] };
}

export interface PlotOutcome {
  plotId: string;
  logId: string | null;
  samples: number;
  skipped: number;
  replacedSamples: number;
  touchedLogs: string[];
}

async function write(em: EntityManager, user: SessionUser, changes: ChangeBuffer, op: Parameters<typeof writeRecord>[2]): Promise<void> {
  const o = await writeRecord(em, user, op, changes);
  if (o.status !== 'applied') throw new AppError(o.httpStatus ?? 400, o.error?.message ?? 'The log was not saved', o.error?.fields);
}

async function importForPlot(
  em: EntityManager,
  user: SessionUser,
  changes: ChangeBuffer,
  body: TemperatureLogImport,
  plotId: string,
  series: { t: string[]; tempC: number[] },
): Promise<PlotOutcome> {
  const fromMs = Date.parse(series.t[0]);
  const toMs = Date.parse(series.t.at(-1)!);
  const stored: StoredLog[] = await em.query(
    `SELECT id, rev, series FROM temperature_log WHERE site_id = $1 AND plot_id = $2 AND depth_cm = $3 AND NOT deleted FOR UPDATE`,
    [body.siteId, plotId, body.depthCm],
  );
  const span = (s: StoredLog) => ({ from: Date.parse(s.series.t[0]), to: Date.parse(s.series.t.at(-1)!) });
  const overlapping = stored.filter((s) => s.series.t.length && span(s).from <= toMs && span(s).to >= fromMs);
  let keep = series.t.map(() => true);
  let replacedSamples = 0;
  if (body.mode === 'replace') {
    for (const s of overlapping) {
      const idx = s.series.t
        .map((_, i) => i)
        .filter((i) => {
          const ms = Date.parse(s.series.t[i]);
          return ms < fromMs || ms > toMs;
        });
      replacedSamples += s.series.t.length - idx.length;
      if (body.dryRun) continue;
      if (!idx.length)
        await write(em, user, changes, { entity: 'temperatureLog', id: s.id, baseRev: Number(s.rev), op: 'delete', fields: {} });
      else
        await write(em, user, changes, {
          entity: 'temperatureLog',
          id: s.id,
          baseRev: Number(s.rev),
          op: 'upsert',
          fields: { series: { t: idx.map((i) => s.series.t[i]), tempC: idx.map((i) => s.series.tempC[i]) } },
        });
    }
  } else {
    keep = series.t.map((iso) => {
      const ms = Date.parse(iso);
      return !overlapping.some((s) => span(s).from <= ms && ms <= span(s).to);
    });
  }
  const t = series.t.filter((_, i) => keep[i]);
  const tempC = series.tempC.filter((_, i) => keep[i]);
  const outcome: PlotOutcome = {
    plotId,
    logId: null,
    samples: t.length,
    skipped: series.t.length - t.length,
    replacedSamples,
    touchedLogs: overlapping.map((s) => s.id),
  };
  if (!t.length || body.dryRun) return outcome;
  const id = randomUUID();
  await write(em, user, changes, {
    entity: 'temperatureLog',
    id,
    baseRev: null,
    op: 'upsert',
    fields: { siteId: body.siteId, plotId, depthCm: body.depthCm, source: body.source, series: { t, tempC } },
  });
  return { ...outcome, logId: id };
}

export async function importTemperatureLog(ds: DataSource, user: SessionUser, body: TemperatureLogImport) {
  const series = parseTemperatureText(body);
  if (!series.t.length)
    throw badRequest('The file has no data lines under its header; nothing was imported', [{ path: 'text', message: 'No data lines' }]);
  const plotIds = [...new Set([...(body.plotId ? [body.plotId] : []), ...(body.plotIds ?? [])])];
  // Every plot or none: a refusal for one plot leaves every stored log as it was.
  const plots = await ds.transaction(async (em) => {
    const changes = new ChangeBuffer();
    const out: PlotOutcome[] = [];
    for (const plotId of plotIds) out.push(await importForPlot(em, user, changes, body, plotId, series));
    if (!body.dryRun) await changes.flush(em);
    return out;
  });
  return {
    id: plots[0]?.logId ?? null,
    mode: body.mode,
    dryRun: body.dryRun,
    samples: series.t.length,
    from: series.t[0] ?? null,
    to: series.t.at(-1) ?? null,
    plots,
  };
}
