import 'reflect-metadata';
import { randomUUID } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import { Client } from 'pg';
import { createApp } from '../../server/core/app';
import { loadConfig } from '../../server/core/config';
import { createDataSource } from '../../server/core/data-source';
import { DEMO_SITE_ID } from '../../server/seed/demo-accounts';
import { httpSession } from '../../test/support/http-session';
import { resetDatabase } from '../../test/support/reset-database';
import { median } from '../lib/bench-stats';

/**
 * Sync push throughput against plain PostgreSQL in the same run: 10 000 collar events pushed in
 * batches of 500 through HTTP, the same rows as 10 000 single-row transactions, and as one
 * multi-row INSERT, in alternating rounds (median reported). Targets: push ≤ 1.5× the single-row
 * transactions; stretch ≤ 10× the INSERT.
 */
const N = Number(process.argv[2] ?? 10000);
const BATCH = Number(process.argv[3] ?? 500);
const ROUNDS = Number(process.argv[4] ?? 3);

async function main() {
  const url = process.env['DATABASE_URL']!;
  await resetDatabase(url);
  const ds = createDataSource(url);
  await ds.initialize();
  const { app } = createApp(ds, loadConfig({ databaseUrl: url, staticDir: null, sessionSecret: 'bench' }));
  const server = app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const collars: { id: string }[] = await ds.query(`SELECT id FROM collar WHERE site_id = $1 AND NOT deleted`, [DEMO_SITE_ID]);
  const row = (i: number) => ({ id: randomUUID(), collarId: collars[i % collars.length].id, note: `bench ${i}` });

  const call = await httpSession(base, 'lead@fluxwalk.example');
  const client = new Client({ connectionString: url });
  await client.connect();

  /** 10 000 ops pushed in batches by a new device. */
  const push = async () => {
    const deviceId = randomUUID();
    const pushRows = Array.from({ length: N }, (_, i) => row(i));
    const t = performance.now();
    for (let i = 0; i < N; i += BATCH) {
      const ops = pushRows.slice(i, i + BATCH).map((r) => ({
        opId: randomUUID(),
        entity: 'collarEvent',
        id: r.id,
        baseRev: null,
        op: 'upsert',
        fields: { siteId: DEMO_SITE_ID, collarId: r.collarId, kind: 'clipped', date: '2026-06-01', note: r.note },
      }));
      const res = await call('POST', '/api/sync/push', { deviceId, outboxSize: N - i, ops });
      const bad = res.json.results.filter((x: { status: string }) => x.status !== 'applied');
      if (res.status !== 200 || bad.length)
        throw new Error(`push failed: ${res.status} ${JSON.stringify(bad[0] ?? res.json).slice(0, 200)}`);
    }
    return performance.now() - t;
  };
  const insert = `INSERT INTO collar_event (id, site_id, collar_id, kind, date, note) VALUES ($1, $2, $3, 'clipped', '2026-06-01', $4)`;
  /** The same rows as single-row transactions. */
  const singleRows = async () => {
    const t = performance.now();
    for (let i = 0; i < N; i++) {
      const r = row(i);
      await client.query('BEGIN');
      await client.query(insert, [r.id, DEMO_SITE_ID, r.collarId, r.note]);
      await client.query('COMMIT');
    }
    return performance.now() - t;
  };
  /** The same rows as one multi-row INSERT. */
  const oneInsert = async () => {
    const many = Array.from({ length: N }, (_, i) => row(i));
    const t = performance.now();
    await client.query(
      `INSERT INTO collar_event (id, site_id, collar_id, kind, date, note)
       SELECT id, $1, c, 'clipped', '2026-06-01', n FROM unnest($2::uuid[], $3::uuid[], $4::text[]) AS t(id, c, n)`,
      [DEMO_SITE_ID, many.map((r) => r.id), many.map((r) => r.collarId), many.map((r) => r.note)],
    );
    return performance.now() - t;
  };

  // Rounds alternate the three, so a busy moment of the machine falls on all of them alike; the
  // figures are each round's and the median round's.
  const rounds: { pushMs: number; singleMs: number; multiMs: number }[] = [];
  for (let k = 0; k < ROUNDS; k++) rounds.push({ pushMs: await push(), singleMs: await singleRows(), multiMs: await oneInsert() });
  await client.end();
  server.close();
  await ds.destroy();

  const fmt = (ms: number) => `${(ms / 1000).toFixed(2)} s (${Math.round((N / ms) * 1000)} rows/s)`;
  rounds.forEach((r, k) =>
    console.log(
      `round ${k + 1}: push ${fmt(r.pushMs)}, single-row ${fmt(r.singleMs)}, INSERT ${fmt(r.multiMs)}: ` +
        `${(r.pushMs / r.singleMs).toFixed(2)}x / ${(r.pushMs / r.multiMs).toFixed(1)}x`,
    ),
  );
  const pushMs = median(rounds.map((r) => r.pushMs));
  const singleRatio = median(rounds.map((r) => r.pushMs / r.singleMs));
  const insertRatio = median(rounds.map((r) => r.pushMs / r.multiMs));
  console.log(`median of ${ROUNDS} rounds:`);
  console.log(`push, ${N} ops in batches of ${BATCH} over HTTP: ${fmt(pushMs)}`);
  console.log(`${N} single-row transactions:              ${fmt(median(rounds.map((r) => r.singleMs)))}`);
  console.log(`one multi-row INSERT of ${N} rows:          ${fmt(median(rounds.map((r) => r.multiMs)))}`);
  console.log(
    `ratio push / single-row transactions: ${singleRatio.toFixed(2)}x (target ≤ 1.5x: ${singleRatio <= 1.5 ? 'met' : 'NOT met'})`,
  );
  console.log(`ratio push / multi-row INSERT:        ${insertRatio.toFixed(1)}x (stretch ≤ 10x: ${insertRatio <= 10 ? 'met' : 'NOT met'})`);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
