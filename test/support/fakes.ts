import { crc32, deflateRawSync } from 'node:zlib';
import { createObjectStore, type ObjectStore } from '../../apps/server/src/storage';
import { startFakeS3, FAKE_S3_CREDENTIALS, type FakeS3 } from '../../scripts/fakes/s3';

export { startFakeS3 } from '../../scripts/fakes/s3';
export { startFakeSmtp } from '../../scripts/fakes/smtp';
export { startFakeStripe, TEST_CARDS } from '../../scripts/fakes/stripe';

/** The S3 fake in this process (port 0, temporary folder) and a store pointed at it. */
export async function fakeObjectStore(): Promise<{ s3: FakeS3; store: ObjectStore; close: () => Promise<void> }> {
  const s3 = await startFakeS3();
  const store = createObjectStore({
    endpoint: s3.endpoint,
    region: 'us-east-1',
    bucket: s3.bucket,
    credentials: { ...FAKE_S3_CREDENTIALS },
    forcePathStyle: true,
  });
  return {
    s3,
    store,
    close: async () => {
      store.close();
      await s3.stop();
    },
  };
}

// ---- Test files, built here so each test shows exactly what it sends. ----

/** A small but well-formed one-page PDF. */
export function tinyPdf(text = 'Stage 2 column schedule'): Buffer {
  const objects = [
    '<< /Type /Catalog /Pages 2 0 R >>',
    '<< /Type /Pages /Kids [3 0 R] /Count 1 >>',
    '<< /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] /Contents 4 0 R >>',
  ];
  const stream = `BT /F1 12 Tf 72 770 Td (${text}) Tj ET`;
  objects.push(`<< /Length ${stream.length} >>\nstream\n${stream}\nendstream`);
  let body = '%PDF-1.7\n';
  const offsets: number[] = [];
  objects.forEach((o, i) => {
    offsets.push(body.length);
    body += `${i + 1} 0 obj\n${o}\nendobj\n`;
  });
  const xref = body.length;
  body += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n${offsets.map((o) => `${String(o).padStart(10, '0')} 00000 n \n`).join('')}`;
  body += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return Buffer.from(body, 'latin1');
}

/** The start of a Windows program: the MZ header pointing at a PE signature. */
export function windowsProgram(): Buffer {
  const b = Buffer.alloc(1024);
  b.write('MZ', 0, 'latin1');
  b.writeUInt32LE(0x80, 0x3c);
  b.write('PE\0\0', 0x80, 'latin1');
  b.writeUInt16LE(0x14c, 0x84); // i386
  return b;
}

/** A zip archive (deflated entries) built by hand: names and contents exactly as given. */
export function zipOf(entries: Array<{ name: string; data: Buffer | string }>): Buffer {
  const locals: Buffer[] = [];
  const centrals: Buffer[] = [];
  let offset = 0;
  for (const e of entries) {
    const data = Buffer.isBuffer(e.data) ? e.data : Buffer.from(e.data);
    const packed = deflateRawSync(data);
    const name = Buffer.from(e.name, 'utf8');
    const crc = crc32(data);
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt16LE(0x0800, 6); // UTF-8 names
    local.writeUInt16LE(8, 8); // deflate
    local.writeUInt32LE(crc, 14);
    local.writeUInt32LE(packed.length, 18);
    local.writeUInt32LE(data.length, 22);
    local.writeUInt16LE(name.length, 26);
    const central = Buffer.alloc(46);
    central.writeUInt32LE(0x02014b50, 0);
    central.writeUInt16LE(20, 4);
    central.writeUInt16LE(20, 6);
    central.writeUInt16LE(0x0800, 8);
    central.writeUInt16LE(8, 10);
    central.writeUInt32LE(crc, 16);
    central.writeUInt32LE(packed.length, 20);
    central.writeUInt32LE(data.length, 24);
    central.writeUInt16LE(name.length, 28);
    central.writeUInt32LE(offset, 42);
    locals.push(local, name, packed);
    centrals.push(central, name);
    offset += local.length + name.length + packed.length;
  }
  const cd = Buffer.concat(centrals);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(entries.length, 8);
  end.writeUInt16LE(entries.length, 10);
  end.writeUInt32LE(cd.length, 12);
  end.writeUInt32LE(offset, 16);
  return Buffer.concat([...locals, cd, end]);
}
