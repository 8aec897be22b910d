import { createRequire } from 'node:module';
import { crc32 as nativeCrc32 } from 'node:zlib';

interface JsCrc32 {
  unsigned: (buf: Buffer | string, previous?: number | Buffer) => number;
}

/**
 * yazl checks every streamed entry with buffer-crc32, a byte-at-a-time JavaScript loop that was
 * the ZIP download's bottleneck. yazl takes no CRC from outside for a stream, so the one function
 * it calls (`unsigned`, looked up on each chunk) is pointed at Node's native zlib.crc32 (Node
 * 20.15+), which gives the same unsigned value for the same bytes and seed; the spec beside this
 * file compares the two on random data. The module is resolved from yazl's own location so the
 * instance patched is the one yazl loaded. Returns false (and changes nothing) where Node lacks it.
 */
export function useNativeCrc32(): boolean {
  if (typeof nativeCrc32 !== 'function') return false;
  const lib = createRequire(require.resolve('yazl'))('buffer-crc32') as JsCrc32;
  if ((lib as { native?: boolean }).native) return true;
  const js = lib.unsigned;
  lib.unsigned = (buf, previous) =>
    Buffer.isBuffer(previous) ? js(buf, previous) : nativeCrc32(buf, previous === undefined ? 0 : previous >>> 0);
  (lib as { native?: boolean }).native = true;
  return true;
}

/** buffer-crc32's JavaScript loop as yazl would use it without the switch above (for the spec). */
export function jsCrc32(): (buf: Buffer, previous?: number) => number {
  const lib = createRequire(require.resolve('yazl'))('buffer-crc32') as ((b: Buffer) => Buffer) & {
    signed: (b: Buffer, p?: number) => number;
  };
  return (buf, previous) => lib.signed(buf, previous) >>> 0;
}
