import type { Readable } from 'node:stream';
import {
  AbortMultipartUploadCommand,
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  ListMultipartUploadsCommand,
  ListObjectsV2Command,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import type { ObjectStoreConfig } from './storage.config';
import { asStorageError } from './storage-errors';

/** lib-storage holds at most queueSize × partSize bytes of a stream in memory (here 2 × 8 MiB). */
export const UPLOAD_PART_BYTES = 8 * 1024 * 1024;
export const UPLOAD_QUEUE_SIZE = 2;

export interface PutOptions {
  contentType: string;
  /** Aborting stops the upload and removes what was sent (multipart parts included). */
  signal?: AbortSignal;
  metadata?: Record<string, string>;
}

export interface StoredObject {
  body: Readable;
  contentLength?: number;
  contentType?: string;
}

export interface ObjectInfo {
  key: string;
  size: number;
  contentType?: string;
}

/** A multipart upload that was begun and neither completed nor aborted (its parts still stored). */
export interface IncompleteUpload {
  key: string;
  uploadId: string;
  initiated: Date;
}

/**
 * Every call that reaches storage fails with StorageUnavailable when storage cannot be reached
 * (refused, timed out, a 5xx): the edge answers 503 for it, not 500.
 */
export interface ObjectStore {
  readonly bucket: string;
  putStream(key: string, body: Readable, opts: PutOptions): Promise<void>;
  getStream(key: string): Promise<StoredObject>;
  /** Bytes [start, end) of an object, for checks that read a little from a large file. */
  readRange(key: string, start: number, end: number): Promise<Buffer>;
  head(key: string): Promise<ObjectInfo | null>;
  list(prefix: string): Promise<ObjectInfo[]>;
  /** A time-limited download link that makes browsers save the file under `downloadName`. */
  signedGetUrl(key: string, ttlSeconds: number, downloadName?: string): Promise<string>;
  /** Removes an object; removing one that is not there is not an error. */
  remove(key: string): Promise<void>;
  /** Multipart uploads under `prefix` that were begun and never completed or aborted. */
  listIncompleteUploads(prefix?: string): Promise<IncompleteUpload[]>;
  /** Aborts a multipart upload and frees its parts; one already gone is not an error. */
  abortUpload(key: string, uploadId: string): Promise<void>;
  /** Creates the bucket when missing (local fakes and first runs; production buckets exist). */
  ensureBucket(): Promise<void>;
  close(): void;
  /** HeadBucket with a deadline, for the health check: resolves when the bucket answers. */
  probe(timeoutMs: number): Promise<void>;
}

export function createObjectStore(config: ObjectStoreConfig): ObjectStore {
  const client = new S3Client({
    endpoint: config.endpoint,
    region: config.region,
    credentials: config.credentials,
    forcePathStyle: config.forcePathStyle,
    // Without these, a streamed PutObject to an S3 look-alike that does not know the newer
    // checksum trailers is stored with its aws-chunked framing and still reports success.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
    // Storage that does not answer is down, not slow: give up on a connection after 5 s, and on a
    // socket that sends nothing for a minute (an idle timeout, so large streams are not cut).
    requestHandler: { connectionTimeout: 5_000, requestTimeout: 60_000 },
  });
  const call = async <T>(send: () => Promise<T>): Promise<T> => {
    try {
      return await send();
    } catch (err) {
      throw asStorageError(err);
    }
  };
  const Bucket = config.bucket;

  return {
    bucket: Bucket,

    async putStream(key, body, opts) {
      const upload = new Upload({
        client,
        params: { Bucket, Key: key, Body: body, ContentType: opts.contentType, Metadata: opts.metadata },
        queueSize: UPLOAD_QUEUE_SIZE,
        partSize: UPLOAD_PART_BYTES,
        leavePartsOnError: false,
      });
      // Ending the body with an error (rather than upload.abort(), which settles at once while
      // parts are still on their way) lets lib-storage finish the part in flight and then abort
      // the multipart upload before done() settles: no part can land after the abort.
      const onAbort = () => body.destroy(Object.assign(new Error('The upload was aborted.'), { name: 'AbortError' }));
      if (opts.signal?.aborted) onAbort();
      opts.signal?.addEventListener('abort', onAbort, { once: true });
      try {
        await upload.done();
      } catch (err) {
        // lib-storage aborts the multipart upload itself; when that call failed (storage went
        // away), one more try here, and the scheduled sweep removes whatever is still left.
        if (upload.uploadId) await abortQuietly(key, upload.uploadId).catch(() => undefined);
        // A small body goes up as one PutObject that may have landed before the failure was seen.
        await removeQuietly(key).catch(() => undefined);
        throw asStorageError(err);
      } finally {
        opts.signal?.removeEventListener('abort', onAbort);
      }
    },

    async getStream(key) {
      const res = await call(() => client.send(new GetObjectCommand({ Bucket, Key: key })));
      return { body: res.Body as Readable, contentLength: res.ContentLength, contentType: res.ContentType };
    },

    async readRange(key, start, end) {
      if (end <= start) return Buffer.alloc(0);
      return call(async () => {
        const res = await client.send(new GetObjectCommand({ Bucket, Key: key, Range: `bytes=${start}-${end - 1}` }));
        return Buffer.from(await res.Body!.transformToByteArray());
      });
    },

    async head(key) {
      try {
        const res = await client.send(new HeadObjectCommand({ Bucket, Key: key }));
        return { key, size: res.ContentLength ?? 0, contentType: res.ContentType };
      } catch (err) {
        if (isNotFound(err)) return null;
        throw asStorageError(err);
      }
    },

    async list(prefix) {
      const out: ObjectInfo[] = [];
      let token: string | undefined;
      do {
        const res = await call(() =>
          client.send(new ListObjectsV2Command({ Bucket, Prefix: prefix, ContinuationToken: token })),
        );
        for (const o of res.Contents ?? []) out.push({ key: o.Key!, size: o.Size ?? 0 });
        token = res.IsTruncated ? res.NextContinuationToken : undefined;
      } while (token);
      return out;
    },

    async signedGetUrl(key, ttlSeconds, downloadName) {
      const command = new GetObjectCommand({
        Bucket,
        Key: key,
        ResponseContentDisposition: downloadName ? contentDisposition(downloadName) : undefined,
      });
      return getSignedUrl(client, command, { expiresIn: ttlSeconds });
    },

    remove: (key) => removeQuietly(key),

    async listIncompleteUploads(prefix = '') {
      const out: IncompleteUpload[] = [];
      let keyMarker: string | undefined;
      let uploadIdMarker: string | undefined;
      for (;;) {
        const res = await call(() =>
          client.send(
            new ListMultipartUploadsCommand({
              Bucket,
              Prefix: prefix || undefined,
              KeyMarker: keyMarker,
              UploadIdMarker: uploadIdMarker,
            }),
          ),
        );
        for (const u of res.Uploads ?? []) {
          if (u.Key && u.UploadId)
            out.push({ key: u.Key, uploadId: u.UploadId, initiated: u.Initiated ?? new Date(0) });
        }
        if (!res.IsTruncated) return out;
        keyMarker = res.NextKeyMarker;
        uploadIdMarker = res.NextUploadIdMarker;
      }
    },

    abortUpload: (key, uploadId) => abortQuietly(key, uploadId),

    async ensureBucket() {
      try {
        await client.send(new HeadBucketCommand({ Bucket }));
      } catch (err) {
        if (!isNotFound(err)) throw asStorageError(err);
        await call(() => client.send(new CreateBucketCommand({ Bucket })));
      }
    },

    close: () => client.destroy(),

    async probe(timeoutMs) {
      // The SDK may retry a refused connection; the deadline covers its retries too.
      await client.send(new HeadBucketCommand({ Bucket }), { abortSignal: AbortSignal.timeout(timeoutMs) });
    },
  };

  async function removeQuietly(key: string): Promise<void> {
    try {
      await client.send(new DeleteObjectCommand({ Bucket, Key: key }));
    } catch (err) {
      if (!isNotFound(err)) throw asStorageError(err);
    }
  }

  async function abortQuietly(key: string, uploadId: string): Promise<void> {
    try {
      await client.send(new AbortMultipartUploadCommand({ Bucket, Key: key, UploadId: uploadId }));
    } catch (err) {
      if (!isNotFound(err) && !(err instanceof S3ServiceException && err.name === 'NoSuchUpload'))
        throw asStorageError(err);
    }
  }
}

function isNotFound(err: unknown): boolean {
  if (!(err instanceof S3ServiceException)) return false;
  return (
    err.$metadata.httpStatusCode === 404 ||
    err.name === 'NotFound' ||
    err.name === 'NoSuchKey' ||
    err.name === 'NoSuchBucket'
  );
}

/** RFC 6266: an ASCII fallback for old clients plus the exact UTF-8 name. */
export function contentDisposition(fileName: string): string {
  const stripped = fileName
    .normalize('NFKD')
    .replace(/[^\x20-\x7e]/g, '')
    .replace(/["\\]/g, '')
    .trim();
  // A name with no Latin letters at all (a Japanese title, say) keeps at least its extension.
  const extension = /\.[A-Za-z0-9]{1,16}$/.exec(stripped)?.[0] ?? '';
  const ascii = /[A-Za-z0-9]/.test(stripped.slice(0, stripped.length - extension.length))
    ? stripped
    : `download${extension}`;
  const encoded = encodeURIComponent(fileName).replace(
    /['()*]/g,
    (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`,
  );
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}
