import type { EntityManager } from 'typeorm';
import { ENTITY_DEFS, type EntityDef } from './entity-registry';
import { rejected, type WriteOutcome } from './write-outcome';

interface RefState { site_id: string; deleted: boolean }

/**
 * Referenced records seen in this transaction. A push of 500 readings names the same few collars
 * and visits again and again; a record's site never changes, and a delete in the same transaction
 * drops its entry (forgetReference), so the cache cannot answer wrongly.
 */
const seen = new WeakMap<EntityManager, Map<string, RefState>>();

export function forgetReference(em: EntityManager, table: string, id: string): void {
  seen.get(em)?.delete(`${table}:${id}`);
}

async function referenceState(em: EntityManager, table: string, siteColumn: string, id: unknown): Promise<RefState | undefined> {
  let cache = seen.get(em);
  if (!cache) seen.set(em, (cache = new Map()));
  const key = `${table}:${String(id)}`;
  if (!cache.has(key)) {
    const rows: RefState[] = await em.query(`SELECT ${siteColumn} AS site_id, deleted FROM ${table} WHERE id = $1`, [id]);
    if (!rows.length) return undefined; // not cached: it may be created later in the same batch
    cache.set(key, rows[0]);
  }
  return cache.get(key);
}

/** Every reference a write sets must name a live record of the same site. */
export async function checkReferences(em: EntityManager, d: EntityDef, siteId: string, next: Record<string, unknown>,
  changed: readonly string[]): Promise<WriteOutcome | null> {
  const problems: { path: string; message: string }[] = [];
  for (const [field, target] of Object.entries(d.refs)) {
    const value = next[field];
    if (!changed.includes(field) || value === null || value === undefined || !target) continue;
    const ref = await referenceState(em, ENTITY_DEFS[target].table, target === 'site' ? 'id' : 'site_id', value);
    if (!ref || ref.deleted) problems.push({ path: field, message: `No such ${target} (${String(value)})` });
    else if (ref.site_id !== siteId) problems.push({ path: field, message: `The ${target} belongs to another site` });
  }
  return problems.length ? rejected(400, `The ${d.name} refers to records that do not exist at this site`, problems) : null;
}

/** Field records under a locked campaign are refused until the lead unlocks it. */
export async function lockedCampaignMessage(em: EntityManager, d: EntityDef, rec: Record<string, unknown>): Promise<WriteOutcome | null> {
  if (!d.underCampaign || !rec['campaignId']) return null;
  const rows: { locked: boolean; name: string }[] = await em.query(`SELECT locked, name FROM campaign WHERE id = $1`, [rec['campaignId']]);
  if (rows[0]?.locked) {
    return rejected(423, `Campaign "${rows[0].name}" is locked: field records cannot change until a lead unlocks it`);
  }
  return null;
}
