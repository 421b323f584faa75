import type { EntityManager, ObjectLiteral } from 'typeorm';
import { readsSite, type Role } from '../../shared/auth/roles';
import { DERIVED_FIELDS, ENTITY_FIELDS, type EntityName } from '../../shared/model/entities';
import { CLOSURE_FIT_DATA_FIELDS, CLOSURE_REVIEW_FIELDS } from '../../shared/model/field-records';
import { fieldErrorsFromZod } from '../core/errors';
import { notifyWritten } from './after-write';
import { checkGuards, hasGuards } from './write-guards';
import type { ChangeBuffer } from './change-buffer';
import { ENTITY_DEFS, type EntityDef, type WriteAction } from './entity-registry';
import { insertRows } from './insert-rows';
import { deriveFields, warningsFor } from './record-derivations';
import { checkReferences, forgetReference, lockedCampaignMessage } from './record-references';
import { sameValue, toWireRecord, validatedAs, type SiteScoped, type WireRecord } from './wire';
import { noRecordMessage, rejected, type WriteOutcome } from './write-outcome';

export type { WriteOutcome } from './write-outcome';
export { ChangeBuffer } from './change-buffer';

export interface WriteOp {
  entity: EntityName;
  id: string;
  baseRev: number | null;
  op: 'upsert' | 'delete';
  fields: Record<string, unknown>;
}

export interface Actor {
  id: string;
  roles: Role[];
  siteIds: string[];
}

const META = ['id', 'rev', 'updatedAt', 'updatedBy', 'deleted'];

/**
 * The one write path for every record, used by the REST routes, the sync push and the seed:
 * permission and membership checks (for a stored record, before any branch that could answer
 * with it: a record the actor may not read gets the read's 404), validation of the whole resulting
 * record, references and parent agreement, locked campaigns, guards, follow-on and derived values,
 * revision bump and the change log (order in DEVELOPERS.md). The caller
 * owns the transaction (a savepoint per op in a push) and flushes `changes` before commit.
 */
export async function writeRecord(
  em: EntityManager,
  actor: Actor,
  op: WriteOp,
  changes: ChangeBuffer,
  opts: { deviceId?: string | null; move?: boolean } = {},
): Promise<WriteOutcome> {
  const d = ENTITY_DEFS[op.entity];
  if (!d) return rejected(400, `Unknown entity "${String(op.entity)}"`);
  const ctx: Ctx = { em, actor, d, changes, deviceId: opts.deviceId ?? null, movable: opts.move ? (d.movable ?? []) : [] };
  const incoming = clientFields(op.entity, op.fields);
  // Creates try the insert first (ON CONFLICT DO NOTHING): one round trip fewer for the common case.
  if (op.op === 'upsert' && op.baseRev === null && isUuid(op.id)) {
    const created = await createRecord(ctx, op, incoming);
    if (created !== ID_TAKEN) return created;
  }
  const existing = await lockRecord(em, d, op.id);
  // Before any branch that can answer the stored record: who may see it, then who may do this to it.
  const refused = existing ? accessDenied(ctx, op, existing) : null;
  if (refused) return refused;
  if (op.op === 'delete') return deleteRecord(ctx, op, existing);
  if (!existing) {
    // The same answer as for a record the caller may not read: a write never tells the two apart.
    if (op.baseRev !== null) return rejected(404, noRecordMessage(op.entity, op.id));
    // The insert was skipped yet no row has this id: another unique value (a collar code) is taken.
    return isUuid(op.id)
      ? rejected(409, `Another ${op.entity} already uses one of these values (for example the same code at this site)`)
      : rejected(400, `${op.id} is not a valid record id`);
  }
  const current = toWireRecord(existing);
  if (op.baseRev === null) return repeatedCreate(d, current, incoming);
  if (current.deleted) return conflict(Object.keys(incoming), current);
  return updateRecord(ctx, op, current, incoming);
}

interface Ctx {
  em: EntityManager;
  actor: Actor;
  d: EntityDef;
  changes: ChangeBuffer;
  deviceId: string | null;
  /**
   * Fields fixed at creation that this write may change: only a move (the Bench's move of a closure
   * to the right visit, closures/closure-move.ts) passes them; no REST edit or sync op can.
   */
  movable?: readonly string[];
}

const isUuid = (id: string) => /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(id);

/** createRecord's answer when the id already exists: the caller handles it as a repeated create. */
const ID_TAKEN: WriteOutcome = { status: 'duplicate' };

async function lockRecord(em: EntityManager, d: EntityDef, id: string): Promise<ObjectLiteral | null> {
  if (!isUuid(id)) return null;
  return em.getRepository(d.target).createQueryBuilder('r').setLock('pessimistic_write').where('r.id = :id', { id }).getOne();
}

/** Drops metadata and server-derived fields a client may have echoed back. */
function clientFields(entity: EntityName, fields: Record<string, unknown>): Record<string, unknown> {
  const derived = DERIVED_FIELDS[entity] ?? [];
  return Object.fromEntries(Object.entries(fields ?? {}).filter(([k]) => !META.includes(k) && !derived.includes(k)));
}

/**
 * A stored record the actor may not read is answered as a read would (404, the same message), so no
 * write branch hands back another site's record; then the role for what the op would do to it.
 */
function accessDenied(ctx: Ctx, op: WriteOp, existing: ObjectLiteral): WriteOutcome | null {
  const siteId = siteOf(ctx.d, op.id, existing);
  if (!readsSite(ctx.actor, siteId)) return rejected(404, noRecordMessage(ctx.d.name, op.id));
  return roleDenied(ctx, op.op === 'delete' ? 'delete' : op.baseRev === null ? 'create' : 'update');
}

function roleDenied(ctx: Ctx, action: WriteAction): WriteOutcome | null {
  const allowed = ctx.d.rules[action];
  if (ctx.actor.roles.some((r) => allowed.includes(r))) return null;
  return rejected(403, `Your role may not ${action} a ${ctx.d.name}`);
}

/** The site a record belongs to: a site is its own; every other entity's schema requires `siteId`. */
function siteOf(d: EntityDef, id: string, rec: SiteScoped): string {
  if (d.name === 'site') return id;
  if (typeof rec.siteId !== 'string') throw new Error(`${d.name} ${id} has no siteId`);
  return rec.siteId;
}

function membershipDenied(ctx: Ctx, siteId: string): WriteOutcome | null {
  if (readsSite(ctx.actor, siteId)) return null;
  return rejected(403, 'You are not a member of this site');
}

function validate(entity: EntityName, candidate: Record<string, unknown>) {
  const parsed = ENTITY_FIELDS[entity].safeParse(candidate);
  if (!parsed.success) return { error: rejected(400, `Some ${entity} fields are not valid`, fieldErrorsFromZod(parsed.error)) };
  // The schema of an entity named at run time: its fields by name, siteId typed (SiteScoped).
  return { value: parsed.data as SiteScoped };
}

async function createRecord(ctx: Ctx, op: WriteOp, incoming: Record<string, unknown>): Promise<WriteOutcome> {
  const prepared = await prepareCreate(ctx, op, incoming);
  if ('status' in prepared) return prepared;
  const inserted = await ctx.em
    .getRepository(ctx.d.target)
    .createQueryBuilder()
    .insert()
    .values({ ...prepared.row })
    .orIgnore()
    .returning('id')
    .execute(); // a copy: insert writes DB defaults back into its values
  if (!inserted.raw.length) return ID_TAKEN;
  return finishCreate(ctx, prepared);
}

/** A create that passed every check before its insert: the row to store and what to log about it. */
export interface PreparedCreate {
  id: string;
  siteId: string;
  fields: string[];
  row: Record<string, unknown>;
  record: WireRecord;
}

/** Every check of a create, in order, then the derived values: a refusal or the row to insert. */
async function prepareCreate(ctx: Ctx, op: WriteOp, incoming: Record<string, unknown>): Promise<WriteOutcome | PreparedCreate> {
  const { d } = ctx;
  const denied = roleDenied(ctx, 'create');
  if (denied) return denied;
  const v = validate(d.name, incoming);
  if (v.error) return v.error;
  const next = v.value;
  const siteId = siteOf(d, op.id, next);
  const guard =
    membershipDenied(ctx, siteId) ??
    ruleDenied(ctx, 'create', Object.keys(next), next) ??
    (await checkReferences(ctx.em, d, siteId, next, Object.keys(next))) ??
    (await lockedCampaignMessage(ctx.em, d, next)) ??
    (await checkGuards({ em: ctx.em, entity: d.name, id: op.id, action: 'create', current: null, next, changed: Object.keys(next) }));
  if (guard) return guard;
  const derived = await deriveFields(ctx.em, d.name, next, null);
  const row = { ...next, ...derived, id: op.id, rev: 1, updatedAt: new Date(), updatedBy: ctx.actor.id, deleted: false };
  return { id: op.id, siteId, fields: Object.keys(next), row, record: toWireRecord(row) };
}

/** After the row is stored: the change log entry, the after-write listeners, the answer. */
async function finishCreate(ctx: Ctx, p: PreparedCreate): Promise<WriteOutcome> {
  const { d } = ctx;
  ctx.changes.add({
    entity: d.name,
    recordId: p.id,
    rev: 1,
    siteId: p.siteId,
    fields: p.fields,
    deleted: false,
    userId: ctx.actor.id,
    deviceId: ctx.deviceId,
  });
  await notifyWritten({
    em: ctx.em,
    actorId: ctx.actor.id,
    entity: d.name,
    id: p.id,
    action: 'create',
    before: null,
    after: p.record,
    changed: p.fields,
    changes: ctx.changes,
  });
  return { status: 'applied', rev: 1, record: p.record, warnings: await warningsFor(ctx.em, d.name, p.record) };
}

/**
 * Entities whose creates may be stored several rows to a statement (the sync push's batched
 * creates): no write guard (a guard may count rows an earlier create of the same statement adds),
 * and derived values that read no record a create could add (a closure's fit reads its profile
 * and site, a site is what other records read).
 */
export function batchableCreate(op: WriteOp): boolean {
  return (
    op.op === 'upsert' &&
    op.baseRev === null &&
    isUuid(op.id) &&
    !!ENTITY_DEFS[op.entity] &&
    op.entity !== 'site' &&
    op.entity !== 'closure' &&
    !hasGuards(op.entity)
  );
}

/** The checks of a create without its insert (the batched path inserts many at once), or the refusal. */
export async function prepareBatchedCreate(
  em: EntityManager,
  actor: Actor,
  op: WriteOp,
  changes: ChangeBuffer,
  opts: { deviceId?: string | null } = {},
): Promise<WriteOutcome | PreparedCreate> {
  const d = ENTITY_DEFS[op.entity];
  return prepareCreate({ em, actor, d, changes, deviceId: opts.deviceId ?? null }, op, clientFields(op.entity, op.fields));
}

/**
 * Stores prepared creates of one entity as one multi-row INSERT; returns the ids it stored (an id
 * or another unique value already taken is skipped, as the single create's ON CONFLICT DO NOTHING).
 */
export async function insertPrepared(em: EntityManager, entity: EntityName, prepared: PreparedCreate[]): Promise<Set<string>> {
  return insertRows(
    em,
    entity,
    prepared.map((p) => p.row),
  );
}

/** The change log entry, listeners and answer of a create stored by insertPrepared. */
export function finishBatchedCreate(
  em: EntityManager,
  actor: Actor,
  entity: EntityName,
  p: PreparedCreate,
  changes: ChangeBuffer,
  opts: { deviceId?: string | null } = {},
): Promise<WriteOutcome> {
  return finishCreate({ em, actor, d: ENTITY_DEFS[entity], changes, deviceId: opts.deviceId ?? null }, p);
}

/** A create whose id is already known: the same content is a harmless repeat, anything else a conflict. */
function repeatedCreate(d: EntityDef, current: WireRecord, incoming: Record<string, unknown>): WriteOutcome {
  if (current.deleted) return conflict(Object.keys(incoming), current);
  const v = ENTITY_FIELDS[d.name].safeParse(incoming);
  const wanted = v.success ? (v.data as Record<string, unknown>) : incoming;
  const differing = Object.keys(wanted).filter((k) => !sameValue(wanted[k], current[k]));
  if (!differing.length) return { status: 'duplicate', rev: current.rev, record: current };
  return conflict(differing, current);
}

/**
 * The lab's decision on a closure is not a field edit: a locked campaign still accepts it. Points
 * left out of the fit change the data the flux stands on: a locked campaign refuses them.
 */
function reviewOnly(d: EntityDef, changed: string[]): boolean {
  return (
    d.name === 'closure' &&
    changed.every(
      (f) => (CLOSURE_REVIEW_FIELDS as readonly string[]).includes(f) && !(CLOSURE_FIT_DATA_FIELDS as readonly string[]).includes(f),
    )
  );
}

function conflict(fields: string[], server: WireRecord): WriteOutcome {
  return {
    status: 'conflict',
    rev: server.rev,
    record: server,
    conflict: { fields, server, serverRev: server.rev },
    httpStatus: 409,
  };
}

function ruleDenied(ctx: Ctx, action: WriteAction, changed: string[], next: Record<string, unknown>): WriteOutcome | null {
  const reason = ctx.d.rules.fieldRule?.(ctx.actor.roles, action, changed, validatedAs(ctx.d.name, next));
  return reason ? rejected(403, reason) : null;
}

/** Fields changed on the server after `baseRev`, from the change log. */
async function serverChangedSince(em: EntityManager, d: EntityDef, id: string, baseRev: number): Promise<Set<string>> {
  const rows: { f: string }[] = await em.query(
    `SELECT DISTINCT unnest(fields) AS f FROM change_log WHERE entity = $1 AND record_id = $2 AND rev > $3`,
    [d.name, id, baseRev],
  );
  return new Set(rows.map((r) => r.f));
}

async function updateRecord(ctx: Ctx, op: WriteOp, current: WireRecord, incoming: Record<string, unknown>): Promise<WriteOutcome> {
  const { d } = ctx;
  const rev = current.rev;
  const changed = Object.keys(incoming).filter((k) => !sameValue(incoming[k], current[k]));
  if (!changed.length) return { status: 'applied', rev, record: current };
  const siteId = siteOf(d, op.id, current);
  const movable = ctx.movable ?? [];
  const fixed = changed.filter((k) => d.immutable.includes(k) && !movable.includes(k));
  // A move's own fields were allowed by its route's role; the field rules and follow-ons judge the rest.
  const edited = changed.filter((k) => !movable.includes(k));
  if (fixed.length)
    return rejected(
      400,
      `${fixed.join(', ')} cannot change after creation`,
      fixed.map((path) => ({ path, message: 'Fixed at creation' })),
    );
  const stale = op.baseRev !== null && op.baseRev < rev;
  if (stale) {
    const serverChanged = await serverChangedSince(ctx.em, d, op.id, op.baseRev!);
    const overlap = changed.filter((k) => serverChanged.has(k));
    if (overlap.length) return conflict(overlap, current);
  }
  const v = validate(d.name, { ...current, ...Object.fromEntries(changed.map((k) => [k, incoming[k]])) });
  if (v.error) return v.error;
  const next = v.value;
  const guard =
    (edited.length ? ruleDenied(ctx, 'update', edited, next) : null) ??
    (await checkReferences(ctx.em, d, siteId, next, changed)) ??
    (reviewOnly(d, changed) ? null : await lockedCampaignMessage(ctx.em, d, next)) ??
    (await checkGuards({ em: ctx.em, entity: d.name, id: op.id, action: 'update', current, next, changed }));
  if (guard) return guard;
  const follow: Record<string, unknown> = edited.length ? (d.follows?.(validatedAs(d.name, current), edited) ?? {}) : {};
  Object.assign(next, follow);
  changed.push(...Object.keys(follow).filter((k) => !changed.includes(k) && !sameValue(follow[k], current[k])));
  const derived = await deriveFields(ctx.em, d.name, next, current);
  const patch = {
    ...Object.fromEntries(changed.map((k) => [k, next[k]])),
    ...derived,
    rev: rev + 1,
    updatedAt: new Date(),
    updatedBy: ctx.actor.id,
  };
  await ctx.em.getRepository(d.target).update({ id: op.id }, patch);
  const derivedChanged = Object.keys(derived).filter((k) => !sameValue(derived[k], current[k]));
  ctx.changes.add({
    entity: d.name,
    recordId: op.id,
    rev: rev + 1,
    siteId,
    fields: [...changed, ...derivedChanged],
    deleted: false,
    userId: ctx.actor.id,
    deviceId: ctx.deviceId,
  });
  const record = toWireRecord({ ...current, ...patch });
  await notifyWritten({
    em: ctx.em,
    actorId: ctx.actor.id,
    entity: d.name,
    id: op.id,
    action: 'update',
    before: current,
    after: record,
    changed,
    changes: ctx.changes,
  });
  return { status: stale ? 'merged' : 'applied', rev: rev + 1, record, warnings: await warningsFor(ctx.em, d.name, record) };
}

async function deleteRecord(ctx: Ctx, op: WriteOp, existing: ObjectLiteral | null): Promise<WriteOutcome> {
  const { d } = ctx;
  if (!existing) return rejected(404, noRecordMessage(d.name, op.id));
  const current = toWireRecord(existing);
  const rev = current.rev;
  if (current.deleted) return { status: 'applied', rev, record: current };
  const siteId = siteOf(d, op.id, current);
  const guard =
    (await lockedCampaignMessage(ctx.em, d, current)) ??
    (await checkGuards({ em: ctx.em, entity: d.name, id: op.id, action: 'delete', current, next: current, changed: ['deleted'] }));
  if (guard) return guard;
  if (op.baseRev !== null && op.baseRev < rev) {
    const serverChanged = [...(await serverChangedSince(ctx.em, d, op.id, op.baseRev))];
    if (serverChanged.length) return conflict(serverChanged, current);
  }
  const patch = { deleted: true, rev: rev + 1, updatedAt: new Date(), updatedBy: ctx.actor.id };
  await ctx.em.getRepository(d.target).update({ id: op.id }, patch);
  forgetReference(ctx.em, d.table, op.id);
  ctx.changes.add({
    entity: d.name,
    recordId: op.id,
    rev: rev + 1,
    siteId,
    fields: ['deleted'],
    deleted: true,
    userId: ctx.actor.id,
    deviceId: ctx.deviceId,
  });
  const record = toWireRecord({ ...current, ...patch });
  await notifyWritten({
    em: ctx.em,
    actorId: ctx.actor.id,
    entity: d.name,
    id: op.id,
    action: 'delete',
    before: current,
    after: record,
    changed: ['deleted'],
    changes: ctx.changes,
  });
  return { status: 'applied', rev: rev + 1, record };
}
