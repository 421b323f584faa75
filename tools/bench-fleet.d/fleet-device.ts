import { randomUUID } from 'node:crypto';
import { sleep, type Call } from './fleet-client';

/** What the fleet sent for one opId and the status it finally had (a replay's originalStatus counts). */
export interface OpFate {
  entity: string;
  id: string;
  kind: 'create' | 'edit';
  status: string;
}

export interface FleetRun {
  siteId: string;
  collarIds: string[];
  /** Records every device may edit too (10 % of the ops): overlapping edits. */
  shared: string[];
  ops: number;
  batch: number;
  fates: Map<string, OpFate>;
  pushMs: number[];
  /** For each push in pushMs: how many of its ops edit a shared record (the rows devices queue for). */
  pushShared: number[];
  pullMs: number[];
  errors: string[];
  /** Called after every push; the bench kills a process halfway. */
  onPush: () => void;
  /** Resolves when every device has pushed everything: the final pulls then see a still database. */
  allPushed: Promise<void>;
  /** Each device's cursor after its first pull. */
  cursors: Map<number, number>;
  /** A device says it has pushed everything (or given up); called once per device. */
  devicePushed: (n: number) => void;
  /** What each device is doing now, for the bench's report when the fleet stops moving. */
  phase: string[];
}

type Op = { opId: string; entity: string; id: string; baseRev: number | null; op: 'upsert'; fields: Record<string, unknown> };
export type DeviceState = Map<string, string>;

/** Reads the change log from `cursor` to its end into `state` (entity:id → rev:deleted); returns the new cursor. */
export async function pullAll(call: Call, run: FleetRun, deviceId: string, cursor: number, state: DeviceState): Promise<number> {
  for (let page = 0; page < 1000; page++) {
    const t = performance.now();
    const res = await call('GET', `/api/sync/pull?deviceId=${deviceId}&cursor=${cursor}&limit=2000`);
    run.pullMs.push(performance.now() - t);
    if (res.status !== 200) throw new Error(`pull failed: ${res.status} ${JSON.stringify(res.json).slice(0, 200)}`);
    for (const c of res.json.changes as { entity: string; id: string; rev: number; deleted: boolean }[]) {
      state.set(`${c.entity}:${c.id}`, `${c.rev}:${c.deleted}`);
    }
    cursor = res.json.cursor;
    if (!res.json.more) return cursor;
  }
  throw new Error('pull did not end after 1000 pages');
}

/**
 * One device at day's end: pull everything, push its outbox in batches (new collar events, edits of
 * its own earlier ones, edits of shared ones that other devices edit too, and replays of ops it sent
 * before), then, once the whole fleet has pushed, pull again from its cursor.
 */
export async function runDevice(call: Call, run: FleetRun, n: number, rand: () => number): Promise<DeviceState> {
  const deviceId = randomUUID();
  const state: DeviceState = new Map();
  run.phase[n] = 'first pull';
  const cursor = await pullAll(call, run, deviceId, 0, state);
  run.cursors.set(n, cursor);
  const own: { id: string; rev: number }[] = [];
  const sent: Op[] = [];
  let made = 0;
  for (let done = 0; done < run.ops;) {
    const ops: Op[] = [];
    const touched = new Set<string>();
    const size = Math.min(run.batch, run.ops - done);
    while (ops.length < size) {
      const r = rand();
      const k = done + ops.length;
      if (r < 0.1 && run.shared.length) {
        const id = run.shared[Math.floor(rand() * run.shared.length)];
        if (touched.has(id)) continue;
        touched.add(id);
        const known = Number((state.get(`collarEvent:${id}`) ?? '1:false').split(':')[0]);
        // Every edit sets a value no other op sets: an edit that changed nothing would keep the rev.
        const day = new Date(Date.UTC(2030, 0, 1) + (n * run.ops + k) * 86_400_000).toISOString().slice(0, 10);
        ops.push(edit(id, known, rand() < 0.5 ? { note: `device ${n} op ${k}` } : { date: day }));
      } else if (r < 0.15 && sent.length) {
        ops.push(sent[Math.floor(rand() * sent.length)]); // the same op again, as after a lost answer
      } else if (r < 0.45 && own.length) {
        const rec = own[Math.floor(rand() * own.length)];
        if (touched.has(rec.id)) continue;
        touched.add(rec.id);
        ops.push(edit(rec.id, rec.rev, { note: `device ${n} op ${k} edit` }));
      } else {
        ops.push({
          opId: randomUUID(),
          entity: 'collarEvent',
          id: randomUUID(),
          baseRev: null,
          op: 'upsert',
          fields: {
            siteId: run.siteId,
            collarId: run.collarIds[(n * 7 + made++) % run.collarIds.length],
            kind: 'clipped',
            date: '2026-06-01',
            note: `device ${n} op ${k}`,
          },
        });
      }
    }
    run.phase[n] = `push ${done / run.batch + 1}`;
    const results = await pushWithRetry(call, run, deviceId, run.ops - done, ops);
    ops.forEach((op, i) => {
      const res = results[i];
      const status = res.status === 'duplicate' && res.originalStatus ? res.originalStatus : res.status;
      if (!run.fates.has(op.opId))
        run.fates.set(op.opId, { entity: op.entity, id: op.id, kind: op.baseRev === null ? 'create' : 'edit', status });
      if (res.status === 'rejected') run.errors.push(`device ${n}: ${op.opId} rejected: ${res.error?.message}`);
      if (res.status === 'duplicate' && sent.includes(op)) return;
      if (op.baseRev === null && status === 'applied') own.push({ id: op.id, rev: res.rev ?? 1 });
      const mine = own.find((o) => o.id === op.id);
      if (mine && res.rev) mine.rev = res.rev;
      if (res.rev && run.shared.includes(op.id)) state.set(`collarEvent:${op.id}`, `${res.rev}:false`);
    });
    for (const op of ops) if (!sent.includes(op)) sent.push(op);
    done += size;
    run.onPush();
  }
  run.devicePushed(n);
  run.phase[n] = 'waiting for the fleet to push';
  await run.allPushed;
  run.phase[n] = 'final pull';
  await pullAll(call, run, deviceId, cursor, state);
  run.phase[n] = 'done';
  return state;
}

const edit = (id: string, baseRev: number, fields: Record<string, unknown>): Op => ({
  opId: randomUUID(),
  entity: 'collarEvent',
  id,
  baseRev,
  op: 'upsert',
  fields,
});

type Result = { opId: string; status: string; originalStatus?: string; rev?: number; error?: { message: string } };

/** A push; ops another request was still applying (a retry racing its first attempt) go again, a few times. */
async function pushWithRetry(call: Call, run: FleetRun, deviceId: string, outbox: number, ops: Op[]): Promise<Result[]> {
  const out: Result[] = new Array(ops.length);
  let pending = ops.map((op, i) => ({ op, i }));
  for (let attempt = 0; pending.length && attempt < 6; attempt++) {
    if (attempt) await sleep(300 * attempt);
    const t = performance.now();
    const res = await call('POST', '/api/sync/push', { deviceId, outboxSize: outbox, ops: pending.map((p) => p.op) });
    run.pushMs.push(performance.now() - t);
    run.pushShared.push(pending.filter((p) => p.op.baseRev !== null && run.shared.includes(p.op.id)).length);
    if (res.status !== 200) throw new Error(`push failed: ${res.status} ${JSON.stringify(res.json).slice(0, 200)}`);
    const again: typeof pending = [];
    (res.json.results as Result[]).forEach((r, k) => {
      if (r.status === 'rejected' && /being applied by another request/.test(r.error?.message ?? '')) again.push(pending[k]);
      else out[pending[k].i] = r;
    });
    pending = again;
  }
  for (const p of pending) out[p.i] = { opId: p.op.opId, status: 'rejected', error: { message: 'still being applied after 6 pushes' } };
  return out;
}
