import { randomUUID } from 'node:crypto';
import { Pool } from 'pg';
import { percentile } from './fleet-client';

/**
 * The floor under the fleet's push latency, measured in the same run: the same number of devices,
 * each sending the same number of batches one after another, where a batch is what PostgreSQL must
 * write for its ops (a record row, a ledger row and a change-log row per op) as plain multi-row
 * INSERTs in one statement (one transaction, one round trip, no checks), through connections as many
 * as the two servers' pools. No HTTP, no Node work per op: what is left is PostgreSQL's
 * work, its commits and the queue for connections on this machine. Tables of its own, dropped after.
 */
export async function floorReference(
  url: string,
  connections: number,
  devices: number,
  ops: number,
  batch: number,
  siteId: string,
  collarIds: string[],
): Promise<number[]> {
  const pool = new Pool({ connectionString: url, max: connections });
  const times: number[] = [];
  try {
    await pool.query(`DROP TABLE IF EXISTS floor_event, floor_ledger, floor_log; DROP SEQUENCE IF EXISTS floor_seq;
      CREATE TABLE floor_event (LIKE collar_event INCLUDING DEFAULTS INCLUDING INDEXES);
      CREATE TABLE floor_ledger (LIKE sync_op INCLUDING DEFAULTS INCLUDING INDEXES);
      CREATE TABLE floor_log (LIKE change_log INCLUDING DEFAULTS INCLUDING INDEXES);
      CREATE SEQUENCE floor_seq`);
    const sql = `
      WITH t AS (SELECT * FROM unnest($1::uuid[], $2::uuid[], $3::uuid[], $4::text[]) AS t(id, op_id, collar_id, note)),
           e AS (INSERT INTO floor_event (id, site_id, collar_id, kind, date, note, updated_by)
                 SELECT id, $5, collar_id, 'clipped', '2026-06-01', note, $6 FROM t),
           l AS (INSERT INTO floor_ledger (op_id, device_id, user_id, entity, record_id, status, response)
                 SELECT op_id, $7, $6, 'collarEvent', id, 'applied', jsonb_build_object('opId', op_id, 'status', 'applied', 'rev', 1) FROM t)
      INSERT INTO floor_log (seq, entity, record_id, rev, site_id, fields, user_id, device_id)
      SELECT nextval('floor_seq'), 'collarEvent', id, 1, $5, '{siteId,collarId,kind,date,note}', $6, $7 FROM t`;
    const user = randomUUID();
    await Promise.all(
      Array.from({ length: devices }, async (_, n) => {
        const device = randomUUID();
        for (let done = 0; done < ops; done += batch) {
          const size = Math.min(batch, ops - done);
          const ids = Array.from({ length: size }, () => randomUUID());
          const t = performance.now();
          await pool.query(sql, [
            ids,
            ids.map(() => randomUUID()),
            ids.map((_, i) => collarIds[(n * 7 + done + i) % collarIds.length]),
            ids.map((_, i) => `device ${n} op ${done + i}`),
            siteId,
            user,
            device,
          ]);
          times.push(performance.now() - t);
        }
      }),
    );
    await pool.query(`DROP TABLE floor_event, floor_ledger, floor_log; DROP SEQUENCE floor_seq`);
  } finally {
    await pool.end();
  }
  return times;
}

export const floorLine = (xs: number[]) =>
  `p50 ${percentile(xs, 50).toFixed(0)} ms, p95 ${percentile(xs, 95).toFixed(0)} ms, p99 ${percentile(xs, 99).toFixed(0)} ms (n=${xs.length})`;
