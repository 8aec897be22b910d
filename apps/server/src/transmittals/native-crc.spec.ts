import { randomBytes } from 'node:crypto';
import { crc32 } from 'node:zlib';
import { PassThrough, Readable } from 'node:stream';
import { ZipFile } from 'yazl';
import yauzl from 'yauzl';
import { jsCrc32, useNativeCrc32 } from './native-crc';

const readAll = (s: NodeJS.ReadableStream) =>
  new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = [];
    s.on('data', (c: Buffer) => chunks.push(c));
    s.on('end', () => resolve(Buffer.concat(chunks)));
    s.on('error', reject);
  });

const crcOfEntries = (zip: Buffer) =>
  new Promise<Map<string, number>>((resolve, reject) => {
    yauzl.fromBuffer(zip, { lazyEntries: true }, (err, z) => {
      if (err || !z) return reject(err ?? new Error('not a zip'));
      const out = new Map<string, number>();
      z.on('entry', (e: yauzl.Entry) => {
        out.set(e.fileName, e.crc32);
        z.readEntry();
      });
      z.on('end', () => resolve(out));
      z.readEntry();
    });
  });

describe('the native CRC-32 used for ZIP entries', () => {
  it('gives the same value as the JavaScript CRC-32, whole and fed in chunks with a seed', () => {
    expect(useNativeCrc32()).toBe(true);
    const js = jsCrc32();
    for (const size of [0, 1, 7, 1000, 65_537]) {
      const data = randomBytes(size);
      expect(crc32(data)).toBe(js(data));
      const cut = Math.floor(size / 3);
      expect(crc32(data.subarray(cut), crc32(data.subarray(0, cut)))).toBe(js(data));
    }
    // Check value of the CRC-32/ISO-HDLC catalogue entry for the ASCII text "123456789".
    expect(js(Buffer.from('123456789'))).toBe(0xcbf43926);
  });

  it('writes streamed entries whose recorded CRC matches their bytes', async () => {
    useNativeCrc32();
    const parts = [randomBytes(300_000), randomBytes(5), Buffer.alloc(0)];
    const zip = new ZipFile();
    parts.forEach((p, i) => {
      zip.addReadStreamLazy(`f${i}.bin`, { size: p.length, compress: false }, (cb) => {
        const s = new PassThrough();
        Readable.from([p.subarray(0, 1000), p.subarray(1000)]).pipe(s);
        cb(null, s);
      });
    });
    zip.end();
    const crcs = await crcOfEntries(await readAll(zip.outputStream));
    parts.forEach((p, i) => expect(crcs.get(`f${i}.bin`)).toBe(crc32(p)));
  });
});
