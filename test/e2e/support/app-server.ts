import { ChildProcess, spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { createServer } from 'node:net';
import path from 'node:path';
import type { ObjectStorageConfig } from '../../../server/attachments/object-storage';
import { startFakeS3 } from '../../support/fake-s3';
import { resetDatabase } from '../../support/reset-database';

const ROOT = path.resolve(__dirname, '../../..');
const SERVER_MAIN = path.join(ROOT, 'dist/server/server/main.js');
const APP_INDEX = path.join(ROOT, 'dist/app/browser/index.html');

export interface RunningServer {
  baseUrl: string;
  /** The fake S3 the server keeps files in (started in this test process), for reading objects back. */
  storage: ObjectStorageConfig;
  stop(): Promise<void>;
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const addr = probe.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      probe.close(() => resolve(port));
    });
  });
}

async function waitForHealth(baseUrl: string, child: ChildProcess, log: () => string): Promise<void> {
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`the server exited (${child.exitCode}):\n${log()}`);
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`the server did not answer /api/health within 30 s:\n${log()}`);
}

export interface BuiltServer {
  baseUrl: string;
  pid: number;
  stop(): Promise<void>;
}

/**
 * The tsc-built server of the checkout at `root` on a loopback port, in production mode against
 * `databaseUrl`, once it answers /api/health (its last output is in the error otherwise). Browser
 * tests and the benchmarks start it the same way; `env` adds settings, `nodeArgs` go before the script.
 */
export async function spawnBuiltServer(opts: {
  root: string;
  port: number;
  databaseUrl: string;
  env?: NodeJS.ProcessEnv;
  nodeArgs?: string[];
}): Promise<BuiltServer> {
  const { root, port } = opts;
  let output = '';
  const child = spawn(process.execPath, [...(opts.nodeArgs ?? []), path.join(root, 'dist/server/server/main.js')], {
    cwd: root,
    env: {
      ...process.env,
      PORT: String(port),
      HOST: '127.0.0.1',
      DATABASE_URL: opts.databaseUrl,
      STATIC_DIR: path.join(root, 'dist/app/browser'),
      NODE_ENV: 'production',
      // Production refuses to start without the origin that mail links and tags point at.
      APP_ORIGIN: `http://127.0.0.1:${port}`,
      ...opts.env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const keep = (chunk: Buffer) => {
    output = (output + chunk.toString()).slice(-4000);
  };
  child.stdout?.on('data', keep);
  child.stderr?.on('data', keep);
  const baseUrl = `http://127.0.0.1:${port}`;
  try {
    await waitForHealth(baseUrl, child, () => output);
  } catch (err) {
    child.kill('SIGKILL');
    throw err;
  }
  return {
    baseUrl,
    pid: child.pid ?? 0,
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null) return resolve();
        const timer = setTimeout(() => child.kill('SIGKILL'), 5000);
        child.once('exit', () => {
          clearTimeout(timer);
          resolve();
        });
        child.kill('SIGTERM');
      }),
  };
}

/**
 * The real server (tsc-compiled) serving the production build on a free loopback port, against
 * a freshly reset E2E database with the demo scenario. Files run in band, so each file resets
 * the database in its beforeAll and nothing leaks between files.
 */
export async function startAppServer(): Promise<RunningServer> {
  const databaseUrl = process.env['E2E_DATABASE_URL'];
  if (!databaseUrl) throw new Error('E2E_DATABASE_URL is not set: run the browser tests through `npm test`');
  for (const file of [SERVER_MAIN, APP_INDEX]) {
    if (!existsSync(file)) throw new Error(`${path.relative(ROOT, file)} is missing: run \`npm run build\` first`);
  }
  await resetDatabase(databaseUrl);
  // Files (logger exports, photos) go to a fake S3 on loopback that lives as long as the server.
  const s3 = await startFakeS3();
  const port = await freePort();
  let server: BuiltServer;
  try {
    server = await spawnBuiltServer({
      root: ROOT,
      port,
      databaseUrl,
      env: {
        S3_ENDPOINT: s3.config.endpoint,
        S3_BUCKET: s3.config.bucket,
        S3_REGION: s3.config.region,
        S3_ACCESS_KEY: s3.config.accessKeyId,
        S3_SECRET_KEY: s3.config.secretAccessKey,
      },
    });
  } catch (err) {
    await s3.stop();
    throw err;
  }
  return {
    baseUrl: server.baseUrl,
    storage: s3.config,
    stop: async () => {
      await server.stop();
      await s3.stop();
    },
  };
}
