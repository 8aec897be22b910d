import path from 'node:path';

// Names Windows refuses for a file, with or without an extension (CON.pdf is as bad as CON).
const RESERVED = /^(con|prn|aux|nul|com[0-9¹²³]|lpt[0-9¹²³]|conin\$|conout\$)$/i;
/** Most file systems allow 255 bytes per name; leave room for a browser's " (1)" on a second save. */
const MAX_BYTES = 180;

/**
 * A name that is safe to store, show and offer as a download, kept readable: no folders, no
 * control or bidirectional-override characters, no characters Windows forbids, no reserved
 * device names, no leading dots, at most 180 bytes in UTF-8 (not characters: 90 CJK characters are
 * already 270 bytes) with the extension kept, cut between whole characters.
 */
export function safeFileName(original: string, fallback = 'file'): string {
  // Browsers send a bare name, but some old clients send a whole path with either separator.
  let name = original.normalize('NFC').split(/[\\/]/).pop() ?? '';
  name = name
    // C0/C1 controls and Unicode format characters (bidi overrides can fake an extension).
    // eslint-disable-next-line no-control-regex -- removing control characters is the point
    .replace(/[\u0000-\u001f\u007f-\u009f\u061c\u200b-\u200f\u202a-\u202e\u2066-\u2069\ufeff]/g, '')
    .replace(/[<>:"|?*]/g, '_')
    .replace(/\s+/g, ' ')
    .trim()
    .replace(/^[.\s]+/, '') // no hidden files, no "..": a leading dot is dropped
    .replace(/[.\s]+$/, ''); // Windows drops trailing dots and spaces itself
  const ext = path.extname(name);
  let stem = ext ? name.slice(0, -ext.length) : name;
  if (RESERVED.test(stem.split('.')[0])) stem = `_${stem}`;
  if (!stem) stem = fallback;
  const cleanExt = ext.length <= 16 ? ext.toLowerCase() : '';
  stem = cutToBytes(stem, MAX_BYTES - utf8Bytes(cleanExt)).trimEnd() || fallback;
  return `${stem}${cleanExt}`;
}

export const utf8Bytes = (s: string): number => Buffer.byteLength(s, 'utf8');

const graphemes = new Intl.Segmenter(undefined, { granularity: 'grapheme' });

/** The longest start of `text` that fits in `max` UTF-8 bytes, never splitting a character. */
function cutToBytes(text: string, max: number): string {
  if (utf8Bytes(text) <= max) return text;
  let out = '';
  let used = 0;
  for (const { segment } of graphemes.segment(text)) {
    const size = utf8Bytes(segment);
    if (used + size > max) break;
    out += segment;
    used += size;
  }
  return out;
}

/** The lower-case extension without the dot ('' when there is none). */
export function extensionOf(fileName: string): string {
  return path.extname(fileName).slice(1).toLowerCase();
}
