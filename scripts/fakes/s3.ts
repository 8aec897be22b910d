import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { mkdir, open, readdir, readFile, rm, stat } from 'node:fs/promises';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
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
  /** Multipart uploads begun and neither completed nor aborted, with their part files on disk. */
  pendingUploads(): Promise<Array<{ key: string; uploadId: string; parts: number }>>;
  /** Stops answering (connections refused) while keeping every file, as if storage went down. */
  halt(): Promise<void>;
  /** Listens again on the same port after halt(). */
  resume(): Promise<void>;
  stop(): Promise<void>;
}

// s3rver keeps each key segment as a file name with a suffix of its own ("._S3rver_metadata.json"),
// and most file systems take 255 bytes per name. Real S3 allows 1024 bytes per key.
const SEGMENT_SUFFIX_BYTES = Buffer.byteLength('._S3rver_metadata.json');
const NAME_MAX_BYTES = 255;
const KEY_MAX_BYTES = 1024;
const UPLOAD_ID = /^[0-9a-f]{8,64}$/;

/**
 * A fake S3 on loopback with the bucket already created: s3rver, behind a small front of our own
 * that (1) refuses keys the disk cannot hold with an S3 error instead of letting s3rver crash
 * the process, and (2) adds the calls s3rver 3.7 lacks: ListMultipartUploads and
 * AbortMultipartUpload, over s3rver's own upload folders. (Those two skip the signature check:
 * a local fake only.)
 */
export async function startFakeS3(opts: FakeS3Options = {}): Promise<FakeS3> {
  const bucket = opts.bucket ?? 'trabeate';
  const temporary = !opts.directory;
  const directory = opts.directory ? path.resolve(opts.directory) : mkdtempSync(path.join(tmpdir(), 'trabeate-s3-'));
  mkdirSync(directory, { recursive: true });
  const s3rver = new S3rver({ directory, silent: true, configureBuckets: [{ name: bucket }] });
  // Koa's default handler prints every failed request; the XML answer already says what went wrong.
  s3rver.on('error', () => undefined);
  guardWrites(s3rver);
  await s3rver.configureBuckets();
  const inner = s3rver.callback();
  const uploadsDir = (b: string) => path.join(directory, b, '._S3rver_uploads');

  const handle = async (req: IncomingMessage, res: ServerResponse) => {
    const url = new URL(req.url ?? '/', 'http://127.0.0.1');
    const [, b = '', ...rest] = url.pathname.split('/');
    let key: string;
    try {
      key = rest.map((s) => decodeURIComponent(s)).join('/');
    } catch {
      return sendError(res, 400, 'InvalidURI', 'Could not parse the specified URI.');
    }
    if (key && !keyFits(key)) {
      return sendError(res, 400, 'KeyTooLongError', 'Your key is too long for this store.');
    }
    const uploadId = url.searchParams.get('uploadId');
    if (uploadId !== null && !UPLOAD_ID.test(uploadId)) {
      return sendError(res, 404, 'NoSuchUpload', 'The specified upload does not exist.');
    }
    if (req.method === 'GET' && b && !key && url.searchParams.has('uploads')) {
      return listUploads(res, b, url.searchParams.get('prefix') ?? '');
    }
    if (req.method === 'DELETE' && key && uploadId) {
      const dir = path.join(uploadsDir(b), uploadId);
      const recorded = await readFile(path.join(dir, 'key'), 'utf8').catch(() => undefined);
      if (recorded !== key) return sendError(res, 404, 'NoSuchUpload', 'The specified upload does not exist.');
      await rm(dir, { recursive: true, force: true });
      res.writeHead(204).end();
      return;
    }
    if (req.method === 'PUT' && key && uploadId) {
      // A part for an upload that was aborted (or never begun) must not bring its folder back.
      const exists = await stat(path.join(uploadsDir(b), uploadId, 'key')).then(
        () => true,
        () => false,
      );
      if (!exists) return sendError(res, 404, 'NoSuchUpload', 'The specified upload does not exist.');
    }
    inner(req, res);
  };

  const listUploads = async (res: ServerResponse, b: string, prefix: string) => {
    const exists = await stat(path.join(directory, b)).then(
      () => true,
      () => false,
    );
    if (!exists) return sendError(res, 404, 'NoSuchBucket', 'The specified bucket does not exist.');
    const uploads = (await pending(b)).filter((u) => u.key.startsWith(prefix));
    const items = uploads
      .map(
        (u) =>
          `<Upload><Key>${xml(u.key)}</Key><UploadId>${u.uploadId}</UploadId><Initiated>${u.initiated.toISOString()}</Initiated><StorageClass>STANDARD</StorageClass></Upload>`,
      )
      .join('');
    res.writeHead(200, { 'content-type': 'application/xml' });
    res.end(
      `<?xml version="1.0" encoding="UTF-8"?>\n<ListMultipartUploadsResult xmlns="http://s3.amazonaws.com/doc/2006-03-01/"><Bucket>${xml(b)}</Bucket><KeyMarker></KeyMarker><UploadIdMarker></UploadIdMarker><Prefix>${xml(prefix)}</Prefix><MaxUploads>1000</MaxUploads><IsTruncated>false</IsTruncated>${items}</ListMultipartUploadsResult>`,
    );
  };

  const pending = async (b: string) => {
    const root = uploadsDir(b);
    const ids = await readdir(root).catch(() => [] as string[]);
    const out: Array<{ key: string; uploadId: string; initiated: Date; parts: number }> = [];
    for (const uploadId of ids) {
      const dir = path.join(root, uploadId);
      const files = await readdir(dir).catch(() => [] as string[]);
      const keyFile = path.join(dir, 'key');
      const key = await readFile(keyFile, 'utf8').catch(() => '');
      const initiated = await stat(keyFile)
        .catch(() => stat(dir))
        .then(
          (st) => st.mtime,
          () => null,
        );
      // aborted or completed while it was being listed: no longer pending
      if (!initiated) continue;
      out.push({ key, uploadId, initiated, parts: files.filter((f) => /^\d+$/.test(f)).length });
    }
    return out.sort((x, y) => x.initiated.getTime() - y.initiated.getTime());
  };

  const server = createServer((req, res) => {
    handle(req, res).catch(() => {
      if (!res.headersSent) sendError(res, 500, 'InternalError', 'The fake could not complete the request.');
      else res.destroy();
    });
  });
  let port = await listen(server, opts.port ?? 0);
  const endpoint = `http://127.0.0.1:${port}`;
  let halted = false;

  return {
    endpoint,
    port,
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
    pendingUploads: async () => (await pending(bucket)).map(({ key, uploadId, parts }) => ({ key, uploadId, parts })),
    halt: async () => {
      if (halted) return;
      halted = true;
      await close(server);
    },
    resume: async () => {
      if (!halted) return;
      port = await listen(server, port);
      halted = false;
    },
    stop: async () => {
      if (!halted) await close(server);
      halted = true;
      if (temporary) rmSync(directory, { recursive: true, force: true });
    },
  };
}

function keyFits(key: string): boolean {
  if (Buffer.byteLength(key) > KEY_MAX_BYTES) return false;
  return key.split('/').every((segment) => Buffer.byteLength(segment) + SEGMENT_SUFFIX_BYTES <= NAME_MAX_BYTES);
}

/**
 * s3rver opens its write streams without an error listener, so a file the disk refuses (a name
 * too long, no permission) throws out of the process. Opening the file first turns that into a
 * rejected promise, which s3rver answers as an S3 error to that one request.
 */
function guardWrites(s3rver: S3rver): void {
  const store = s3rver.store;
  const probe = async (file: string) => {
    await mkdir(path.dirname(file), { recursive: true });
    await (await open(file, 'a')).close();
  };
  const putObject = store.putObject.bind(store);
  store.putObject = async (object) => {
    await probe(store.getResourcePath(object.bucket, object.key, 'object'));
    return putObject(object);
  };
  const putPart = store.putPart.bind(store);
  store.putPart = async (b, uploadId, partNumber, content) => {
    await probe(path.join(store.getResourcePath(b, undefined, 'uploads'), uploadId, String(partNumber)));
    return putPart(b, uploadId, partNumber, content);
  };
}

function sendError(res: ServerResponse, status: number, code: string, message: string): void {
  res.writeHead(status, { 'content-type': 'application/xml' });
  res.end(
    `<?xml version="1.0" encoding="UTF-8"?>\n<Error><Code>${code}</Code><Message>${xml(message)}</Message></Error>`,
  );
}

const xml = (s: string) =>
  s.replace(/[<>&'"]/g, (c) => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', "'": '&apos;', '"': '&quot;' })[c]!);

function listen(server: Server, port: number): Promise<number> {
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => {
      server.off('error', reject);
      resolve((server.address() as AddressInfo).port);
    });
  });
}

function close(server: Server): Promise<void> {
  return new Promise((resolve) => {
    server.close(() => resolve());
    server.closeAllConnections();
  });
}
