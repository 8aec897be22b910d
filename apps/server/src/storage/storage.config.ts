import { z } from 'zod';

// Environment fragment for object storage, to merge into core/config.ts. Empty strings count as
// absent, so `S3_ENDPOINT=` in an .env file means "real AWS" rather than an invalid URL.
const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);
const bool = z.enum(['true', 'false']).transform((v) => v === 'true');

export const storageConfigShape = {
  /** S3-compatible endpoint (http://127.0.0.1:4312 for the local fake); absent means AWS itself. */
  S3_ENDPOINT: z.preprocess(blankToUndefined, z.url().optional()),
  S3_REGION: z.string().min(1).default('us-east-1'),
  S3_BUCKET: z
    .string()
    .regex(/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/, 'must be a valid S3 bucket name')
    .default('trabeate'),
  /** Both or neither: without them the AWS SDK's default chain (instance role, env, profile) is used. */
  S3_ACCESS_KEY_ID: z.preprocess(blankToUndefined, z.string().min(1).optional()),
  S3_SECRET_ACCESS_KEY: z.preprocess(blankToUndefined, z.string().min(1).optional()),
  /** Path-style URLs (http://host/bucket/key); needed by the local fake and most S3 look-alikes. */
  S3_FORCE_PATH_STYLE: bool.default(false),
  /** The largest single upload accepted, in bytes (default 1 GiB). */
  UPLOAD_MAX_BYTES: z.coerce
    .number()
    .int()
    .min(1)
    .default(1024 * 1024 * 1024),
};

export const storageConfigSchema = z.object(storageConfigShape).superRefine((c, ctx) => {
  if (Boolean(c.S3_ACCESS_KEY_ID) !== Boolean(c.S3_SECRET_ACCESS_KEY)) {
    ctx.addIssue({
      code: 'custom',
      path: ['S3_ACCESS_KEY_ID'],
      message: 'and S3_SECRET_ACCESS_KEY must be set together',
    });
  }
});

export type StorageEnv = z.infer<typeof storageConfigSchema>;

export interface ObjectStoreConfig {
  endpoint?: string;
  region: string;
  bucket: string;
  credentials?: { accessKeyId: string; secretAccessKey: string };
  forcePathStyle: boolean;
}

/** Turns the checked environment into the store's options. */
export function objectStoreConfigFrom(env: Omit<StorageEnv, 'UPLOAD_MAX_BYTES'>): ObjectStoreConfig {
  return {
    endpoint: env.S3_ENDPOINT,
    region: env.S3_REGION,
    bucket: env.S3_BUCKET,
    credentials:
      env.S3_ACCESS_KEY_ID && env.S3_SECRET_ACCESS_KEY
        ? { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY }
        : undefined,
    forcePathStyle: env.S3_FORCE_PATH_STYLE,
  };
}
