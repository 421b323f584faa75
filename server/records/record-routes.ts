import { randomUUID } from 'node:crypto';
import type { Request, Response } from 'express';
import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { ENTITY_PATHS, type EntityName } from '../../shared/model/entities';
import { AppError } from '../core/errors';
import { ALL_ROLES, type RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import { ChangeBuffer } from './change-buffer';
import { ENTITY_DEFS, writeRoles } from './entity-registry';
import { getRecord, listRecords } from './record-reader';
import { writeRecord, type WriteOp, type WriteOutcome } from './record-writer';

const revSchema = z.object({ rev: z.number({ message: "Send the record's rev you edited" }).int().min(1) }).passthrough();
const deleteQuery = z.object({ rev: z.coerce.number().int().min(1).optional() });

/** Runs one write in its own transaction, flushing the change log before commit. */
export async function writeOne(ds: DataSource, req: Request, op: WriteOp): Promise<WriteOutcome> {
  return ds.transaction(async (em) => {
    const changes = new ChangeBuffer();
    const outcome = await writeRecord(em, req.user!, op, changes);
    if (outcome.status === 'applied' || outcome.status === 'merged') await changes.flush(em);
    return outcome;
  });
}

/** REST answers from a write outcome: 2xx with the record and warnings, 409 with the conflict, or the error. */
export function answer(res: Response, outcome: WriteOutcome, created = false) {
  if (outcome.status === 'rejected') throw new AppError(outcome.httpStatus ?? 400, outcome.error!.message, outcome.error!.fields);
  if (outcome.status === 'conflict') {
    throw new AppError(409, `Someone else changed ${outcome.conflict!.fields.join(', ')} since your copy; nothing was saved`, undefined, {
      conflict: outcome.conflict,
    });
  }
  res.status(created && outcome.rev === 1 ? 201 : 200);
  return outcome.warnings ? { record: outcome.record, warnings: outcome.warnings } : { record: outcome.record };
}

/** A create may name its id (a device-made UUID); the rest of the body is the record's fields. */
const createId = z.looseObject({ id: z.string().uuid('id must be a UUID').optional() });

/** CRUD routes for every record type of the registry: list + filter, read, create, edit with rev, tombstone. */
export function registerRecordRoutes(r: RouteRegistry, ds: DataSource, only?: EntityName[]): void {
  for (const d of Object.values(ENTITY_DEFS)) {
    if (only && !only.includes(d.name)) continue;
    const base = `/api/${ENTITY_PATHS[d.name]}`;
    r.add('get', base, ALL_ROLES, (req) => listRecords(ds, d, req.user!, req.query));
    r.add('get', `${base}/:id`, ALL_ROLES, async (req) => ({ record: await getRecord(ds, d, req.user!, String(req.params['id'])) }));
    r.add('post', base, d.rules.create, async (req, res) => {
      const body = (req.body ?? {}) as Record<string, unknown>;
      const { id = randomUUID() } = parse(createId, body);
      return answer(res, await writeOne(ds, req, { entity: d.name, id, baseRev: null, op: 'upsert', fields: body }), true);
    });
    r.add('patch', `${base}/:id`, writeRoles(d), async (req, res) => {
      const { rev, ...fields } = parse(revSchema, req.body);
      return answer(res, await writeOne(ds, req, { entity: d.name, id: String(req.params['id']), baseRev: rev, op: 'upsert', fields }));
    });
    r.add('delete', `${base}/:id`, d.rules.delete, async (req, res) => {
      const { rev } = parse(deleteQuery, req.query);
      return answer(
        res,
        await writeOne(ds, req, { entity: d.name, id: String(req.params['id']), baseRev: rev ?? null, op: 'delete', fields: {} }),
      );
    });
  }
}
