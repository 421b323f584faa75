import { randomUUID } from 'node:crypto';
import type { DataSource, EntityManager } from 'typeorm';
import { AppError } from '../core/errors';
import { ChangeBuffer, writeRecord, type Actor } from '../records/record-writer';
import {
  IMPORT_TARGETS,
  mappingErrors,
  parseCsv,
  resolveMapping,
  rowToCollar,
  type CellError,
  type ImportRequest,
  type ImportTarget,
  type LookupCodes,
  type RowResult,
} from './collar-csv';
import { siteForActor } from './site-access';

export interface ImportPreview {
  headers: string[];
  mapping: Partial<Record<ImportTarget, string>>;
  targets: typeof IMPORT_TARGETS;
  rows: { row: number; cells: Record<string, string>; errors: CellError[] }[];
  /** Errors about the whole file (structure, mapping, units of a column). */
  fileErrors: CellError[];
  validRows: number;
  errorRows: number;
}

async function lookupCodes(db: DataSource | EntityManager, siteId: string): Promise<LookupCodes> {
  const plots: { id: string; code: string }[] = await db.query(`SELECT id, code FROM plot WHERE site_id = $1 AND NOT deleted`, [siteId]);
  const treatments: { id: string; code: string }[] = await db.query(
    `SELECT id, code FROM treatment WHERE site_id = $1 AND NOT deleted AND level = 'collar'`,
    [siteId],
  );
  const collars: { code: string }[] = await db.query(`SELECT code FROM collar WHERE site_id = $1 AND NOT deleted`, [siteId]);
  return {
    plots: new Map(plots.map((p) => [p.code.toLowerCase(), p.id])),
    collarTreatments: new Map(treatments.map((t) => [t.code.toLowerCase(), t.id])),
    existingCollarCodes: new Set(collars.map((c) => c.code.toLowerCase())),
  };
}

function check(siteId: string, req: ImportRequest, codes: LookupCodes) {
  const { table, errors: structural } = parseCsv(req.csv);
  const mapping = resolveMapping(table.headers, req.mapping);
  const fileErrors = [...structural, ...mappingErrors(table.headers, mapping)];
  const seen = new Map<string, number>();
  const rows: RowResult[] = table.rows.map((r) => rowToCollar(siteId, r, mapping, codes, seen));
  if (!table.rows.length && !fileErrors.length) fileErrors.push({ row: 2, column: '(file)', message: 'The file has no collar rows' });
  return { headers: table.headers, mapping, fileErrors, rows };
}

/** Every row checked as the commit would check it, and nothing stored. */
export async function previewCollarImport(ds: DataSource, actor: Actor, siteId: string, req: ImportRequest): Promise<ImportPreview> {
  await siteForActor(ds, actor, siteId);
  const c = check(siteId, req, await lookupCodes(ds, siteId));
  const errorRows = c.rows.filter((r) => r.errors.length).length;
  return {
    headers: c.headers,
    mapping: c.mapping,
    targets: IMPORT_TARGETS,
    fileErrors: c.fileErrors,
    rows: c.rows.map((r) => ({ row: r.row, cells: r.cells, errors: r.errors })),
    validRows: c.rows.length - errorRows,
    errorRows,
  };
}

const asFields = (errors: CellError[]) => errors.map((e) => ({ path: `row ${e.row} · ${e.column}`, message: e.message }));

/**
 * All or nothing: the rows are checked again inside one transaction (another person may have
 * added a collar since the preview) and written through the one record writer; the first
 * refusal rolls everything back and the answer lists every row's errors.
 */
export async function commitCollarImport(
  ds: DataSource,
  actor: Actor,
  siteId: string,
  req: ImportRequest,
): Promise<{ created: number; collarIds: string[] }> {
  return ds.transaction(async (em) => {
    await siteForActor(em, actor, siteId);
    // Serialise imports of one site so two concurrent files cannot both add the same code.
    await em.query(`SELECT id FROM site WHERE id = $1 FOR UPDATE`, [siteId]);
    const c = check(siteId, req, await lookupCodes(em, siteId));
    const errors = [...c.fileErrors, ...c.rows.flatMap((r) => r.errors)];
    if (errors.length) {
      const bad = new Set(c.rows.filter((r) => r.errors.length).map((r) => r.row)).size;
      const what = c.fileErrors.length ? 'the file has errors' : `${bad} row${bad === 1 ? ' has' : 's have'} errors`;
      throw new AppError(400, `Nothing was imported: ${what}`, asFields(errors));
    }
    const changes = new ChangeBuffer();
    const collarIds: string[] = [];
    for (const r of c.rows) {
      const id = randomUUID();
      const outcome = await writeRecord(em, actor, { entity: 'collar', id, baseRev: null, op: 'upsert', fields: r.fields! }, changes);
      if (outcome.status !== 'applied') {
        throw new AppError(
          outcome.httpStatus ?? 400,
          `Nothing was imported: row ${r.row}: ${outcome.error?.message ?? outcome.status}`,
          (outcome.error?.fields ?? []).map((f) => ({ path: `row ${r.row} · ${f.path}`, message: f.message })),
        );
      }
      collarIds.push(id);
    }
    await changes.flush(em);
    return { created: collarIds.length, collarIds };
  });
}
