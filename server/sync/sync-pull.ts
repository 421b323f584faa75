import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/roles';
import { SYNC_ENTITIES, type EntityName } from '../../shared/model/entities';
import type { PullAnswer, PullChange } from '../../shared/sync/sync-wire';
import { AppError } from '../core/errors';
import { ENTITY_DEFS } from '../records/entity-registry';
import type { WireRecord } from '../records/wire';
import { knownSites, recordPull } from './device-service';
import { wireRecords } from './pull-records';

/** A change_log row as the driver gives it: bigint columns arrive as text. */
interface LogRowText {
  seq: string;
  entity: EntityName;
  record_id: string;
  rev: string;
  deleted: boolean;
}

/** A change_log row with its numbers read once, at the query. */
interface LogRow extends Omit<LogRowText, 'seq' | 'rev'> {
  seq: number;
  rev: number;
}

const readLogRow = (r: LogRowText): LogRow => ({ ...r, seq: Number(r.seq), rev: Number(r.rev) });

const resetAnswer = (message: string) => new AppError(410, message, undefined, { reset: true });

/**
 * Reads the change log after the device's cursor, in pages, only for sites the user may read.
 * Sequence numbers follow commit order (see ChangeBuffer), so a page never skips a late commit.
 * A record changed several times is sent once, at its current state.
 */
export async function pullChanges(ds: DataSource, user: SessionUser, deviceId: string, cursor: number, limit: number): Promise<PullAnswer> {
  const [{ min_seq }]: { min_seq: string }[] = await ds.query(`SELECT min_seq FROM sync_horizon`);
  if (cursor > 0 && cursor < Number(min_seq)) {
    throw resetAnswer(
      'This device has been away longer than the server keeps deletions: download everything again (unsent work stays on the device).',
    );
  }
  const readable = user.siteIds;
  const known = await knownSites(ds.manager, deviceId, user.id);
  const gained = cursor > 0 && known !== null && readable.some((s) => !known.includes(s));
  if (gained) throw resetAnswer('You were given access to another site: download everything again (unsent work stays on the device).');
  const lost = cursor > 0 && known ? known.filter((s) => !readable.includes(s)) : [];

  const removals = lost.length ? await accessRemovals(ds, lost, cursor) : [];
  // The log's end before the page: every seq up to it is committed (seqs are handed out in commit
  // order), so the page below sees all of them. Read after the page, it could name a row committed
  // in between that the page never saw, and the cursor would pass over it for good.
  const [{ max }]: { max: string }[] = await ds.query(`SELECT coalesce(max(seq), 0) AS max FROM change_log`);
  const logRows: LogRowText[] = await ds.query(
    `SELECT seq, entity, record_id, rev, deleted FROM change_log
      WHERE seq > $1 AND seq <= $5 AND site_id = ANY($2::uuid[]) AND entity = ANY($3::text[]) ORDER BY seq LIMIT $4`,
    [cursor, readable, SYNC_ENTITIES, limit + 1, max],
  );
  const rows = logRows.map(readLogRow);
  const more = rows.length > limit;
  const page = rows.slice(0, limit);
  const changes = [...removals, ...(await currentStates(ds, page))];
  let next = page.length ? page[page.length - 1].seq : cursor;
  if (!more) {
    // Every readable change up to the log's end read above is in this page; rows of other sites can be passed over.
    next = Math.max(next, Number(max));
  }
  await recordPull(ds.manager, deviceId, user.id, next, readable);
  return { changes, cursor: next, more };
}

/** Latest entry per record in the page, with its current row; superseded entries come later anyway. */
async function currentStates(ds: DataSource, page: LogRow[]): Promise<PullChange[]> {
  // From the page's end back: a record's first entry met is its latest. Keyed per entity by id (no
  // joined "entity:id" strings: a page is thousands of rows, and every key would be built and hashed).
  const latest: LogRow[] = [];
  const idsOf = new Map<EntityName, Set<string>>();
  for (let i = page.length - 1; i >= 0; i--) {
    const r = page[i];
    let ids = idsOf.get(r.entity);
    if (!ids) idsOf.set(r.entity, (ids = new Set()));
    if (ids.has(r.record_id)) continue;
    ids.add(r.record_id);
    latest.push(r);
  }
  latest.reverse(); // seq order again
  const current = new Map<EntityName, Map<string, WireRecord>>();
  for (const [entity, ids] of idsOf) {
    const byId = new Map<string, WireRecord>();
    for (const rec of await wireRecords(ds, entity, [...ids])) byId.set(rec.id, rec);
    current.set(entity, byId);
  }
  const out: PullChange[] = [];
  for (const r of latest) {
    const rec = current.get(r.entity)?.get(r.record_id);
    if (!rec || rec.rev > r.rev) continue;
    out.push(
      rec.deleted
        ? { seq: r.seq, entity: r.entity, id: r.record_id, rev: rec.rev, deleted: true, record: null, reason: 'deleted' }
        : { seq: r.seq, entity: r.entity, id: r.record_id, rev: rec.rev, deleted: false, record: rec },
    );
  }
  return out;
}

/** Every record of sites the user can no longer read, sent as removals so the device drops them. */
async function accessRemovals(ds: DataSource, lost: string[], cursor: number): Promise<PullChange[]> {
  const out: PullChange[] = [];
  for (const entity of SYNC_ENTITIES) {
    const d = ENTITY_DEFS[entity];
    const column = entity === 'site' ? 'id' : 'site_id';
    const rows: { id: string; rev: string }[] = await ds.query(`SELECT id, rev FROM ${d.table} WHERE ${column} = ANY($1::uuid[])`, [lost]);
    for (const r of rows) out.push({ seq: cursor, entity, id: r.id, rev: Number(r.rev), deleted: true, record: null, reason: 'access' });
  }
  return out;
}
