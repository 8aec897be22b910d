import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import S3rver from 's3rver';

/** s3rver checks signatures against these fixed keys. LOCAL ONLY. */
export const FAKE_S3_CREDENTIALS = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } as const;

export interface FakeS3Options {
  /** 0 (the default) lets the system pick a free port. */
  port?: number;
  bucket?: string;
  /** Where objects are kept; a fresh temporary folder (removed on stop) when absent. */
  directory?: string;
}

export interface FakeS3 {
  endpoint: string;
  port: number;
  bucket: string;
  directory: string;
  /** The environment the API needs to use this fake. */
  env: Record<string, string>;
  stop(): Promise<void>;
}

/** A fake S3 in this process, bound to loopback only, with the bucket already created. */
export async function startFakeS3(opts: FakeS3Options = {}): Promise<FakeS3> {
  const bucket = opts.bucket ?? 'trabeate';
  const temporary = !opts.directory;
  const directory = opts.directory ? path.resolve(opts.directory) : mkdtempSync(path.join(tmpdir(), 'trabeate-s3-'));
  mkdirSync(directory, { recursive: true });
  const server = new S3rver({
    address: '127.0.0.1',
    port: opts.port ?? 0,
    directory,
    silent: true,
    configureBuckets: [{ name: bucket }],
  });
  const address = await server.run();
  const endpoint = `http://127.0.0.1:${address.port}`;
  return {
    endpoint,
    port: address.port,
    bucket,
    directory,
    env: {
      S3_ENDPOINT: endpoint,
      S3_REGION: 'us-east-1',
      S3_BUCKET: bucket,
      S3_ACCESS_KEY_ID: FAKE_S3_CREDENTIALS.accessKeyId,
      S3_SECRET_ACCESS_KEY: FAKE_S3_CREDENTIALS.secretAccessKey,
      S3_FORCE_PATH_STYLE: 'true',
    },
    stop: async () => {
      await server.close();
      if (temporary) rmSync(directory, { recursive: true, force: true });
    },
  };
}
