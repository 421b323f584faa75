import 'reflect-metadata';
import { randomUUID } from 'node:crypto';
import os from 'node:os';
import { Client } from 'pg';
import { SYNC_ENTITIES } from '../../shared/model/entities';
import { ENTITY_DEFS } from '../../server/records/entity-registry';
import { loadConfig } from '../../server/core/config';
import { DEMO_SITE_ID } from '../../server/seed/demo-accounts';
import { resetDatabase } from '../../test/support/reset-database';
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { deviceSession, FleetAddress, percentile, type Call } from './fleet-client';
import { runDevice, type DeviceState, type FleetRun } from './fleet-device';
import { floorLine, floorReference } from './fleet-floor';
import { FleetProfile } from './fleet-profile';

/**
 * A fleet at day's end: two server processes on one PostgreSQL behind one address (round-robin with
 * failover), N devices that each pull from 0, push their ops in batches and pull again. Prints push
 * and pull latency percentiles and errors, then proves from the database: the op ledger holds every
 * op sent once, no record has two change-log entries with one rev, every record's rev counts exactly
 * the creates and edits answered as applied, and every device's final state equals the database.
 * With --kill one process is SIGKILLed when half the pushes are done; devices retry on the other.
 *   node bench-fleet.js [devices=200] [ops=150] [batch=25] [--kill]
 */
const args = process.argv.slice(2).filter((a) => !a.startsWith('--'));
const KILL = process.argv.includes('--kill');
const DEVICES = Number(args[0] ?? 200),
  OPS = Number(args[1] ?? 150),
  BATCH = Number(args[2] ?? 25);
const SHARED = 20;
const TIME_LIMIT_MS = 20 * 60_000;
const PROFILE = process.env['BENCH_PROFILE'] ? new FleetProfile(process.env['DATABASE_URL']!) : null;

/** Push latency grouped by how many shared records the batch edits: what waiting for their row locks costs. */
function bySharedEdits(run: FleetRun, ms: (xs: number[]) => string): string {
  const groups = new Map<number, number[]>();
  run.pushShared.forEach((k, i) => {
    const xs = groups.get(k);
    if (xs) xs.push(run.pushMs[i]);
    else groups.set(k, [run.pushMs[i]]);
  });
  return [...groups]
    .sort((a, b) => a[0] - b[0])
    .map(([k, xs]) => `  ${k}: ${ms(xs)}`)
    .join('\n');
}

async function main() {
  const url = process.env['DATABASE_URL']!;
  await resetDatabase(url);
  if (PROFILE) {
    const c = new Client({ connectionString: url });
    await c.connect();
    await c.query('CREATE EXTENSION IF NOT EXISTS pg_stat_statements').catch(() => console.log('profile: no pg_stat_statements'));
    await c.end();
  }
  const servers = [await startServerProcess(url), await startServerProcess(url)];
  const addr = new FleetAddress(servers.map((s) => s.base));
  const db = new Client({ connectionString: url });
  await db.connect();
  try {
    const collarIds = (await db.query(`SELECT id FROM collar WHERE site_id = $1 AND NOT deleted ORDER BY code`, [DEMO_SITE_ID])).rows.map(
      (r) => r.id as string,
    );
    const setup = await deviceSession(addr, 'lead@fluxwalk.example');
    const shared = Array.from({ length: SHARED }, () => randomUUID());
    const setupOps = shared.map((id, i) => ({
      opId: randomUUID(),
      entity: 'collarEvent',
      id,
      baseRev: null,
      op: 'upsert',
      fields: { siteId: DEMO_SITE_ID, collarId: collarIds[i % collarIds.length], kind: 'clipped', date: '2026-06-01', note: `shared ${i}` },
    }));
    const made = await setup('POST', '/api/sync/push', { deviceId: randomUUID(), outboxSize: SHARED, ops: setupOps });
    if (made.status !== 200 || made.json.results.some((r: { status: string }) => r.status !== 'applied'))
      throw new Error('setup push failed');
    const siteIds: string[] = (await setup('GET', '/api/auth/me')).json.user.siteIds;

    let pushed = 0,
      killedAt: number | null = null;
    const pushedDevices = new Set<number>();
    const totalPushes = DEVICES * Math.ceil(OPS / BATCH);
    let release!: () => void;
    const run: FleetRun = {
      siteId: DEMO_SITE_ID,
      collarIds,
      shared,
      ops: OPS,
      batch: BATCH,
      fates: new Map(),
      cursors: new Map(),
      pushMs: [],
      pushShared: [],
      pullMs: [],
      errors: [],
      phase: [],
      allPushed: new Promise<void>((r) => {
        release = r;
      }),
      devicePushed: (n) => {
        if (!pushedDevices.has(n)) {
          pushedDevices.add(n);
          if (pushedDevices.size === DEVICES) release();
        }
      },
      onPush: () => {
        pushed++;
        if (KILL && killedAt === null && pushed >= totalPushes / 2) {
          killedAt = pushed;
          servers[0].child.kill('SIGKILL');
        }
      },
    };
    for (const o of setupOps) run.fates.set(o.opId, { entity: o.entity, id: o.id, kind: 'create', status: 'applied' });

    // Sign-ins 4 at a time: a sign-in in flight counts against the per-e-mail limit (8) until it succeeds.
    const calls: Call[] = [];
    for (let i = 0; i < DEVICES; i += 4)
      calls.push(
        ...(await Promise.all(Array.from({ length: Math.min(4, DEVICES - i) }, () => deviceSession(addr, 'lead@fluxwalk.example')))),
      );
    const timer = setTimeout(() => {
      console.error(`bench-fleet: over ${TIME_LIMIT_MS / 60000} min, stopping`);
      process.exit(2);
    }, TIME_LIMIT_MS);
    await PROFILE?.start();
    const t0 = performance.now();
    // A fleet that stops moving says where its devices are.
    let seen = 0,
      still = 0;
    const watch = setInterval(() => {
      const now = run.pushMs.length + run.pullMs.length;
      still = now === seen ? still + 1 : 0;
      seen = now;
      if (still === 6) {
        const at = new Map<string, number>();
        for (const p of run.phase) at.set(p, (at.get(p) ?? 0) + 1);
        console.log(`no request finished for 60 s; devices: ${JSON.stringify(Object.fromEntries(at))}`);
      }
    }, 10_000);
    const states = await Promise.all(
      calls.map(async (call, n) => {
        let rng = (n * 2654435761) % 2 ** 32 || 1; // a fixed sequence per device: two runs plan the same ops
        const rand = () => (rng = (rng * 1664525 + 1013904223) % 2 ** 32) / 2 ** 32;
        try {
          return await runDevice(call, run, n, rand);
        } catch (err) {
          run.errors.push(`device ${n}: ${err instanceof Error ? err.message : String(err)}`);
          return null;
        } finally {
          run.devicePushed(n);
        }
      }),
    );
    clearTimeout(timer);
    clearInterval(watch);
    const wallMs = performance.now() - t0;

    const ms = (xs: number[]) =>
      `p50 ${percentile(xs, 50).toFixed(0)} ms, p95 ${percentile(xs, 95).toFixed(0)} ms, p99 ${percentile(xs, 99).toFixed(0)} ms (n=${xs.length})`;
    console.log(
      `load average at the end: ${os
        .loadavg()
        .map((x) => x.toFixed(1))
        .join(' ')} (${os.cpus().length} cores)`,
    );
    console.log(
      `${DEVICES} devices × ${OPS} ops in batches of ${BATCH} on 2 server processes${KILL ? `, one SIGKILLed after push ${killedAt} of ${totalPushes}` : ''}: ${(wallMs / 1000).toFixed(1)} s`,
    );
    console.log(`push: ${ms(run.pushMs)}`);
    console.log(`pull: ${ms(run.pullMs)}`);
    console.log(
      `requests sent again after a lost connection or 5xx: ${addr.retries} ${JSON.stringify(Object.fromEntries(addr.reasons))}; errors: ${run.errors.length}`,
    );
    for (const e of run.errors.slice(0, 10)) console.log(`  ${e}`);
    if (PROFILE) console.log(`profile: push latency by edits of shared records in the batch:\n${bySharedEdits(run, ms)}`);
    await PROFILE?.report(wallMs);
    const failed = await prove(db, run, states, siteIds);
    const p95 = percentile(run.pushMs, 95);
    // The floor right after the fleet, on the same machine and load: the same batches as plain INSERTs,
    // on as many connections as the two servers' pools (stopped first, so theirs are closed).
    await Promise.all(servers.map((s) => stopServer(s.child)));
    const connections = 2 * loadConfig({ databaseUrl: url }).dbPoolSize;
    const floor = await floorReference(url, connections, DEVICES, OPS, BATCH, DEMO_SITE_ID, collarIds);
    const floor95 = percentile(floor, 95);
    console.log(
      `reference, the same batches as plain multi-row INSERTs (${DEVICES} clients, ${connections} connections): ${floorLine(floor)}`,
    );
    console.log(
      `load average now: ${os
        .loadavg()
        .map((x) => x.toFixed(1))
        .join(' ')}; push p95 / reference p95: ${(p95 / floor95).toFixed(1)}×`,
    );
    console.log(
      `target p95 push ≤ 1 s: ${p95 <= 1000 ? 'met' : `NOT met (the floor on this machine now: p95 ${floor95.toFixed(0)} ms)`}; zero errors: ${run.errors.length ? 'NOT met' : 'met'}; proofs: ${failed ? 'FAILED' : 'hold'}`,
    );
    if (failed || run.errors.length) process.exitCode = 1;
  } finally {
    await db.end();
    for (const s of servers) s.child.kill('SIGTERM');
  }
}

/** The database against what the fleet sent and saw; returns the number of failed proofs. */
async function prove(db: Client, run: FleetRun, states: (DeviceState | null)[], siteIds: string[]): Promise<number> {
  let failed = 0;
  const check = (ok: boolean, what: string) => {
    console.log(`${ok ? 'ok  ' : 'FAIL'} ${what}`);
    if (!ok) failed++;
  };
  const ledger = (await db.query(`SELECT count(*)::int AS n, count(*) FILTER (WHERE status = 'pending')::int AS pending FROM sync_op`))
    .rows[0];
  check(
    ledger.n === run.fates.size && ledger.pending === 0,
    `op ledger: ${ledger.n} entries for ${run.fates.size} distinct ops sent, ${ledger.pending} pending`,
  );
  const dup = (
    await db.query(`SELECT count(*)::int AS n FROM (SELECT 1 FROM change_log GROUP BY entity, record_id, rev HAVING count(*) > 1) d`)
  ).rows[0].n;
  check(dup === 0, `change log: ${dup} (record, rev) pairs logged twice`);
  // Each bench record's rev is 1 + the edits answered applied or merged; its log has one entry per rev.
  const want = new Map<string, number>();
  for (const f of run.fates.values()) {
    if (f.kind === 'create' && f.status === 'applied') want.set(f.id, (want.get(f.id) ?? 0) + 1);
  }
  for (const f of run.fates.values()) {
    if (f.kind === 'edit' && (f.status === 'applied' || f.status === 'merged')) want.set(f.id, (want.get(f.id) ?? 0) + 1);
  }
  const rows = (
    await db.query(
      `SELECT e.id, e.rev, (SELECT count(*)::int FROM change_log l WHERE l.entity = 'collarEvent' AND l.record_id = e.id) AS logged
       FROM collar_event e WHERE e.id = ANY($1::uuid[])`,
      [[...want.keys()]],
    )
  ).rows as { id: string; rev: number; logged: number }[];
  const wrongRev = rows.filter((r) => Number(r.rev) !== want.get(r.id) || r.logged !== Number(r.rev));
  check(
    rows.length === want.size && !wrongRev.length,
    `ops: ${rows.length} of ${want.size} created records stored, ${wrongRev.length} whose rev or log differs from the applied creates + edits`,
  );
  for (const r of wrongRev.slice(0, 3))
    console.log(
      `     ${r.id}${run.shared.includes(r.id) ? ' (shared)' : ''}: rev ${r.rev}, ${r.logged} log entries, ${want.get(r.id)} applied ops`,
    );
  const dbState: DeviceState = new Map();
  for (const e of SYNC_ENTITIES) {
    const d = ENTITY_DEFS[e];
    const where = e === 'site' ? 'id = ANY($1::uuid[])' : 'site_id = ANY($1::uuid[])';
    for (const r of (await db.query(`SELECT id, rev, deleted FROM ${d.table} WHERE ${where}`, [siteIds])).rows)
      dbState.set(`${e}:${r.id}`, `${r.rev}:${r.deleted}`);
  }
  const differing = states.filter((s) => !s || s.size !== dbState.size || [...dbState].some(([k, v]) => s.get(k) !== v));
  check(
    !differing.length,
    `final pulls: ${states.length - differing.length} of ${states.length} devices hold exactly the database's ${dbState.size} records and revs`,
  );
  for (const st of differing.slice(0, 2)) {
    console.log(`     device ${states.indexOf(st)}: cursor after its first pull ${run.cursors.get(states.indexOf(st))}`);
    if (!st) {
      console.log('     a device that failed holds nothing');
      continue;
    }
    const keys = [...new Set([...dbState.keys(), ...st.keys()])].filter((k) => st.get(k) !== dbState.get(k));
    for (const k of keys.slice(0, 3)) {
      const [e, id] = k.split(':');
      const seqs = (await db.query(`SELECT seq, rev FROM change_log WHERE entity = $1 AND record_id = $2 ORDER BY seq`, [e, id])).rows.map(
        (r) => `${r.seq}/r${r.rev}`,
      );
      console.log(`     ${k}: device ${st.get(k) ?? 'missing'}, database ${dbState.get(k) ?? 'missing'}; log ${seqs.join(' ')}`);
    }
  }
  return failed;
}

/** SIGTERM, then the exit (the server closes its pool on the way out). */
function stopServer(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
  return new Promise((resolve) => {
    const hard = setTimeout(() => child.kill('SIGKILL'), 15_000);
    child.once('exit', () => {
      clearTimeout(hard);
      resolve();
    });
    child.kill('SIGTERM');
  });
}

const MAIN = path.resolve(__dirname, '../../../server/server/main.js');

/** Starts the compiled server on a free loopback port; resolves with its base URL. */
function startServerProcess(databaseUrl: string): Promise<{ base: string; child: ChildProcess }> {
  const probe = PROFILE ? ['--require', path.resolve(__dirname, 'fleet-probe.js')] : [];
  // BENCH_CPU_PROF=dir: each server writes a V8 CPU profile there when it stops (open it in DevTools).
  const cpuProf = process.env['BENCH_CPU_PROF'] ? ['--cpu-prof', `--cpu-prof-dir=${path.resolve(process.env['BENCH_CPU_PROF'])}`] : [];
  const child = spawn(process.execPath, [...probe, ...cpuProf, MAIN], {
    env: {
      ...process.env,
      DATABASE_URL: databaseUrl,
      PORT: '0',
      HOST: '127.0.0.1',
      STATIC_DIR: '/nonexistent',
      SESSION_SECRET: 'bench-fleet',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  return new Promise((resolve, reject) => {
    let out = '';
    const timer = setTimeout(() => reject(new Error(`server did not start: ${out}`)), 60000);
    const keep = (b: Buffer) => {
      out = (out + b.toString()).slice(-4000);
    };
    let lines = '';
    child.stdout!.on('data', (b: Buffer) => {
      if (PROFILE) {
        lines += b.toString();
        const done = lines.split('\n');
        lines = done.pop()!;
        for (const l of done) PROFILE.probe(l);
      }
      keep(b);
      const m = /listening on (http:\/\/[\d.]+:\d+)/.exec(out);
      if (m) {
        clearTimeout(timer);
        resolve({ base: m[1], child });
      }
    });
    child.stderr!.on('data', keep);
    child.on('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`server exited (${code}): ${out}`));
    });
  });
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
