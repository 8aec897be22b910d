import type { Readable } from 'node:stream';
import { ZipFile } from 'yazl';
import type { ObjectStore } from '../storage';

export interface ZipEntry {
  /** The path inside the archive (made from the register's own fields, cleaned). */
  name: string;
  key: string;
  size: number;
}

/** A name part safe inside a ZIP: no folders, no control characters, nothing empty. */
export function zipPart(value: string): string {
  const cleaned = [...value]
    .map((ch) => (ch.charCodeAt(0) < 0x20 || ch.charCodeAt(0) === 0x7f || '/\\:*?"<>|'.includes(ch) ? '_' : ch))
    .join('')
    .replace(/^\.+/, '_')
    .trim();
  return cleaned.slice(0, 120) || '_';
}

/**
 * A ZIP of stored objects, streamed: yazl asks for each object only when the previous one is
 * written, so one S3 response is open at a time and nothing is held whole in memory or on disk.
 * Entries are stored (not compressed; PDFs barely shrink), so the total size is known up front.
 */
export function streamZip(
  store: ObjectStore,
  entries: ZipEntry[],
  extra: Array<{ name: string; data: Buffer }>,
  mtime: Date,
): { stream: NodeJS.ReadableStream; size: Promise<number>; abort: () => void } {
  const zip = new ZipFile();
  let current: Readable | undefined;
  let aborted = false;
  for (const x of extra) zip.addBuffer(x.data, x.name, { compress: false, mtime });
  for (const e of entries) {
    zip.addReadStreamLazy(e.name, { size: e.size, compress: false, mtime }, (cb) => {
      if (aborted) return cb(new Error('download abandoned'), undefined as unknown as Readable);
      store.getStream(e.key).then(
        (o) => {
          current = o.body;
          cb(null, o.body);
        },
        (err) => cb(err, undefined as unknown as Readable),
      );
    });
  }
  const size = new Promise<number>((resolve) => {
    (zip.end as (o: object, cb: (n: number) => void) => void)({}, (n) => resolve(n));
  });
  return {
    stream: zip.outputStream,
    size,
    abort: () => {
      aborted = true;
      current?.destroy();
    },
  };
}
