import type { EntityManager } from 'typeorm';
import { ENTITY_DEFS, type EntityDef } from './entity-registry';
import { rejected, type WriteOutcome } from './write-outcome';

/** Every reference a write sets must name a live record of the same site (one query per reference). */
export async function checkReferences(em: EntityManager, d: EntityDef, siteId: string, next: Record<string, unknown>,
  changed: readonly string[]): Promise<WriteOutcome | null> {
  const problems: { path: string; message: string }[] = [];
  for (const [field, target] of Object.entries(d.refs)) {
    const value = next[field];
    if (!changed.includes(field) || value === null || value === undefined || !target) continue;
    const table = ENTITY_DEFS[target].table;
    const siteColumn = target === 'site' ? 'id' : 'site_id';
    const rows: { site_id: string; deleted: boolean }[] = await em.query(
      `SELECT ${siteColumn} AS site_id, deleted FROM ${table} WHERE id = $1`, [value]);
    if (!rows.length || rows[0].deleted) problems.push({ path: field, message: `No such ${target} (${String(value)})` });
    else if (rows[0].site_id !== siteId) problems.push({ path: field, message: `The ${target} belongs to another site` });
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
