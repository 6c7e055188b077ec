import { join, resolve } from 'node:path';
import { z } from 'zod';
import type { BlobStore } from './types';
import { createDiskBlobStore } from './disk';
import type { S3StoreOptions } from './s3';
import { DEFAULT_UPLOAD_MAX_BYTES } from '../../shared/schemas/attachments';

export type { BlobStore } from './types';
export { createMemoryBlobStore } from './memory';
export { createDiskBlobStore } from './disk';

const blank = (s: unknown) => (typeof s === 'string' && s.trim() === '' ? undefined : s);
const opt = z.preprocess(blank, z.string().optional());

const StorageEnvSchema = z
  .object({
    S3_BUCKET: opt,
    S3_ENDPOINT: z.preprocess(blank, z.url('S3_ENDPOINT must be an address, e.g. https://s3.example.test').optional()),
    S3_REGION: z.preprocess(blank, z.string().default('us-east-1')),
    S3_ACCESS_KEY_ID: opt,
    S3_SECRET_ACCESS_KEY: opt,
    S3_FORCE_PATH_STYLE: z.preprocess(blank, z.enum(['1', '0', 'true', 'false', 'yes', 'no']).optional()),
    UPLOAD_MAX_MB: z.preprocess(blank, z.coerce.number().positive().max(100, 'UPLOAD_MAX_MB is at most 100.').optional()),
  })
  .refine((e) => !e.S3_ACCESS_KEY_ID === !e.S3_SECRET_ACCESS_KEY, {
    message: 'Set both S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY, or neither.',
    path: ['S3_ACCESS_KEY_ID'],
  })
  .refine((e) => e.S3_BUCKET || !e.S3_ENDPOINT, { message: 'S3_ENDPOINT is set: set S3_BUCKET too.', path: ['S3_BUCKET'] });

function readStorageEnv(env: NodeJS.ProcessEnv) {
  const parsed = StorageEnvSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Lashline cannot start: the file storage settings are not right.\n${lines.join('\n')}`);
  }
  return parsed.data;
}

/**
 * S3-compatible storage when S3_BUCKET is set; otherwise files on disk under DATA_DIR/uploads,
 * which is outside the client build and never served as static files.
 */
export function createBlobStore(env: NodeJS.ProcessEnv, dataDir: string): BlobStore & { describe: string } {
  const e = readStorageEnv(env);
  if (e.S3_BUCKET) {
    // Path style is what most self-hosted S3-compatible services expect; AWS itself prefers virtual hosts.
    const pathStyle = e.S3_FORCE_PATH_STYLE ? ['1', 'true', 'yes'].includes(e.S3_FORCE_PATH_STYLE) : Boolean(e.S3_ENDPOINT);
    const store = lazyS3BlobStore({
      bucket: e.S3_BUCKET,
      region: e.S3_REGION,
      endpoint: e.S3_ENDPOINT,
      forcePathStyle: pathStyle,
      credentials: e.S3_ACCESS_KEY_ID ? { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY! } : undefined,
    });
    return Object.assign(store, { describe: `S3 bucket ${e.S3_BUCKET}${e.S3_ENDPOINT ? ` at ${e.S3_ENDPOINT}` : ''}` });
  }
  const root = join(resolve(dataDir), 'uploads');
  return Object.assign(createDiskBlobStore(root), { describe: `files in ${root}` });
}

/**
 * The S3 client loads with the first file stored or read: a server keeping files on disk never
 * holds the SDK in memory.
 */
function lazyS3BlobStore(o: S3StoreOptions): BlobStore {
  let store: Promise<BlobStore> | undefined;
  const real = () => (store ??= import('./s3').then((m) => m.createS3BlobStore(o)));
  return {
    put: async (key, bytes, contentType) => (await real()).put(key, bytes, contentType),
    get: async (key) => (await real()).get(key),
    delete: async (key) => (await real()).delete(key),
  };
}

/** The largest upload accepted, from UPLOAD_MAX_MB (8 MB when unset). */
export function uploadMaxBytesFromEnv(env: NodeJS.ProcessEnv): number {
  const mb = readStorageEnv(env).UPLOAD_MAX_MB;
  return mb ? Math.round(mb * 1024 * 1024) : DEFAULT_UPLOAD_MAX_BYTES;
}
