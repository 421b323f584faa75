import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { ObjectStorageConfig } from '../../server/attachments/object-storage';

// s3rver ships no types; the part used here is small.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const S3rver = require('s3rver') as new (o: Record<string, unknown>) => { run(): Promise<{ port: number }>; close(): Promise<void> };

/** The local S3-compatible fake on a free loopback port, with its data in a temporary folder. */
export async function startFakeS3(bucket = 'fluxwalk-test'): Promise<{ config: ObjectStorageConfig; stop(): Promise<void> }> {
  const directory = mkdtempSync(path.join(tmpdir(), 'fw-s3-'));
  const server = new S3rver({ address: '127.0.0.1', port: 0, silent: true, directory, configureBuckets: [{ name: bucket }] });
  const { port } = await server.run();
  return {
    config: { endpoint: `http://127.0.0.1:${port}`, bucket, region: 'us-east-1', accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
    async stop() {
      await server.close();
      rmSync(directory, { recursive: true, force: true });
    },
  };
}
