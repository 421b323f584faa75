import type { DataSource } from 'typeorm';
import type { HistoryEntry } from '../../shared/bench/review-wire';
import { CLOSURE_REVIEW_FIELDS, CLOSURE_SYSTEM_FIELDS } from '../../shared/model/field-records';
import type { WrittenRecord } from '../records/after-write';
import { isWriteOf, type WriteOf } from './entity-write';

export type { HistoryEntry };

/** One row of closure_review_history with its author's name (bigserial id handed over as text). */
interface HistoryRow {
  id: string;
  at: Date;
  kind: HistoryEntry['kind'];
  field: string;
  old_value: unknown;
  new_value: unknown;
  old_flux_umol_m2_s: number | null;
  new_flux_umol_m2_s: number | null;
  user_id: string | null;
  job_id: string | null;
  display_name: string | null;
}

// A corrected chamber profile or analyzer moves the flux like a review decision: kept the same way.
const isReviewField = (f: string) =>
  (CLOSURE_REVIEW_FIELDS as readonly string[]).includes(f) || (CLOSURE_SYSTEM_FIELDS as readonly string[]).includes(f);

/** A history value: large raw values (the series) are summarised by their sample count. */
function historyValue(field: string, v: unknown): string {
  if (field === 'series' && v && typeof v === 'object') return JSON.stringify({ samples: ((v as { tS?: unknown[] }).tS ?? []).length });
  return JSON.stringify(v ?? null);
}

/**
 * Every review decision (and every change of a closure's chamber profile or analyzer), whichever
 * way it arrives (Bench, REST, a sync push), leaves one history row per field it changed: who, when, old → new, and the flux before and after. A raw
 * change to a reviewed closure (which sends it back to review, see reviewResetOnRawChange) leaves
 * `raw-change` rows instead: one per raw field and one for the review state it reset, all by the
 * person who changed the data. A move to another visit leaves `move` rows (visitId, collarId). Runs
 * in the writer's transaction (see records/after-write.ts).
 */
export async function recordReviewDecision(w: WrittenRecord): Promise<void> {
  if (!isWriteOf(w, 'closure') || w.action !== 'update' || !w.before) return;
  // A move (closures/closure-move.ts) is the only write that changes a closure's visit and collar.
  const moved = w.changed.filter((f) => f === 'visitId' || f === 'collarId');
  if (moved.length) return insertRows(w, moved, 'move');
  const raw = w.before.reviewState !== 'unreviewed' ? w.changed.filter((f) => !isReviewField(f)) : [];
  const fields = [...raw, ...w.changed.filter(isReviewField)];
  if (!fields.length || fields.length === raw.length) return;
  return insertRows(w, fields, raw.length ? 'raw-change' : 'decision');
}

async function insertRows(w: WriteOf<'closure'>, fields: string[], kind: HistoryEntry['kind']): Promise<void> {
  const before = w.before!;
  const after = w.after;
  await w.em.query(
    `INSERT INTO closure_review_history (closure_id, site_id, user_id, kind, field, old_value, new_value, old_flux_umol_m2_s, new_flux_umol_m2_s)
     SELECT $1, $2, $3, $9, f, o, n, $7, $8 FROM unnest($4::text[], $5::jsonb[], $6::jsonb[]) AS t(f, o, n)`,
    [
      w.id,
      after.siteId,
      w.actorId,
      fields,
      fields.map((f) => historyValue(f, before[f as keyof typeof before])),
      fields.map((f) => historyValue(f, after[f as keyof typeof after])),
      before.fluxUmolM2S,
      after.fluxUmolM2S,
      kind,
    ],
  );
}

export async function closureHistory(ds: DataSource, closureId: string): Promise<HistoryEntry[]> {
  const rows: HistoryRow[] = await ds.query(
    `SELECT h.id, h.at, h.kind, h.field, h.old_value, h.new_value, h.old_flux_umol_m2_s, h.new_flux_umol_m2_s, h.user_id, h.job_id,
            u.display_name
       FROM closure_review_history h LEFT JOIN app_user u ON u.id = h.user_id
      WHERE h.closure_id = $1 ORDER BY h.at, h.id`,
    [closureId],
  );
  return rows.map((r) => ({
    id: Number(r.id),
    at: r.at.toISOString(),
    kind: r.kind,
    field: r.field,
    oldValue: r.old_value,
    newValue: r.new_value,
    oldFluxUmolM2S: r.old_flux_umol_m2_s,
    newFluxUmolM2S: r.new_flux_umol_m2_s,
    userId: r.user_id,
    userName: r.display_name,
    jobId: r.job_id,
  }));
}
