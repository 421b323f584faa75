import { readFileSync } from 'node:fs';
import { Client } from 'pg';
import type { ProbeLine } from './fleet-probe';

/**
 * The fleet bench's profile (BENCH_PROFILE=1): what PostgreSQL's sessions wait on, sampled every
 * 250 ms from pg_stat_activity; the servers' own lines from fleet-probe (event-loop delay, CPU per
 * request, pool waits); PostgreSQL's CPU from /proc; and, when the cluster preloads it, the
 * statements with the most execution time from pg_stat_statements.
 */
export class FleetProfile {
  private readonly waits = new Map<string, number>();
  private readonly holders = new Map<string, number>();
  private samples = 0;
  private timer: NodeJS.Timeout | null = null;
  private readonly probes = new Map<number, ProbeLine[]>();
  private pgCpu0 = 0;
  private postmaster = 0;
  private busy = false;

  constructor(private readonly url: string) {}

  async start(): Promise<void> {
    const db = new Client({ connectionString: this.url });
    await db.connect();
    const pid = (await db.query(`SELECT pg_backend_pid() AS p`)).rows[0].p as number;
    this.postmaster = Number(readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ')[1]);
    this.pgCpu0 = pgCpuMs(this.postmaster);
    await db.query(`SELECT pg_stat_statements_reset()`).catch(() => undefined);
    this.timer = setInterval(() => {
      if (this.busy) return;
      this.busy = true;
      db.query(
        `SELECT coalesce(state, '-') AS state, coalesce(wait_event_type || ':' || wait_event, 'on CPU') AS wait,
                left(regexp_replace(query, '\\s+', ' ', 'g'), 60) AS q
           FROM pg_stat_activity WHERE datname = current_database() AND pid <> pg_backend_pid() AND backend_type = 'client backend'`,
      )
        .then((r) => {
          this.samples++;
          for (const row of r.rows) {
            const key = row.state === 'active' ? `active, ${row.wait}` : row.state;
            this.waits.set(key, (this.waits.get(key) ?? 0) + 1);
            if (row.state === 'idle in transaction') this.holders.set(row.q, (this.holders.get(row.q) ?? 0) + 1);
          }
        })
        .catch(() => undefined)
        .finally(() => (this.busy = false));
    }, 250);
    this.stop = async () => {
      clearInterval(this.timer!);
      while (this.busy) await new Promise((r) => setTimeout(r, 20));
      const statements = await db
        .query(
          `SELECT calls, round(total_exec_time)::int AS ms, round(mean_exec_time::numeric, 2) AS mean,
                  left(regexp_replace(query, '\\s+', ' ', 'g'), 80) AS q
             FROM pg_stat_statements WHERE dbid = (SELECT oid FROM pg_database WHERE datname = current_database())
            ORDER BY total_exec_time DESC LIMIT 8`,
        )
        .then((r) => r.rows)
        .catch(() => null);
      await db.end();
      return statements;
    };
  }

  stop: () => Promise<unknown[] | null> = async () => null;

  /** Takes the `[probe] {…}` lines of a server's stdout. */
  probe(line: string): void {
    const m = /^\[probe\] (\{.*\})$/.exec(line);
    if (!m) return;
    const p = JSON.parse(m[1]) as ProbeLine;
    const list = this.probes.get(p.pid) ?? [];
    list.push(p);
    this.probes.set(p.pid, list);
  }

  async report(wallMs: number): Promise<void> {
    const statements = await this.stop();
    const pgMs = pgCpuMs(this.postmaster) - this.pgCpu0;
    console.log(`profile: PostgreSQL sessions by state, mean over ${this.samples} samples (250 ms apart):`);
    for (const [k, n] of [...this.waits].sort((a, b) => b[1] - a[1]).slice(0, 10)) console.log(`  ${(n / this.samples).toFixed(2)}  ${k}`);
    console.log(`  last statement of sessions idle in a transaction (waiting on Node), mean:`);
    for (const [k, n] of [...this.holders].sort((a, b) => b[1] - a[1]).slice(0, 6))
      console.log(`    ${(n / this.samples).toFixed(2)}  ${k}`);
    let cpu = 0,
      reqs = 0;
    for (const [pid, list] of this.probes) {
      const sum = (k: Exclude<keyof ProbeLine, 'pid'>) => list.reduce((s, p) => s + p[k], 0);
      const med = (k: Exclude<keyof ProbeLine, 'pid'>) => [...list.map((p) => p[k])].sort((a, b) => a - b)[Math.floor(list.length / 2)];
      cpu += sum('cpuMs');
      reqs += sum('requests');
      console.log(
        `profile: server ${pid}: event-loop delay median of 2 s windows p50 ${med('loopP50').toFixed(0)} ms, p99 ${med('loopP99').toFixed(0)} ms, worst ${Math.max(...list.map((p) => p.loopMax)).toFixed(0)} ms; ` +
          `CPU ${(sum('cpuMs') / 1000).toFixed(1)} s for ${sum('requests')} requests; connections in use ${(sum('poolBusyAvg') / list.length).toFixed(1)} (mean), ` +
          `requests waiting for a connection mean ${(sum('poolWaitingAvg') / list.length).toFixed(1)}, max ${Math.max(...list.map((p) => p.poolWaitingMax))}`,
      );
    }
    console.log(
      `profile: CPU over the ${(wallMs / 1000).toFixed(0)} s run: servers ${(cpu / 1000).toFixed(1)} s (${(cpu / Math.max(1, reqs)).toFixed(1)} ms a request), ` +
        `PostgreSQL ${(pgMs / 1000).toFixed(1)} s; 2 cores give ${((2 * wallMs) / 1000).toFixed(0)} s`,
    );
    if (statements) {
      console.log(`profile: pg_stat_statements, most execution time:`);
      for (const s of statements as { calls: number; ms: number; mean: string; q: string }[])
        console.log(`  ${s.ms} ms, ${s.calls} calls, ${s.mean} ms each: ${s.q}`);
    }
  }
}

/** CPU of the postmaster, its reaped children and its live children (the backends), in ms. */
function pgCpuMs(postmaster: number): number {
  const tick = 10; // USER_HZ is 100 on Linux
  const stat = (pid: number) => readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
  let ms = 0;
  try {
    const s = stat(postmaster);
    ms += (Number(s[11]) + Number(s[12]) + Number(s[13]) + Number(s[14])) * tick;
    const children = readFileSync(`/proc/${postmaster}/task/${postmaster}/children`, 'utf8').trim().split(/\s+/).filter(Boolean);
    for (const c of children) {
      try {
        const cs = stat(Number(c));
        ms += (Number(cs[11]) + Number(cs[12])) * tick;
      } catch {
        // gone meanwhile
      }
    }
  } catch {
    return 0;
  }
  return ms;
}
