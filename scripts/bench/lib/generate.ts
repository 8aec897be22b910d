import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';

const HEADER = Buffer.from('%PDF-1.7\n%\xe2\xe3\xcf\xd3\n', 'latin1');
const TRAILER = Buffer.from('\n%%EOF\n', 'latin1');
const CHUNK = 64 * 1024;

/**
 * A stream of exactly `bytes` bytes that starts like a PDF and is otherwise pseudo-random
 * (xorshift32 from `seed`), made 64 KiB at a time: nothing close to the whole file is ever in
 * memory. The same length and seed always give the same bytes, so a receiver's SHA-256 can be
 * checked against `generatedSha256`.
 */
export function pdfLikeStream(bytes: number, seed = 0x2f6b3a91): Readable {
  if (bytes < HEADER.length + TRAILER.length)
    throw new Error(`at least ${HEADER.length + TRAILER.length} bytes are needed`);
  let state = seed >>> 0 || 1;
  let sent = 0;
  return new Readable({
    highWaterMark: CHUNK,
    read() {
      if (sent >= bytes) return void this.push(null);
      const n = Math.min(CHUNK, bytes - sent);
      const chunk = Buffer.allocUnsafe(n);
      let i = 0;
      for (; i + 4 <= n; i += 4) {
        state ^= state << 13;
        state ^= state >>> 17;
        state ^= state << 5;
        chunk.writeUInt32LE(state >>> 0, i);
      }
      for (; i < n; i++) chunk[i] = i & 0xff;
      // Overlay the header and trailer where they fall in this chunk.
      if (sent < HEADER.length) HEADER.copy(chunk, 0, sent, Math.min(HEADER.length, sent + n));
      const trailerStart = bytes - TRAILER.length;
      if (sent + n > trailerStart) {
        const from = Math.max(trailerStart, sent);
        TRAILER.copy(chunk, from - sent, from - trailerStart);
      }
      sent += n;
      this.push(chunk);
    },
  });
}

/** The SHA-256 (hex) of what `pdfLikeStream(bytes, seed)` produces, computed by streaming it. */
export async function generatedSha256(bytes: number, seed?: number): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of pdfLikeStream(bytes, seed)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}
