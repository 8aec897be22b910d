import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import type TestAgent from 'supertest/lib/agent';
import { activityListSchema, deliverableSchema, type StageKey } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';
import { tinyPdf, windowsProgram } from '../support/fakes';
import { xsrfToken } from '../support/identity';

jest.setTimeout(30_000);

const LIMIT = 2 * 1024 * 1024;
const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex');

describe('deliverables: streamed uploads to S3, versions, and downloads by role', () => {
  let t: TestApp;
  let principal: TestAgent;
  let tomas: TestAgent;
  let priya: TestAgent;
  let fenwick: TestAgent;
  let harbourlight: TestAgent;
  const kestrel = DEMO.projects.kestrel.id;
  // Seeded: Kestrel Yard's beam framing is in progress, its column layout under review.
  const uploadTo = (api: TestAgent, key: StageKey, data: Buffer, filename: string, projectId = kestrel) =>
    api
      .post(`/api/projects/${projectId}/stages/${key}/deliverables`)
      .set('X-XSRF-TOKEN', xsrfToken(api))
      .attach('file', data, { filename, contentType: 'application/pdf' });
  const objects = () => t.store.list('projects/');

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true, config: { UPLOAD_MAX_BYTES: LIMIT } });
    principal = await signedInAs(t, DEMO.users.principal.email);
    tomas = await signedInAs(t, DEMO.users.engineerA.email);
    priya = await signedInAs(t, DEMO.users.engineerB.email);
    fenwick = await signedInAs(t, DEMO.users.fenwickContact.email);
    harbourlight = await signedInAs(t, DEMO.users.harbourlightContact.email);
  });
  afterAll(() => t.close());

  let first: ReturnType<typeof deliverableSchema.parse>;
  const pdf = tinyPdf('Beam schedule, levels 1 to 7');

  it('a normal PDF is stored in S3 with its SHA-256 and logged', async () => {
    const res = await uploadTo(tomas, 'beam_framing', pdf, 'Beam schedule.pdf');
    expect(res.status).toBe(201);
    first = deliverableSchema.parse(res.body);
    expect(first).toMatchObject({
      stageKey: 'beam_framing',
      fileName: 'Beam schedule.pdf',
      version: 1,
      sizeBytes: pdf.length,
      sha256: sha(pdf),
      contentType: 'application/pdf',
      uploadedBy: { id: DEMO.users.engineerA.id, displayName: DEMO.users.engineerA.name },
    });
    const row = await t.db('deliverables').where({ id: first.id }).first();
    // Built from ids only: the person's file name stays in the database.
    expect(row.object_key).toMatch(new RegExp(`^projects/${kestrel}/stages/beam_framing/[0-9a-f-]{36}$`));
    expect((await t.store.head(row.object_key))?.size).toBe(pdf.length);
    const log = activityListSchema.parse(
      (await principal.get(`/api/projects/${kestrel}/activity?objectType=deliverable`)).body,
    );
    expect(log.items[0]).toMatchObject({
      action: 'deliverable.uploaded',
      objectId: first.id,
      stageKey: 'beam_framing',
      summary: `${DEMO.users.engineerA.name} uploaded Beam schedule.pdf to Beam framing`,
    });
  });

  it('the same name again is a new version beside the old one, never over it', async () => {
    const second = tinyPdf('Beam schedule, revised');
    const res = await uploadTo(tomas, 'beam_framing', second, 'beam SCHEDULE.pdf');
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ version: 2, sha256: sha(second) });
    const list = deliverableSchema
      .array()
      .parse((await tomas.get(`/api/projects/${kestrel}/stages/beam_framing/deliverables`)).body);
    expect(list.map((d) => [d.version, d.sha256])).toEqual([
      [2, sha(second)],
      [1, sha(pdf)],
    ]);
    const keys = await t.db('deliverables').where({ project_id: kestrel }).pluck('object_key');
    expect(new Set(keys).size).toBe(2);
    const old = await tomas
      .get(first.downloadUrl)
      .buffer(true)
      .parse((r, cb) => {
        const c: Buffer[] = [];
        r.on('data', (d: Buffer) => c.push(d));
        r.on('end', () => cb(null, Buffer.concat(c)));
      });
    expect(sha(old.body as Buffer)).toBe(sha(pdf));
    const log = activityListSchema.parse(
      (await principal.get(`/api/projects/${kestrel}/activity?objectType=deliverable`)).body,
    );
    expect(log.items[0].summary).toBe(
      `${DEMO.users.engineerA.name} uploaded beam SCHEDULE.pdf (version 2) to Beam framing`,
    );
  });

  it('two uploads of one name at once get different versions', async () => {
    const [a, b] = await Promise.all([
      uploadTo(tomas, 'beam_framing', tinyPdf('a'), 'Race.pdf'),
      uploadTo(principal, 'beam_framing', tinyPdf('b'), 'Race.pdf'),
    ]);
    expect([a.status, b.status]).toEqual([201, 201]);
    expect([a.body.version, b.body.version].sort()).toEqual([1, 2]);
  });

  it('a file over the configured limit is refused with 413 and nothing is kept', async () => {
    const before = (await objects()).length;
    const big = Buffer.concat([tinyPdf(), Buffer.alloc(LIMIT, 0x20)]);
    const res = await uploadTo(tomas, 'beam_framing', big, 'Too big.pdf');
    expect(res.status).toBe(413);
    expect(res.body.error).toMatchObject({
      code: 'payload_too_large',
      message: 'The file is larger than the limit of 2 MiB.',
    });
    expect((await objects()).length).toBe(before);
    expect(await t.db('deliverables').where({ file_name: 'Too big.pdf' }).first()).toBeUndefined();
  });

  it('a Windows program renamed to .pdf is refused with 415 and nothing is kept', async () => {
    const before = (await objects()).length;
    const res = await uploadTo(tomas, 'beam_framing', windowsProgram(), 'calculations.pdf');
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('unsupported_media_type');
    expect((await objects()).length).toBe(before);
    expect(await t.db('deliverables').where({ file_name: 'calculations.pdf' }).first()).toBeUndefined();
  });

  it('a hostile file name is cleaned: no folders, no control or direction characters, no device names', async () => {
    const res = await uploadTo(tomas, 'beam_framing', tinyPdf(), '../../etc/\u202eCON.fdp.pdf');
    expect(res.status).toBe(201);
    expect(res.body.fileName).toBe('_CON.fdp.pdf');
    const row = await t.db('deliverables').where({ id: res.body.id }).first();
    expect(row.object_key).not.toContain('..');
    const download = await tomas.get(res.body.downloadUrl);
    expect(download.headers['content-disposition']).toBe(
      `attachment; filename="_CON.fdp.pdf"; filename*=UTF-8''_CON.fdp.pdf`,
    );
    // A file is not a JSON reply: it carries helmet's full set, the page policy included.
    expect(download.headers['content-security-policy']).toContain("default-src 'self'");
    expect(download.headers['x-frame-options']).toBe('SAMEORIGIN');
    const accented = await uploadTo(tomas, 'beam_framing', tinyPdf(), 'Béton armé.pdf');
    expect(accented.body.fileName).toBe('Béton armé.pdf');
  });

  it('a long non-ASCII name (over 255 bytes) is stored under an id key and comes back whole in the download', async () => {
    // 90 CJK characters: 270 bytes in UTF-8, the name that once took the S3 fake down.
    const long = `${'基礎梁配筋詳細図'.repeat(11)}一二.pdf`;
    const res = await uploadTo(tomas, 'beam_framing', tinyPdf('Ground beam details'), long);
    expect(res.status).toBe(201);
    const created = deliverableSchema.parse(res.body);
    expect(Buffer.byteLength(created.fileName, 'utf8')).toBeLessThanOrEqual(180);
    expect(long.startsWith(created.fileName.replace(/\.pdf$/, ''))).toBe(true);
    const row = await t.db('deliverables').where({ id: created.id }).first();
    expect(row.file_name).toBe(created.fileName);
    expect(row.object_key).toMatch(new RegExp(`^projects/${kestrel}/stages/beam_framing/[0-9a-f-]{36}$`));
    const download = await tomas.get(created.downloadUrl);
    expect(download.status).toBe(200);
    expect(download.headers['content-disposition']).toBe(
      `attachment; filename="download.pdf"; filename*=UTF-8''${encodeURIComponent(created.fileName)}`,
    );
    // The service stays up: the next upload still works.
    expect((await uploadTo(tomas, 'beam_framing', tinyPdf(), 'After.pdf')).status).toBe(201);
  });

  it('a file recorded under an older name-based key still downloads from the key the row holds', async () => {
    const pdfBytes = tinyPdf('Older upload');
    const oldKey = `projects/${kestrel}/stages/beam_framing/${'0'.repeat(8)}-0000-4000-8000-${'0'.repeat(12)}/Old slab notes.pdf`;
    await t.store.putStream(oldKey, Readable.from([pdfBytes]), { contentType: 'application/pdf' });
    const [{ id }] = await t
      .db('deliverables')
      .insert({
        project_id: kestrel,
        stage_key: 'beam_framing',
        file_name: 'Old slab notes.pdf',
        version: 1,
        object_key: oldKey,
        size_bytes: pdfBytes.length,
        sha256: sha(pdfBytes),
        content_type: 'application/pdf',
        detected_type: 'pdf',
        uploaded_by: DEMO.users.engineerA.id,
      })
      .returning('id');
    const res = await tomas
      .get(`/api/projects/${kestrel}/deliverables/${id}/download`)
      .buffer(true)
      .parse((r, cb) => {
        const c: Buffer[] = [];
        r.on('data', (d: Buffer) => c.push(d));
        r.on('end', () => cb(null, Buffer.concat(c)));
      });
    expect(res.status).toBe(200);
    expect(sha(res.body as Buffer)).toBe(sha(pdfBytes));
  });

  it('refuses files on a stage under review, before anything is streamed', async () => {
    const before = (await objects()).length;
    const res = await uploadTo(tomas, 'column_layout', tinyPdf(), 'Late change.pdf');
    expect(res.status).toBe(409);
    expect(res.body.error.message).toBe(
      'Column layout is under review; files can be added once it is returned or reopened.',
    );
    expect((await objects()).length).toBe(before);
  });

  it('clients and engineers off the project cannot upload', async () => {
    expect((await uploadTo(fenwick, 'beam_framing', tinyPdf(), 'x.pdf')).status).toBe(403);
    expect((await uploadTo(priya, 'beam_framing', tinyPdf(), 'x.pdf')).status).toBe(404);
  });

  it("downloads stream the stored bytes to the firm's staff on the project, and to nobody else", async () => {
    for (const api of [principal, tomas]) {
      const res = await api
        .get(first.downloadUrl)
        .buffer(true)
        .parse((r, cb) => {
          const c: Buffer[] = [];
          r.on('data', (d: Buffer) => c.push(d));
          r.on('end', () => cb(null, Buffer.concat(c)));
        });
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toBe('application/pdf');
      expect(res.headers['content-disposition']).toContain('filename="Beam schedule.pdf"');
      expect(res.headers['cache-control']).toBe('private, no-store');
      expect(sha(res.body as Buffer)).toBe(first.sha256);
    }
    // The project's client sees the project but not the firm's working files.
    const client = await fenwick.get(first.downloadUrl);
    expect(client.status).toBe(403);
    expect(client.body.error.code).toBe('forbidden');
    for (const api of [priya, harbourlight]) {
      const res = await api.get(first.downloadUrl);
      expect(res.status).toBe(404);
      expect(res.body.error.message).toBe('No project with this id.');
    }
    // A file id from another project, asked for under a project the caller can see.
    const alderFile = await t
      .db('deliverables')
      .insert({
        project_id: DEMO.projects.alder.id,
        stage_key: 'design_basis',
        file_name: 'Other.pdf',
        version: 1,
        object_key: 'projects/other/Other.pdf',
        size_bytes: 1,
        sha256: 'a'.repeat(64),
        content_type: 'application/pdf',
        detected_type: 'pdf',
        uploaded_by: DEMO.users.engineerB.id,
      })
      .returning('id');
    const crossed = await tomas.get(`/api/projects/${kestrel}/deliverables/${alderFile[0].id}/download`);
    expect(crossed.status).toBe(404);
    expect(crossed.body.error.message).toBe('No file with this id.');
    expect((await tomas.get(`/api/projects/${kestrel}/deliverables/not-an-id/download`)).status).toBe(400);
    expect((await send(tomas, 'post', `/api/projects/${kestrel}/stages/no_such_stage/deliverables`)).status).toBe(400);
  });
});
