import type { EntityManager } from 'typeorm';
import type { EntityName } from '../../shared/model/entities';
import type { FieldError } from '../core/errors';
import { ENTITY_DEFS, type EntityDef } from './entity-registry';
import { rejected, type WriteOutcome } from './write-outcome';

interface RefState {
  site_id: string;
  deleted: boolean;
}

/**
 * Referenced records seen in this transaction. A push of 500 readings names the same few collars
 * and visits again and again; a record's site never changes, and a delete in the same transaction
 * drops its entry (forgetReference), so the cache cannot answer wrongly.
 */
const seen = new WeakMap<EntityManager, Map<string, RefState>>();

export function forgetReference(em: EntityManager, table: string, id: string): void {
  seen.get(em)?.delete(`${table}:${id}`);
}

/** Site and tombstone of each id, one query for all not yet seen; an id missing from the answer does not exist (yet). */
async function referenceStates(em: EntityManager, table: string, ids: string[]): Promise<Map<string, RefState | undefined>> {
  let cache = seen.get(em);
  if (!cache) seen.set(em, (cache = new Map()));
  const missing = [...new Set(ids)].filter((id) => !cache.has(`${table}:${id}`) && UUID.test(id));
  if (missing.length) {
    const siteColumn = table === 'site' ? 'id' : 'site_id';
    const rows: (RefState & { id: string })[] = await em.query(
      `SELECT id, ${siteColumn} AS site_id, deleted FROM ${table} WHERE id = ANY($1::uuid[])`,
      [missing],
    );
    // Not-found ids are not cached: they may be created later in the same batch.
    for (const r of rows) cache.set(`${table}:${r.id}`, { site_id: r.site_id, deleted: r.deleted });
  }
  return new Map(ids.map((id) => [id, cache.get(`${table}:${id}`)]));
}

/**
 * Reads, in one query per table, the plain references of many records about to be written (a
 * push's creates), so each record's check finds them cached instead of asking one query per
 * batch of distinct ids. The checks themselves are unchanged.
 */
export async function warmReferences(em: EntityManager, items: { d: EntityDef; rec: Record<string, unknown> }[]): Promise<void> {
  const byTable = new Map<string, string[]>();
  for (const { d, rec } of items) {
    for (const [path, target] of Object.entries(d.refs)) {
      if (!target) continue;
      const table = ENTITY_DEFS[target].table;
      const ids = byTable.get(table) ?? [];
      byTable.set(table, ids.concat(valuesAt(rec, path)));
    }
  }
  for (const [table, ids] of byTable) if (ids.length) await referenceStates(em, table, ids);
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * The values at a reference path: `visitId`, `collarIds[]` (each element), `routes[].crewIds[]`
 * (each element of each item). The first segment is the record field the path lives in.
 */
export function valuesAt(rec: Record<string, unknown>, path: string): string[] {
  let cur: unknown[] = [rec];
  for (const part of path.split('.')) {
    const many = part.endsWith('[]');
    const key = many ? part.slice(0, -2) : part;
    cur = cur.flatMap((o) => {
      const v = (o as Record<string, unknown> | null)?.[key];
      return many ? (Array.isArray(v) ? v : []) : [v];
    });
  }
  return cur.filter((v): v is string => typeof v === 'string');
}

const fieldOf = (path: string) => path.split(/[.[]/)[0];

/**
 * Every reference a write sets must name a live record of the same site: plain and list references
 * (registry `refs`), the owner of an attachment, and people (`members`: site members only). Then a
 * record that hangs under a parent must agree with it (`agreements`: a reading carries its visit's
 * collar and campaign). Only references the write changes are looked at.
 */
export async function checkReferences(
  em: EntityManager,
  d: EntityDef,
  siteId: string,
  next: Record<string, unknown>,
  changed: readonly string[],
): Promise<WriteOutcome | null> {
  const problems: FieldError[] = [];
  const refs: [string, EntityName][] = Object.entries(d.refs).filter((e): e is [string, EntityName] => !!e[1]);
  if (d.owner && changed.includes(d.owner.idField)) {
    const owner = next[d.owner.entityField];
    if (typeof owner === 'string' && owner in ENTITY_DEFS) refs.push([d.owner.idField, owner as EntityName]);
  }
  for (const [path, target] of refs) {
    if (!changed.includes(fieldOf(path))) continue;
    const ids = valuesAt(next, path);
    if (!ids.length) continue;
    const states = await referenceStates(em, ENTITY_DEFS[target].table, ids);
    for (const id of ids) {
      const ref = states.get(id);
      if (!ref || ref.deleted) problems.push({ path: fieldOf(path), message: `No such ${target} (${id})` });
      else if (ref.site_id !== siteId) problems.push({ path: fieldOf(path), message: `The ${target} ${id} belongs to another site` });
    }
  }
  problems.push(...(await notMembers(em, d, siteId, next, changed)));
  if (problems.length) return rejected(400, `The ${d.name} refers to records that do not exist at this site`, problems);
  const disagreeing = await disagreements(em, d, next, changed);
  return disagreeing.length ? rejected(400, `The ${d.name} does not match the record it belongs to`, disagreeing) : null;
}

/** People named on a record (a visit's crew, a campaign's route crews) must be members of its site. */
async function notMembers(
  em: EntityManager,
  d: EntityDef,
  siteId: string,
  next: Record<string, unknown>,
  changed: readonly string[],
): Promise<FieldError[]> {
  const paths = (d.members ?? []).filter((p) => changed.includes(fieldOf(p)));
  const named = paths.flatMap((p) => valuesAt(next, p).map((id) => ({ path: fieldOf(p), id })));
  if (!named.length) return [];
  const rows: { user_id: string }[] = await em.query(`SELECT user_id FROM site_member WHERE site_id = $1 AND user_id = ANY($2::uuid[])`, [
    siteId,
    named.map((n) => n.id).filter((id) => UUID.test(id)),
  ]);
  const members = new Set(rows.map((r) => r.user_id));
  return named.filter((n) => !members.has(n.id)).map((n) => ({ path: n.path, message: `${n.id} is not a member of this site` }));
}

const column = (field: string) => field.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);

/** Fields that must equal the parent's (a probe reading's collar and campaign are its visit's). */
async function disagreements(
  em: EntityManager,
  d: EntityDef,
  next: Record<string, unknown>,
  changed: readonly string[],
): Promise<FieldError[]> {
  const out: FieldError[] = [];
  for (const a of d.agreements ?? []) {
    const parentId = next[a.ref];
    if (typeof parentId !== 'string' || ![a.ref, ...a.same].some((f) => changed.includes(f))) continue;
    // The agreeing fields are ids (uuid columns): text or null.
    const [parent]: Record<string, string | null>[] = await em.query(
      `SELECT ${a.same.map((f) => `${column(f)} AS "${f}"`).join(', ')} FROM ${ENTITY_DEFS[a.target].table} WHERE id = $1`,
      [parentId],
    );
    if (!parent) continue; // a missing parent is the reference check's to report
    for (const f of a.same) {
      if (parent[f] !== next[f]) {
        out.push({
          path: f,
          message: `The ${a.target} (${a.ref}) has ${f} ${parent[f]}: a ${d.name} carries its ${a.target}'s ${f}`,
        });
      }
    }
  }
  return out;
}

/** A field record of an entity named at run time, as far as the campaign lock reads it. */
type CampaignScoped = { campaignId?: string | null; visitId?: unknown } & Record<string, unknown>;

/**
 * Field records under a locked campaign are refused until the lead unlocks it. The campaign is the
 * record's own and, for a record under a visit, the visit's: a reading never slips into a locked
 * campaign by naming another one.
 */
export async function lockedCampaignMessage(em: EntityManager, d: EntityDef, rec: CampaignScoped): Promise<WriteOutcome | null> {
  if (!d.underCampaign || !rec.campaignId) return null;
  const visitId = d.name !== 'visit' && typeof rec.visitId === 'string' ? rec.visitId : null;
  const rows: { locked: boolean; name: string }[] = await em.query(
    `SELECT locked, name FROM campaign WHERE id = $1 OR id = (SELECT campaign_id FROM visit WHERE id = $2::uuid) ORDER BY locked DESC LIMIT 1`,
    [rec.campaignId, visitId],
  );
  if (rows[0]?.locked) {
    return rejected(423, `Campaign "${rows[0].name}" is locked: field records cannot change until a lead unlocks it`);
  }
  return null;
}
