import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import path from 'node:path';

const MAIN = path.resolve(__dirname, '../../dist/server/server/main.js');

/** Starts the compiled server on a free port against `databaseUrl`; resolves with its base URL. */
export async function startServerProcess(databaseUrl: string): Promise<{ base: string; child: ChildProcess }> {
  if (!existsSync(MAIN)) throw new Error(`${MAIN} is missing: build the server first (npm run build:server; npm test does it)`);
  const child = spawn(process.execPath, [MAIN], {
    env: { ...process.env, DATABASE_URL: databaseUrl, PORT: '0', STATIC_DIR: '/nonexistent', SESSION_SECRET: 'crash-test' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const base = await new Promise<string>((resolve, reject) => {
    let out = '';
    const timer = setTimeout(() => reject(new Error(`server did not start: ${out}`)), 20000);
    child.stdout!.on('data', (b: Buffer) => {
      out += b.toString();
      const m = /listening on (http:\/\/[\d.]+:\d+)/.exec(out);
      if (m) {
        clearTimeout(timer);
        resolve(m[1]);
      }
    });
    child.stderr!.on('data', (b: Buffer) => {
      out += b.toString();
    });
    child.on('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`server exited (${code}): ${out}`));
    });
  });
  return { base, child };
}
