import { execFileSync } from 'node:child_process';
import { chmodSync, cpSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';

const isRoot = process.getuid?.() === 0;

function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = createServer().listen(0, '127.0.0.1', () => {
      const { port } = s.address() as { port: number };
      s.close(() => resolve(port));
    });
  });
}

/** Runs tools/lib/pg.sh from a copy of the scripts placed in `checkout`, as `npm start` would. */
function runPg(checkout: string, script: string): string {
  return execFileSync('bash', ['-c', `set -euo pipefail; source tools/lib/common.sh; source tools/lib/pg.sh; ${script}`], {
    cwd: checkout,
    encoding: 'utf8',
    stdio: ['ignore', 'pipe', 'pipe'],
    timeout: 60000,
  });
}

describe('the private PostgreSQL cluster (tools/lib/pg.sh)', () => {
  jest.setTimeout(90000);
  let top: string;
  beforeEach(() => {
    top = mkdtempSync(path.join(tmpdir(), 'fw-pg-'));
  });
  afterEach(() => rmSync(top, { recursive: true, force: true }));

  it('when the checkout sits under a folder the postgres user cannot enter, then the cluster moves to /var/tmp and still answers', async () => {
    const checkout = path.join(top, 'private', 'fluxwalk');
    mkdirSync(checkout, { recursive: true });
    cpSync(path.resolve(__dirname), path.join(checkout, 'tools', 'lib'), { recursive: true });
    chmodSync(path.join(top, 'private'), 0o700); // like a checkout in /root
    const port = await freePort();
    try {
      const out = runPg(
        checkout,
        `pg_up pg ${port} fluxwalk_probe 2>&1; psql "$DATABASE_URL" -tAc 'select current_user' ; pg_data_dir pg 2>/dev/null`,
      );
      expect(out).toContain('app');
      if (isRoot) {
        expect(out).toMatch(/keeping the pg cluster in \/var\/tmp\/fluxwalk-[0-9a-f]{12}\/pg/);
        // As root the server runs as the postgres OS user (PostgreSQL refuses to run as root).
        const owner = execFileSync('bash', ['-c', `ps -o user= -p $(head -1 "${out.trim().split('\n').pop()}/postmaster.pid")`], {
          encoding: 'utf8',
        });
        expect(owner.trim()).toBe('postgres');
      }
    } finally {
      const dir = runPg(checkout, 'pg_data_dir pg 2>/dev/null').trim();
      runPg(checkout, 'pg_down pg');
      if (dir.startsWith('/var/tmp/fluxwalk-')) rmSync(path.dirname(dir), { recursive: true, force: true });
    }
  });
});
