import { mkdirSync } from 'node:fs';
import path from 'node:path';

// s3rver ships no types; the part used here is small.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const S3rver = require('s3rver') as new (o: Record<string, unknown>) => { run(): Promise<{ port: number }>; close(): Promise<void> };

/**
 * The local S3-compatible store of `npm start` (development only): loopback, data in a
 * git-ignored folder. Production points S3_ENDPOINT at real object storage instead.
 */
async function main() {
  const directory = process.env['FAKE_S3_DIR'] ?? path.resolve(__dirname, '../../../../.data/s3');
  const port = Number(process.env['FAKE_S3_PORT'] ?? 4569);
  const bucket = process.env['S3_BUCKET'] ?? 'fluxwalk';
  mkdirSync(directory, { recursive: true });
  const server = new S3rver({ address: '127.0.0.1', port, silent: true, directory, configureBuckets: [{ name: bucket }] });
  const addr = await server.run();
  console.log(`[fluxwalk] local S3-compatible store on http://127.0.0.1:${addr.port} (bucket ${bucket}, data in ${directory})`);
  const stop = () => void server.close().finally(() => process.exit(0));
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err) => {
  console.error('[fluxwalk] the local S3 store could not start:', err.message);
  process.exit(1);
});
