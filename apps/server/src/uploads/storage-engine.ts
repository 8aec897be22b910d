import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import type { Request } from 'express';
import type { StorageEngine } from 'multer';
import type { ObjectStore } from '../storage';
import { checkStoredContainer } from './archive-check';
import { sniff, SNIFF_BYTES, type DeliverableKind } from './content-rules';
import { extensionOf, safeFileName } from './file-name';
import { rejection } from './rejections';

/** What the engine adds to multer's file object once the file is stored and checked. */
export interface StoredUpload {
  key: string;
  sha256: string;
  size: number;
  /** Our own name for the kind of file, proven by its content. */
  detectedType: DeliverableKind;
  /** The Content-Type stored with the object (from the proven kind, not from the browser). */
  contentType: string;
  originalName: string;
  safeName: string;
}

export interface DeliverableStorageOptions {
  store: ObjectStore;
  maxBytes: number;
  /**
   * The object key for a file, called once its content is accepted. Built from ids only: the
   * person's file name never reaches storage (it lives in the database and in Content-Disposition).
   */
  keyFor: (req: Request, file: { kind: DeliverableKind }) => string | Promise<string>;
}

type MulterFile = Express.Multer.File;

/**
 * A multer storage engine that streams each file straight into the object store. Only the first
 * 64 KiB are held (to sniff the content before anything is sent); the rest flows through with
 * lib-storage's bounded part buffers. On any refusal or a dropped connection the upload is
 * aborted and any object removed.
 */
export function deliverableStorage(opts: DeliverableStorageOptions): StorageEngine {
  return {
    _handleFile(req, file, cb) {
      storeFile(req, file, opts).then(
        (info) => cb(null, info as Partial<MulterFile>),
        (err: Error) => cb(err),
      );
    },
    _removeFile(_req, file, cb) {
      const key = (file as Partial<StoredUpload>).key;
      if (!key) return cb(null);
      opts.store.remove(key).then(
        () => cb(null),
        (err: Error) => cb(err),
      );
    },
  };
}

async function storeFile(req: Request, file: MulterFile, opts: DeliverableStorageOptions): Promise<StoredUpload> {
  const source = file.stream;
  const iterator = (source as AsyncIterable<Buffer>)[Symbol.asyncIterator]();
  const tooLarge = () => rejection('too_large', `The file is larger than the limit of ${formatBytes(opts.maxBytes)}.`);

  // 1. Hold back the head, and check it before a single byte goes to storage.
  const headChunks: Buffer[] = [];
  let headLength = 0;
  let ended = false;
  while (headLength < SNIFF_BYTES) {
    const next = await iterator.next();
    if (next.done) {
      ended = true;
      break;
    }
    headChunks.push(next.value);
    headLength += next.value.length;
    if (headLength > opts.maxBytes) {
      await iterator.return?.();
      throw tooLarge();
    }
  }
  const head = Buffer.concat(headChunks);
  const originalName = file.originalname;
  const safeName = safeFileName(originalName);
  const verdict = await sniff(head, extensionOf(safeName));
  if (!verdict.ok) {
    await iterator.return?.();
    throw rejection(verdict.reason, verdict.message);
  }
  const key = await opts.keyFor(req, { kind: verdict.kind });

  // 2. Stream the head and the rest into storage, hashing and counting on the way.
  const hash = createHash('sha256');
  let size = 0;
  let failure: Error | undefined;
  const body = Readable.from(
    (async function* () {
      hash.update(head);
      size = head.length;
      yield head;
      if (ended) return;
      for (;;) {
        const next = await iterator.next();
        if (next.done) return;
        size += next.value.length;
        if (size > opts.maxBytes) {
          failure = tooLarge();
          await iterator.return?.();
          throw failure;
        }
        hash.update(next.value);
        yield next.value;
      }
    })(),
    { objectMode: false, highWaterMark: 64 * 1024 },
  );
  // The client hanging up (busboy errors the file stream) or multer giving up ends the upload.
  const controller = new AbortController();
  const onAbort = () => controller.abort();
  source.once('error', onAbort);
  req.once('close', () => {
    if (!req.complete) onAbort();
  });

  try {
    await opts.store.putStream(key, body, { contentType: verdict.contentType, signal: controller.signal });
  } catch (err) {
    await opts.store.remove(key).catch(() => undefined);
    if (failure) throw failure;
    throw err;
  } finally {
    source.off('error', onAbort);
  }
  if (controller.signal.aborted) {
    await opts.store.remove(key).catch(() => undefined);
    throw new Error('The upload was interrupted.');
  }

  // 3. Archives and Office containers: look inside, by ranged reads of the stored object.
  try {
    await checkStoredContainer(opts.store, key, size, verdict.kind);
  } catch (err) {
    await opts.store.remove(key).catch(() => undefined);
    throw err;
  }

  return {
    key,
    sha256: hash.digest('hex'),
    size,
    detectedType: verdict.kind,
    contentType: verdict.contentType,
    originalName,
    safeName,
  };
}

export function formatBytes(n: number): string {
  const units = ['bytes', 'KiB', 'MiB', 'GiB', 'TiB'];
  let i = 0;
  let v = n;
  while (v >= 1024 && i < units.length - 1) {
    v /= 1024;
    i++;
  }
  return i === 0 ? `${n} bytes` : `${Number.isInteger(v) ? v : v.toFixed(1)} ${units[i]}`;
}
