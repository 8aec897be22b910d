// The core entry: the package's main entry offers only 'import' conditions, which Jest's CommonJS
// resolver cannot follow; the core has everything a buffer check needs.
import { fileTypeFromBuffer } from 'file-type/core';

/**
 * What a deliverable may be. The claim is the file name's extension (the browser's declared
 * Content-Type is not trusted: it guesses from the extension too); the content must then prove it.
 * Zip-based kinds (zip, docx, xlsx) and the legacy xls container are checked again after upload,
 * by reading their directory from the object store (see archive-check.ts).
 */
export type DeliverableKind =
  'pdf' | 'dwg' | 'dxf' | 'ifc' | 'xlsx' | 'xls' | 'csv' | 'docx' | 'txt' | 'png' | 'jpg' | 'zip';

interface KindRule {
  contentType: string;
  extensions: string[];
  /** file-type results that prove the claim; empty for text formats that file-type cannot name. */
  sniffed: string[];
  /** A check of the first bytes for formats file-type does not know. */
  head?: (head: Buffer) => boolean;
  text?: boolean;
}

export const DELIVERABLE_KINDS: Record<DeliverableKind, KindRule> = {
  // Illustrator files are PDFs with extra data; file-type names them 'ai'.
  pdf: { contentType: 'application/pdf', extensions: ['pdf'], sniffed: ['pdf', 'ai'] },
  dwg: { contentType: 'image/vnd.dwg', extensions: ['dwg'], sniffed: ['dwg'] },
  dxf: { contentType: 'image/vnd.dxf', extensions: ['dxf'], sniffed: [], head: isDxf },
  ifc: { contentType: 'application/x-step', extensions: ['ifc'], sniffed: [], head: isStepFile, text: true },
  // file-type may name an Office file plain 'zip' when its marker part is not first; the
  // archive check then looks for the part that makes it a workbook or a document.
  xlsx: {
    contentType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
    extensions: ['xlsx'],
    sniffed: ['xlsx', 'zip'],
  },
  docx: {
    contentType: 'application/vnd.openxmlformats-officedocument.wordprocessingml.document',
    extensions: ['docx'],
    sniffed: ['docx', 'zip'],
  },
  // Legacy Excel lives in the same container as Windows installers (.msi): checked after upload.
  xls: { contentType: 'application/vnd.ms-excel', extensions: ['xls'], sniffed: ['cfb'] },
  csv: { contentType: 'text/csv', extensions: ['csv'], sniffed: [], text: true },
  txt: { contentType: 'text/plain', extensions: ['txt'], sniffed: [], text: true },
  png: { contentType: 'image/png', extensions: ['png'], sniffed: ['png'] },
  jpg: { contentType: 'image/jpeg', extensions: ['jpg', 'jpeg'], sniffed: ['jpg'] },
  zip: { contentType: 'application/zip', extensions: ['zip'], sniffed: ['zip'] },
};

export const ACCEPTED_EXTENSIONS: string[] = Object.values(DELIVERABLE_KINDS).flatMap((k) => k.extensions);

export function kindForExtension(ext: string): DeliverableKind | undefined {
  return (Object.keys(DELIVERABLE_KINDS) as DeliverableKind[]).find((k) =>
    DELIVERABLE_KINDS[k].extensions.includes(ext),
  );
}

/** How many leading bytes are held back and sniffed before anything is sent to storage. */
export const SNIFF_BYTES = 64 * 1024;

// file-type names for programs and installers: refused whatever the file claims to be.
const EXECUTABLE_TYPES = new Set([
  'exe',
  'elf',
  'macho',
  'class',
  'dex',
  'wasm',
  'apk',
  'jar',
  'msi',
  'deb',
  'rpm',
  'xpi',
  'crx',
  'lnk',
  'swf',
  'dmg',
  'pkg',
]);

/** Names the kind of program the bytes start with, or null when they do not start like one. */
export function executableSignature(head: Buffer): string | null {
  if (head.length >= 2 && head[0] === 0x4d && head[1] === 0x5a) return 'a Windows program (MZ/PE)';
  if (head.length >= 4 && head.readUInt32BE(0) === 0x7f454c46) return 'a Linux program (ELF)';
  if (head.length >= 4) {
    const m = head.readUInt32BE(0);
    if ([0xfeedface, 0xfeedfacf, 0xcefaedfe, 0xcffaedfe].includes(m)) return 'a macOS program (Mach-O)';
    // 0xCAFEBABE is both a Mach-O universal binary and a Java class file: a program either way.
    if (m === 0xcafebabe || m === 0xbebafeca) return 'a macOS or Java program';
    if (m === 0x0061736d) return 'a WebAssembly module';
  }
  if (head.length >= 4 && head.subarray(0, 4).toString('latin1') === 'dex\n') return 'an Android program (DEX)';
  const start = stripBom(head);
  if (start.length >= 2 && start[0] === 0x23 && start[1] === 0x21) return 'a script (#!)';
  return null;
}

export type SniffResult =
  | { ok: true; kind: DeliverableKind; contentType: string; detected: string }
  | { ok: false; reason: 'executable' | 'not_accepted' | 'mismatch'; message: string };

/** Checks the first bytes of a file against the kind its extension claims. */
export async function sniff(head: Buffer, claimedExt: string): Promise<SniffResult> {
  const program = executableSignature(head);
  if (program)
    return {
      ok: false,
      reason: 'executable',
      message: `The file is ${program}; programs and scripts are not accepted.`,
    };

  const kind = kindForExtension(claimedExt);
  if (!kind) {
    return {
      ok: false,
      reason: 'not_accepted',
      message: `Files ending in ${claimedExt ? `.${claimedExt}` : '(no extension)'} are not accepted. Accepted: ${ACCEPTED_EXTENSIONS.map((e) => `.${e}`).join(', ')}.`,
    };
  }
  const rule = DELIVERABLE_KINDS[kind];
  const detected = head.length > 0 ? await fileTypeFromBuffer(head).catch(() => undefined) : undefined;
  if (detected && EXECUTABLE_TYPES.has(detected.ext)) {
    return {
      ok: false,
      reason: 'executable',
      message: `The file is a program or installer (${detected.ext}); these are not accepted.`,
    };
  }
  const mismatch = (what: string): SniffResult => ({
    ok: false,
    reason: 'mismatch',
    message: `The file is named .${claimedExt} but its content is ${what}. Check that the right file was chosen.`,
  });

  if (rule.sniffed.length > 0) {
    if (!detected) return mismatch('not a recognisable ' + kind.toUpperCase() + ' file');
    if (!rule.sniffed.includes(detected.ext)) return mismatch(`a .${detected.ext} file`);
    return { ok: true, kind, contentType: rule.contentType, detected: detected.ext };
  }
  // Text-based kinds: file-type knows no text formats, so anything it names is something else.
  if (detected && !(kind === 'dxf' && detected.ext === 'dxf')) return mismatch(`a .${detected.ext} file`);
  if (rule.head && !rule.head(head)) return mismatch(`not a ${kind.toUpperCase()} file`);
  if (rule.text && !looksLikeText(head)) return mismatch('binary data, not text');
  return { ok: true, kind, contentType: rule.contentType, detected: kind };
}

function stripBom(b: Buffer): Buffer {
  return b.length >= 3 && b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf ? b.subarray(3) : b;
}

/** Text in UTF-8 or a single-byte code page: no NUL bytes and almost no other control bytes. */
export function looksLikeText(head: Buffer): boolean {
  const b = stripBom(head);
  let control = 0;
  for (const byte of b) {
    if (byte === 0) return false;
    if (byte < 0x20 && byte !== 0x09 && byte !== 0x0a && byte !== 0x0d && byte !== 0x0c) control++;
  }
  return control <= Math.max(2, b.length / 1000);
}

/** ISO 10303-21 (STEP physical file), the container of IFC models. */
function isStepFile(head: Buffer): boolean {
  return /^\s*ISO-10303-21;/.test(stripBom(head).subarray(0, 64).toString('latin1'));
}

/** ASCII DXF starts with group code 0 and SECTION (optionally after 999 comments); binary DXF has its own sentinel. */
function isDxf(head: Buffer): boolean {
  const start = stripBom(head).subarray(0, 512).toString('latin1');
  if (start.startsWith('AutoCAD Binary DXF\r\n\x1a\x00')) return true;
  return /^(\s*999\r?\n[^\n]*\n)*\s*0\r?\nSECTION\r?\n/.test(start) && looksLikeText(head);
}
