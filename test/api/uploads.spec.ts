import { createHash, randomUUID } from 'node:crypto';
import { request as httpRequest } from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type Express } from 'express';
import request from 'supertest';
import { createLogger } from '../../apps/server/src/core/logger';
import { errorHandler } from '../../apps/server/src/core/errors';
import type { ObjectStore } from '../../apps/server/src/storage';
import { deliverableUpload, safeFileName, uploadedFile } from '../../apps/server/src/uploads';
import type { FakeS3 } from '../../scripts/fakes/s3';
import { fakeObjectStore, tinyPdf, windowsProgram, zipOf } from '../support/fakes';

const LIMIT = 3 * 1024 * 1024;

/** The upload middleware on a bare route, as the deliverables route will use it. */
function uploadApp(store: ObjectStore): Express {
  const app = express();
  app.post(
    '/deliverables',
    deliverableUpload({ store, maxBytes: LIMIT, keyFor: () => `deliverables/${randomUUID()}` }),
    (req, res) => {
      res.status(201).json({ file: uploadedFile(req), note: req.body.note ?? null });
    },
  );
  app.use(errorHandler(createLogger('silent')));
  return app;
}

describe('deliverable uploads stream into object storage and are checked on the way', () => {
  let store: ObjectStore;
  let s3: FakeS3;
  let close: () => Promise<void>;
  let app: Express;

  beforeAll(async () => {
    ({ store, s3, close } = await fakeObjectStore());
    app = uploadApp(store);
  });
  afterAll(() => close());

  const stored = () => store.list('deliverables/');
  const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex');

  it('a real PDF is stored with its SHA-256, size, kind and a clean name', async () => {
    const pdf = tinyPdf();
    const res = await request(app)
      .post('/deliverables')
      .field('note', 'for checking')
      .attach('file', pdf, { filename: 'Column schedule.pdf', contentType: 'application/pdf' });
    expect(res.status).toBe(201);
    expect(res.body.note).toBe('for checking');
    expect(res.body.file).toMatchObject({
      sha256: sha(pdf),
      size: pdf.length,
      detectedType: 'pdf',
      contentType: 'application/pdf',
      originalName: 'Column schedule.pdf',
      safeName: 'Column schedule.pdf',
    });
    const got = await store.getStream(res.body.file.key);
    expect(got.contentType).toBe('application/pdf');
    const chunks: Buffer[] = [];
    for await (const c of got.body) chunks.push(c as Buffer);
    expect(sha(Buffer.concat(chunks))).toBe(sha(pdf));
    await store.remove(res.body.file.key);
  });

  it('a file over the limit is refused with 413 and leaves no object behind', async () => {
    const big = Buffer.concat([tinyPdf(), Buffer.alloc(LIMIT, 0x20)]);
    const res = await request(app).post('/deliverables').attach('file', big, { filename: 'big.pdf' });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
    expect(res.body.error.message).toContain('3 MiB');
    expect(await stored()).toEqual([]);
  });

  it('a Windows program renamed to .pdf is refused with 415 before anything is stored', async () => {
    const res = await request(app)
      .post('/deliverables')
      .attach('file', windowsProgram(), { filename: 'drawings.pdf', contentType: 'application/pdf' });
    expect(res.status).toBe(415);
    expect(res.body.error).toMatchObject({ code: 'unsupported_media_type' });
    expect(res.body.error.message).toMatch(/Windows program/);
    expect(await stored()).toEqual([]);
  });

  it('a shell script named .txt is refused as a script', async () => {
    const res = await request(app)
      .post('/deliverables')
      .attach('file', Buffer.from('#!/bin/sh\necho hi\n'), { filename: 'notes.txt' });
    expect(res.status).toBe(415);
    expect(res.body.error.message).toMatch(/script/);
  });

  it('a PNG named .pdf is refused with 422: the content is not what the name says', async () => {
    const png = Buffer.from(
      '89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000a49444154789c63000100000500010d0a2db40000000049454e44ae426082',
      'hex',
    );
    const res = await request(app).post('/deliverables').attach('file', png, { filename: 'report.pdf' });
    expect(res.status).toBe(422);
    expect(res.body.error).toMatchObject({
      code: 'validation_failed',
      fields: { file: [expect.stringContaining('.png')] },
    });
    expect(await stored()).toEqual([]);
  });

  it('a kind we do not take (.html) is refused with 415 naming what is accepted', async () => {
    const res = await request(app)
      .post('/deliverables')
      .attach('file', Buffer.from('<html></html>'), { filename: 'page.html' });
    expect(res.status).toBe(415);
    expect(res.body.error.message).toContain('.pdf');
  });

  it('a zip holding an .exe is refused and removed from storage after its directory is read', async () => {
    const zip = zipOf([
      { name: 'calcs/summary.txt', data: 'Beam B3 span 6.2 m\n' },
      { name: 'tools/setup.exe', data: windowsProgram() },
    ]);
    const res = await request(app).post('/deliverables').attach('file', zip, { filename: 'stage-2.zip' });
    expect(res.status).toBe(415);
    expect(res.body.error.message).toContain('tools/setup.exe');
    expect(await stored()).toEqual([]);
  });

  it('a zip holding a program under a harmless name is refused by its first bytes', async () => {
    const zip = zipOf([{ name: 'readme.txt', data: windowsProgram() }]);
    const res = await request(app).post('/deliverables').attach('file', zip, { filename: 'package.zip' });
    expect(res.status).toBe(415);
    expect(res.body.error.message).toMatch(/readme\.txt.*Windows program/);
    expect(await stored()).toEqual([]);
  });

  it('a zip of drawings and calculations is accepted', async () => {
    const zip = zipOf([
      { name: 'GA-101.pdf', data: tinyPdf() },
      { name: 'loads.csv', data: 'column,kN\nC1,812\n' },
    ]);
    const res = await request(app).post('/deliverables').attach('file', zip, { filename: 'issue-3.zip' });
    expect(res.status).toBe(201);
    expect(res.body.file).toMatchObject({ detectedType: 'zip', size: zip.length, sha256: sha(zip) });
    await store.remove(res.body.file.key);
  });

  it('a plain zip renamed to .xlsx is refused, and a workbook with macros too', async () => {
    const notWorkbook = zipOf([
      { name: '[Content_Types].xml', data: '<Types/>' },
      { name: 'data.txt', data: 'x' },
    ]);
    const a = await request(app).post('/deliverables').attach('file', notWorkbook, { filename: 'fees.xlsx' });
    expect(a.status).toBe(422);
    const macro = zipOf([
      { name: '[Content_Types].xml', data: '<Types/>' },
      { name: 'xl/workbook.xml', data: '<workbook/>' },
      { name: 'xl/vbaProject.bin', data: 'macro' },
    ]);
    const b = await request(app).post('/deliverables').attach('file', macro, { filename: 'fees.xlsx' });
    expect(b.status).toBe(415);
    expect(b.body.error.message).toMatch(/macros/);
    expect(await stored()).toEqual([]);
  });

  it('hostile file names are cleaned: no folders, no control characters, no device names', async () => {
    const res = await request(app)
      .post('/deliverables')
      .attach('file', tinyPdf(), { filename: '../../etc/passwd.pdf' });
    expect(res.status).toBe(201);
    expect(res.body.file.safeName).toBe('passwd.pdf');
    expect(res.body.file.key).toMatch(/^deliverables\/[0-9a-f-]{36}$/);
    await store.remove(res.body.file.key);

    expect(safeFileName('../../etc/passwd')).toBe('passwd');
    expect(safeFileName('..\\..\\Windows\\win.ini')).toBe('win.ini');
    expect(safeFileName('CON.pdf')).toBe('_CON.pdf');
    expect(safeFileName('lpt1')).toBe('_lpt1');
    expect(safeFileName('beam\u0000 sched\u0007ule\r\n.pdf')).toBe('beam schedule.pdf');
    // A right-to-left override could make "invoice‮fdp.exe" read as "invoiceexe.pdf".
    expect(safeFileName('invoice\u202efdp.exe')).toBe('invoicefdp.exe');
    expect(safeFileName('..')).toBe('file');
    expect(safeFileName('.env')).toBe('env');
    expect(safeFileName('a:b*c?.dwg')).toBe('a_b_c_.dwg');
    expect(safeFileName(`${'x'.repeat(400)}.pdf`)).toHaveLength(180);
    expect(safeFileName('Plan — Geschoss 2 (rev B).pdf')).toBe('Plan — Geschoss 2 (rev B).pdf');
  });

  it('long names are capped by UTF-8 bytes, not characters, without splitting a character', () => {
    // 90 CJK characters are 270 bytes: under a 180-character cap, yet over the 255 bytes a file system takes.
    const cjk = safeFileName(`${'梁柱配筋'.repeat(23)}.pdf`);
    expect(Buffer.byteLength(cjk, 'utf8')).toBeLessThanOrEqual(180);
    expect(cjk).toBe(`${'梁柱配筋'.repeat(14)}梁柱.pdf`); // 58 × 3 bytes + ".pdf"
    // A letter with a combining mark that has no precomposed form (q + U+0307, 3 bytes) stays whole.
    expect(safeFileName(`${'q\u0307'.repeat(100)}.dwg`)).toBe(`${'q\u0307'.repeat(58)}.dwg`);
    // Four-byte characters (an emoji) are never cut in half.
    const emoji = safeFileName(`${'🏗'.repeat(60)}.pdf`);
    expect(emoji).toBe(`${'🏗'.repeat(44)}.pdf`);
  });

  it('a request without a file is refused with 400', async () => {
    const res = await request(app).post('/deliverables').field('note', 'no file');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_request');
  });

  it('when the client hangs up 40 MiB into a 100 MiB upload, the multipart upload is aborted and no part is left', async () => {
    // A larger limit, so several 8 MiB parts are stored when the line drops.
    const keys: string[] = [];
    const errors: unknown[] = [];
    const big = express();
    big.post(
      '/deliverables',
      deliverableUpload({
        store,
        maxBytes: 128 * 1024 * 1024,
        keyFor: () => {
          const key = `deliverables/${randomUUID()}`;
          keys.push(key);
          return key;
        },
      }),
      (_req, res) => void res.status(201).end(),
    );
    big.use((err: unknown, _req: express.Request, res: express.Response, _next: express.NextFunction) => {
      errors.push(err);
      res.status(500).end();
    });
    const server = big.listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    const port = (server.address() as AddressInfo).port;
    const boundary = 'trabeate-test-boundary';
    const req = httpRequest({
      host: '127.0.0.1',
      port,
      method: 'POST',
      path: '/deliverables',
      headers: {
        'content-type': `multipart/form-data; boundary=${boundary}`,
        'content-length': String(100 * 1024 * 1024),
      },
    });
    req.on('error', () => undefined);
    req.write(
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="half.pdf"\r\nContent-Type: application/pdf\r\n\r\n`,
    );
    req.write(tinyPdf());
    for (let i = 0; i < 40; i++) await new Promise((r) => req.write(Buffer.alloc(1024 * 1024, 0x41), r));
    await new Promise((r) => setTimeout(r, 500));
    // Parts are in storage at this point: the check below can see them.
    expect((await s3.pendingUploads()).some((u) => u.parts > 0)).toBe(true);
    req.destroy();
    for (let i = 0; i < 50 && errors.length === 0; i++) await new Promise((r) => setTimeout(r, 100));
    expect(keys).toHaveLength(1);
    expect(errors).toHaveLength(1);
    expect(await store.head(keys[0])).toBeNull();
    expect(await stored()).toEqual([]);
    // Not only no object: no parts either (they would stay in storage, unseen, forever). Multer
    // answers a dropped request at once; the abort follows when the part in flight is done.
    for (let i = 0; i < 150 && (await s3.pendingUploads()).length > 0; i++)
      await new Promise((r) => setTimeout(r, 100));
    expect(await s3.pendingUploads()).toEqual([]);
    server.closeAllConnections();
    await new Promise((r) => server.close(r));
  });
});
