import { GetObjectCommand, HeadObjectCommand, PutObjectCommand, S3Client } from '@aws-sdk/client-s3';
import type { Readable } from 'node:stream';

export interface ObjectStorageConfig {
  endpoint: string;
  bucket: string;
  region: string;
  accessKeyId: string;
  secretAccessKey: string;
}

/** Logger files and photos in S3-compatible storage: AWS, MinIO, or the local fake of development and tests. */
export interface ObjectStorage {
  put(key: string, body: Buffer, mediaType: string, sha256: string): Promise<void>;
  exists(key: string): Promise<boolean>;
  get(key: string): Promise<{ body: Readable; mediaType: string | undefined; size: number | undefined }>;
}

export function objectStorageFromEnv(env = process.env): ObjectStorageConfig | null {
  if (!env['S3_ENDPOINT'] || !env['S3_BUCKET']) return null;
  return {
    endpoint: env['S3_ENDPOINT'],
    bucket: env['S3_BUCKET'],
    region: env['S3_REGION'] ?? 'us-east-1',
    accessKeyId: env['S3_ACCESS_KEY'] ?? '',
    secretAccessKey: env['S3_SECRET_KEY'] ?? '',
  };
}

export function createObjectStorage(c: ObjectStorageConfig): ObjectStorage {
  const s3 = new S3Client({
    endpoint: c.endpoint,
    region: c.region,
    credentials: { accessKeyId: c.accessKeyId, secretAccessKey: c.secretAccessKey },
    // Path-style URLs and checksums only when required: many S3-compatible stores reject the SDK's defaults.
    forcePathStyle: true,
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
  return {
    async put(key, body, mediaType, sha256) {
      await s3.send(new PutObjectCommand({ Bucket: c.bucket, Key: key, Body: body, ContentType: mediaType, Metadata: { sha256 } }));
    },
    async exists(key) {
      try {
        await s3.send(new HeadObjectCommand({ Bucket: c.bucket, Key: key }));
        return true;
      } catch (err) {
        if ((err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return false;
        throw err;
      }
    },
    async get(key) {
      const out = await s3.send(new GetObjectCommand({ Bucket: c.bucket, Key: key }));
      return { body: out.Body as Readable, mediaType: out.ContentType, size: out.ContentLength };
    },
  };
}
