import { Readable } from 'node:stream';
import yauzl, { type Entry } from 'yauzl';
import { HttpError } from '../core/errors';
import type { ObjectStore } from '../storage';
import { executableSignature, type DeliverableKind } from './content-rules';
import { extensionOf } from './file-name';
import { rejection } from './rejections';

// Names inside an archive that make it a carrier for programs, scripts or installers.
const PROGRAM_EXTENSIONS = new Set([
  'exe',
  'dll',
  'com',
  'scr',
  'pif',
  'cpl',
  'msi',
  'msp',
  'msix',
  'appx',
  'sys',
  'drv',
  'ocx',
  'bat',
  'cmd',
  'ps1',
  'psm1',
  'vbs',
  'vbe',
  'js',
  'jse',
  'wsf',
  'wsh',
  'hta',
  'reg',
  'inf',
  'lnk',
  'application',
  'gadget',
  'jar',
  'class',
  'apk',
  'dex',
  'elf',
  'so',
  'dylib',
  'run',
  'sh',
  'bash',
  'zsh',
  'csh',
  'command',
  'app',
  'dmg',
  'pkg',
  'deb',
  'rpm',
  'py',
  'pl',
  'rb',
  'php',
]);
// Archives inside archives are not opened; refusing them keeps a program from hiding a level down.
const ARCHIVE_EXTENSIONS = new Set([
  'zip',
  '7z',
  'rar',
  'tar',
  'gz',
  'tgz',
  'bz2',
  'xz',
  'cab',
  'iso',
  'zipx',
  'arj',
  'lz',
  'lzh',
]);
const MACRO_PARTS = /(^|\/)vbaProject\.bin$/i;

/** Upper bounds that keep the check quick and its memory small whatever the archive claims. */
export const ARCHIVE_LIMITS = { maxEntries: 20_000, maxSniffedEntries: 2_000 };

/**
 * After a zip-based or legacy-Office upload is stored, reads its directory from the object store
 * with ranged reads (never the whole file) and refuses programs, nested archives, encrypted
 * entries and macros. Throws an HttpError; returns when the file may stay.
 */
export async function checkStoredContainer(
  store: ObjectStore,
  key: string,
  size: number,
  kind: DeliverableKind,
): Promise<void> {
  if (kind === 'zip' || kind === 'docx' || kind === 'xlsx') return checkZip(store, key, size, kind);
  if (kind === 'xls') return checkLegacyWorkbook(store, key, size);
}

async function checkZip(store: ObjectStore, key: string, size: number, kind: 'zip' | 'docx' | 'xlsx'): Promise<void> {
  const reader = new StoreRangeReader(store, key, size);
  let zip: yauzl.ZipFile;
  try {
    zip = await yauzl.fromRandomAccessReaderPromise(reader, size, {
      lazyEntries: true,
      autoClose: false,
      strictFileNames: false,
    });
  } catch (err) {
    throw rejection('unreadable', `The archive could not be read (${(err as Error).message}).`);
  }
  const marker = kind === 'xlsx' ? 'xl/workbook.xml' : kind === 'docx' ? 'word/document.xml' : null;
  let sawMarker = false;
  let count = 0;
  try {
    if (zip.entryCount > ARCHIVE_LIMITS.maxEntries) {
      throw rejection(
        'not_accepted',
        `The archive holds ${zip.entryCount} files; at most ${ARCHIVE_LIMITS.maxEntries} can be checked.`,
      );
    }
    for await (const entry of iterate(zip)) {
      count++;
      const name = entry.fileName;
      if (name.endsWith('/')) continue;
      if (marker && name === marker) sawMarker = true;
      if (entry.isEncrypted())
        throw rejection('not_accepted', `"${name}" in the archive is encrypted, so it cannot be checked.`);
      if (MACRO_PARTS.test(name))
        throw rejection('not_accepted', 'Documents with macros are not accepted; save it without macros.');
      const segments = name.split('/');
      for (const segment of segments) {
        const ext = extensionOf(segment);
        if (PROGRAM_EXTENSIONS.has(ext))
          throw rejection('executable', `The archive holds a program or script ("${name}"); these are not accepted.`);
      }
      if (kind === 'zip' && ARCHIVE_EXTENSIONS.has(extensionOf(name))) {
        throw rejection('not_accepted', `The archive holds another archive ("${name}"); put the files in one archive.`);
      }
      // A program renamed to look harmless still starts like a program.
      if (count <= ARCHIVE_LIMITS.maxSniffedEntries && entry.uncompressedSize > 0 && entry.canDecodeFileData()) {
        const first = await firstBytes(zip, entry, 64);
        const program = executableSignature(first);
        if (program)
          throw rejection('executable', `"${name}" in the archive is ${program}; programs are not accepted.`);
      }
    }
    if (marker && !sawMarker) {
      throw rejection(
        'mismatch',
        `The file is named .${kind} but it is a plain zip archive without a ${kind === 'xlsx' ? 'workbook' : 'document'} inside.`,
      );
    }
  } catch (err) {
    if (err instanceof HttpError) throw err;
    throw rejection('unreadable', `The archive could not be read (${(err as Error).message}).`);
  } finally {
    zip.close();
  }
}

async function* iterate(zip: yauzl.ZipFile): AsyncGenerator<Entry> {
  const pending: Array<{ resolve: (e: Entry | null) => void; reject: (err: Error) => void }> = [];
  zip.on('entry', (e: Entry) => pending.shift()?.resolve(e));
  zip.on('end', () => pending.shift()?.resolve(null));
  zip.on('error', (err: Error) => pending.shift()?.reject(err));
  for (;;) {
    const next = new Promise<Entry | null>((resolve, reject) => pending.push({ resolve, reject }));
    zip.readEntry();
    const entry = await next;
    if (!entry) return;
    yield entry;
  }
}

async function firstBytes(zip: yauzl.ZipFile, entry: Entry, n: number): Promise<Buffer> {
  const stream = await zip.openReadStreamPromise(entry);
  const chunks: Buffer[] = [];
  let length = 0;
  try {
    for await (const chunk of stream as AsyncIterable<Buffer>) {
      chunks.push(chunk);
      length += chunk.length;
      if (length >= n) break;
    }
  } finally {
    stream.destroy();
  }
  return Buffer.concat(chunks).subarray(0, n);
}

/** yauzl's random access served from the object store in 64 KiB blocks, at most 16 kept (1 MiB). */
class StoreRangeReader extends yauzl.RandomAccessReader {
  private static readonly BLOCK = 64 * 1024;
  private static readonly KEEP = 16;
  private readonly blocks = new Map<number, Promise<Buffer>>();

  constructor(
    private readonly store: ObjectStore,
    private readonly key: string,
    private readonly size: number,
  ) {
    super();
  }

  override _readStreamForRange(start: number, end: number): Readable {
    return Readable.from(this.bytesIn(start, end), { objectMode: false });
  }

  private async *bytesIn(start: number, end: number): AsyncGenerator<Buffer> {
    const B = StoreRangeReader.BLOCK;
    for (let block = Math.floor(start / B); block * B < end; block++) {
      const data = await this.block(block);
      const from = Math.max(start - block * B, 0);
      const to = Math.min(end - block * B, data.length);
      if (to > from) yield data.subarray(from, to);
    }
  }

  private block(index: number): Promise<Buffer> {
    let p = this.blocks.get(index);
    if (p) {
      this.blocks.delete(index); // move to the back: most recently used
      this.blocks.set(index, p);
      return p;
    }
    const B = StoreRangeReader.BLOCK;
    p = this.store.readRange(this.key, index * B, Math.min((index + 1) * B, this.size));
    p.catch(() => this.blocks.delete(index));
    this.blocks.set(index, p);
    while (this.blocks.size > StoreRangeReader.KEEP) this.blocks.delete(this.blocks.keys().next().value!);
    return p;
  }
}

// Compound File Binary (the container of .xls, .doc and .msi).
const MSI_CLSID = Buffer.from('84100c0000000000c000000000000046', 'hex');

/** A legacy .xls must hold a "Workbook" (or "Book") stream and must not be an installer or carry macros. */
async function checkLegacyWorkbook(store: ObjectStore, key: string, size: number): Promise<void> {
  const header = await store.readRange(key, 0, Math.min(512, size));
  if (header.length < 512) throw rejection('unreadable', 'The workbook is damaged (too short).');
  const sectorSize = 1 << header.readUInt16LE(0x1e);
  if (sectorSize !== 512 && sectorSize !== 4096)
    throw rejection('unreadable', 'The workbook is damaged (bad sector size).');
  const dirStart = (header.readUInt32LE(0x30) + 1) * sectorSize;
  if (dirStart + 128 > size) throw rejection('unreadable', 'The workbook is damaged (directory outside the file).');
  const dir = await store.readRange(key, dirStart, Math.min(dirStart + sectorSize, size));
  if (dir.subarray(0x50, 0x60).equals(MSI_CLSID))
    throw rejection('executable', 'The file is a Windows installer, not a workbook.');
  const names: string[] = [];
  for (let at = 0; at + 128 <= dir.length; at += 128) {
    const nameBytes = Math.min(dir.readUInt16LE(at + 0x40), 64);
    if (nameBytes >= 2) names.push(dir.subarray(at, at + nameBytes - 2).toString('utf16le'));
  }
  if (names.some((n) => n === '_VBA_PROJECT_CUR' || n === 'VBA'))
    throw rejection('not_accepted', 'Workbooks with macros are not accepted; save it without macros.');
  if (!names.some((n) => n === 'Workbook' || n === 'Book')) {
    throw rejection('mismatch', 'The file is named .xls but it is not an Excel workbook.');
  }
}
