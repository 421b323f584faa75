/**
 * Loaded into each server process with `node --require` when the bench runs with BENCH_PROFILE=1:
 * every 2 s it prints one `[probe] {json}` line on stdout with the event-loop delay (p50/p99/max,
 * ms), the process's CPU (user + system, ms) and requests finished since the last line, and the pg
 * pool's waiting requests (sampled every 50 ms: connections asked for while none was free).
 * Nothing here changes what the server does.
 */
import diagnostics from 'node:diagnostics_channel';
import { monitorEventLoopDelay } from 'node:perf_hooks';

/** One `[probe]` line: a server's last 2 s (times in ms). */
export interface ProbeLine {
  pid: number;
  loopP50: number;
  loopP99: number;
  loopMax: number;
  cpuMs: number;
  requests: number;
  poolWaitingAvg: number;
  poolWaitingMax: number;
  poolBusyAvg: number;
}

const delay = monitorEventLoopDelay({ resolution: 10 });
delay.enable();
let requests = 0;
diagnostics.subscribe('http.server.response.finish', () => requests++);

// The pg module the server loads: its Pool counts clients waiting for a connection.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const pg = require('pg') as { Pool: { prototype: { connect: (...a: unknown[]) => unknown } } };
const pools = new Set<{ waitingCount: number; totalCount: number; idleCount: number }>();
const connect = pg.Pool.prototype.connect;
pg.Pool.prototype.connect = function (this: never, ...a: unknown[]) {
  pools.add(this);
  return connect.apply(this, a);
};
let waitSum = 0,
  waitMax = 0,
  busySum = 0,
  samples = 0;
setInterval(() => {
  let waiting = 0,
    busy = 0;
  for (const p of pools) {
    waiting += p.waitingCount;
    busy += p.totalCount - p.idleCount;
  }
  waitSum += waiting;
  busySum += busy;
  waitMax = Math.max(waitMax, waiting);
  samples++;
}, 50).unref();

let cpu = process.cpuUsage();
setInterval(() => {
  const now = process.cpuUsage(cpu);
  cpu = process.cpuUsage();
  const line: ProbeLine = {
    pid: process.pid,
    loopP50: delay.percentile(50) / 1e6,
    loopP99: delay.percentile(99) / 1e6,
    loopMax: delay.max / 1e6,
    cpuMs: (now.user + now.system) / 1000,
    requests,
    poolWaitingAvg: samples ? waitSum / samples : 0,
    poolWaitingMax: waitMax,
    poolBusyAvg: samples ? busySum / samples : 0,
  };
  process.stdout.write(`[probe] ${JSON.stringify(line)}\n`);
  delay.reset();
  requests = 0;
  waitSum = waitMax = busySum = samples = 0;
}, 2000).unref();
