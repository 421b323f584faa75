import { spawnBuiltServer, type BuiltServer } from '../../test/e2e/support/app-server';
import { resetDatabase } from '../../test/support/reset-database';

/**
 * The built server on a loopback port against a freshly reset database with the demo scenario.
 * (The e2e helper finds the build relative to its own file, which moves when compiled here: the
 * checkout's root is passed in.)
 */
export async function startBenchServer(root: string, databaseUrl: string, port: number): Promise<BuiltServer> {
  await resetDatabase(databaseUrl);
  // BENCH_CPU_PROF=dir: the server writes a V8 CPU profile there when it stops (open in Chrome DevTools).
  const dir = process.env['BENCH_CPU_PROF'];
  return spawnBuiltServer({ root, port, databaseUrl, nodeArgs: dir ? ['--cpu-prof', `--cpu-prof-dir=${dir}`] : [] });
}
