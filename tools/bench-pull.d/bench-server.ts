import { ChildProcess, spawn } from 'node:child_process';
import path from 'node:path';
import { resetDatabase } from '../../test/support/reset-database';

/**
 * The built server on a loopback port against a freshly reset database with the demo scenario.
 * (The e2e helper finds the build relative to its own file, which moves when compiled here.)
 */
export async function startBenchServer(
  root: string,
  databaseUrl: string,
  port: number,
): Promise<{ baseUrl: string; pid: number; stop(): Promise<void> }> {
  await resetDatabase(databaseUrl);
  let output = '';
  // BENCH_CPU_PROF=dir: the server writes a V8 CPU profile there when it stops (open in Chrome DevTools).
  const prof = process.env['BENCH_CPU_PROF'] ? ['--cpu-prof', `--cpu-prof-dir=${process.env['BENCH_CPU_PROF']}`] : [];
  const child: ChildProcess = spawn(process.execPath, [...prof, path.join(root, 'dist/server/server/main.js')], {
    cwd: root,
    env: {
      ...process.env,
      PORT: String(port),
      HOST: '127.0.0.1',
      DATABASE_URL: databaseUrl,
      STATIC_DIR: path.join(root, 'dist/app/browser'),
      NODE_ENV: 'production',
      APP_ORIGIN: `http://127.0.0.1:${port}`,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const keep = (chunk: Buffer) => {
    output = (output + chunk.toString()).slice(-4000);
  };
  child.stdout?.on('data', keep);
  child.stderr?.on('data', keep);
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 30_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`the server exited:\n${output}`);
    try {
      if ((await fetch(`${baseUrl}/api/health`)).ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`no /api/health within 30 s:\n${output}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    baseUrl,
    pid: child.pid ?? 0,
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null) return resolve();
        child.once('exit', () => resolve());
        child.kill('SIGTERM');
      }),
  };
}
