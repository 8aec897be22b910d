import { createHash } from 'node:crypto';
import type TestAgent from 'supertest/lib/agent';
import {
  drawingListSchema,
  drawingSchema,
  nextNumberSchema,
  nextRevisionSchema,
  revisionFileSchema,
  revisionSchema,
} from '@trabeate/contracts';
import { DEMO, seedDemo } from '../../seeds/demo';
import { DEMO_DRAWINGS, storeDemoDrawingFiles } from '../../seeds/demo-drawings';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';
import { tinyPdf } from '../support/fakes';
import { approvedRevision, binary, drawingBody, pdfText, revisionBody, uploadRevisionFile } from '../support/drawings';

jest.setTimeout(60_000);

const kestrel = DEMO.projects.kestrel.id;
const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex');

describe('drawing register: drawings, revisions and their lifecycle', () => {
  let t: TestApp;
  let principal: TestAgent;
  let tomas: TestAgent;
  let priya: TestAgent;
  let fenwick: TestAgent;

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    // Priya joins Kestrel Yard so that a second engineer can check Tomas's drawings.
    await t
      .db('project_members')
      .insert({ project_id: kestrel, user_id: DEMO.users.engineerB.id })
      .onConflict(['project_id', 'user_id'])
      .ignore();
    principal = await signedInAs(t, DEMO.users.principal.email);
    tomas = await signedInAs(t, DEMO.users.engineerA.email);
    priya = await signedInAs(t, DEMO.users.engineerB.email);
    fenwick = await signedInAs(t, DEMO.users.fenwickContact.email);
  });
  afterAll(() => t.close());

  const transition = (api: TestAgent, revisionId: string, action: 'check' | 'approve') =>
    send(api, 'post', `/api/projects/${kestrel}/revisions/${revisionId}/transitions`, { action });

  it('proposes the next number from the firm pattern and refuses a number already used', async () => {
    const first = nextNumberSchema.parse((await tomas.get(`/api/projects/${kestrel}/drawings/next-number`)).body);
    const created = await send(
      tomas,
      'post',
      `/api/projects/${kestrel}/drawings`,
      drawingBody({ number: first.number }),
    );
    expect(created.status).toBe(201);
    const next = nextNumberSchema.parse((await tomas.get(`/api/projects/${kestrel}/drawings/next-number`)).body);
    const seq = (n: string) => Number(/(\d+)$/.exec(n)![1]);
    expect(seq(next.number)).toBe(seq(first.number) + 1);

    const again = await send(
      tomas,
      'post',
      `/api/projects/${kestrel}/drawings`,
      drawingBody({ number: first.number.toLowerCase() }),
    );
    expect(again.status).toBe(409);
    expect(again.body.error.message).toContain('already used');
  });

  it('follows an ISO 19650 container-name pattern the principal sets', async () => {
    const put = await send(principal, 'put', '/api/drawing-settings', {
      revisionScheme: 'iso19650',
      numberPattern: '{project}-SQS-ZZ-00-DR-S-{seq:4}',
    });
    expect(put.status).toBe(200);
    await send(
      tomas,
      'post',
      `/api/projects/${kestrel}/drawings`,
      drawingBody({ number: 'SQ-2026-014-SQS-ZZ-00-DR-S-0041' }),
    );
    const next = nextNumberSchema.parse((await tomas.get(`/api/projects/${kestrel}/drawings/next-number`)).body);
    expect(next.number).toBe('SQ-2026-014-SQS-ZZ-00-DR-S-0042');
    const bad = await send(principal, 'put', '/api/drawing-settings', {
      revisionScheme: 'iso19650',
      numberPattern: 'S-###',
    });
    expect(bad.status).toBe(400);
    const engineer = await send(tomas, 'put', '/api/drawing-settings', {
      revisionScheme: 'iso19650',
      numberPattern: 'S-{seq:2}',
    });
    expect(engineer.status).toBe(403);
    await send(principal, 'put', '/api/drawing-settings', { revisionScheme: 'iso19650', numberPattern: 'S-{seq:3}' });
  });

  it('takes a revision from draft through checked and approved, refusing every out-of-turn step with a reason', async () => {
    const d = drawingSchema.parse(
      (await send(tomas, 'post', `/api/projects/${kestrel}/drawings`, drawingBody({ number: 'S-201' }))).body,
    );
    const proposal = nextRevisionSchema.parse(
      (await tomas.get(`/api/projects/${kestrel}/drawings/${d.id}/next-revision`)).body,
    );
    expect(proposal).toEqual({ code: 'P01', series: 'preliminary', scheme: 'iso19650' });

    const r = revisionSchema.parse(
      (await send(tomas, 'post', `/api/projects/${kestrel}/drawings/${d.id}/revisions`, revisionBody())).body,
    );
    expect(r).toMatchObject({
      code: 'P01',
      state: 'draft',
      suitability: 'S2',
      drawnBy: { id: DEMO.users.engineerA.id },
    });

    // No PDF yet.
    const early = await transition(priya, r.id, 'check');
    expect(early.status).toBe(409);
    expect(early.body.error.message).toContain('no PDF');

    const pdf = tinyPdf('S-201 column layout');
    const up = await uploadRevisionFile(tomas, kestrel, r.id, pdf, 'S-201 Ground floor.pdf');
    expect(up.status).toBe(201);
    expect(revisionFileSchema.parse(up.body)).toMatchObject({ role: 'pdf', sha256: sha(pdf), sizeBytes: pdf.length });
    const key = (await t.db('revision_files').where({ id: up.body.id }).first()).object_key;
    expect(key).toBe(`drawings/${kestrel}/${r.id}/${key.split('/').pop()}`);
    expect(key).not.toContain('Ground');
    const second = await uploadRevisionFile(tomas, kestrel, r.id, pdf, 'again.pdf');
    expect(second.status).toBe(409);
    const source = await uploadRevisionFile(
      tomas,
      kestrel,
      r.id,
      Buffer.from('0\nSECTION\n2\nENTITIES\n0\nENDSEC\n0\nEOF\n'),
      'S-201.dxf',
      'source',
    );
    expect(source.status).toBe(201);

    const self = await transition(tomas, r.id, 'check');
    expect(self.status).toBe(409);
    expect(self.body.error.message).toBe('You drew revision P01; another engineer or the principal checks it.');
    const tooSoon = await transition(principal, r.id, 'approve');
    expect(tooSoon.status).toBe(409);
    expect(tooSoon.body.error.message).toContain('only a checked revision can be approved');

    const checked = await transition(priya, r.id, 'check');
    expect(checked.status).toBe(200);
    expect(revisionSchema.parse(checked.body)).toMatchObject({
      state: 'checked',
      checkedBy: { id: DEMO.users.engineerB.id },
    });
    const late = await uploadRevisionFile(tomas, kestrel, r.id, pdf, 'late.dxf', 'source');
    expect(late.status).toBe(409);

    const byEngineer = await transition(priya, r.id, 'approve');
    expect(byEngineer.status).toBe(409);
    expect(byEngineer.body.error.message).toBe("Only the firm's principal approves a revision.");
    const approved = await transition(principal, r.id, 'approve');
    expect(approved.status).toBe(200);
    expect(revisionSchema.parse(approved.body)).toMatchObject({
      state: 'approved',
      approvedBy: { id: DEMO.users.principal.id },
    });

    const byClient = await transition(fenwick, r.id, 'check');
    expect(byClient.status).toBe(403);

    const another = await send(tomas, 'post', `/api/projects/${kestrel}/drawings/${d.id}/revisions`, revisionBody());
    expect(another.status).toBe(409);
    expect(another.body.error.message).toContain('P01 of S-201 is still approved');
  });

  it('refuses a suitability that does not fit the series, and never lets a contractual drawing go back', async () => {
    const d = drawingSchema.parse(
      (await send(tomas, 'post', `/api/projects/${kestrel}/drawings`, drawingBody({ number: 'S-301' }))).body,
    );
    const wrong = await send(
      tomas,
      'post',
      `/api/projects/${kestrel}/drawings/${d.id}/revisions`,
      revisionBody({ suitability: 'A1' }),
    );
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.message).toContain('S0 to S4');
    const c = await send(
      tomas,
      'post',
      `/api/projects/${kestrel}/drawings/${d.id}/revisions`,
      revisionBody({ series: 'contractual', suitability: 'A2', purpose: 'construction' }),
    );
    expect(c.status).toBe(201);
    expect(c.body.code).toBe('C01');
  });

  it('proposes codes in the letters-then-numbers scheme when the firm chooses it', async () => {
    await send(principal, 'put', '/api/drawing-settings', {
      revisionScheme: 'letters_numbers',
      numberPattern: 'S-{seq:3}',
    });
    try {
      const d = drawingSchema.parse(
        (await send(tomas, 'post', `/api/projects/${kestrel}/drawings`, drawingBody({ number: 'S-401' }))).body,
      );
      const first = nextRevisionSchema.parse(
        (await tomas.get(`/api/projects/${kestrel}/drawings/${d.id}/next-revision`)).body,
      );
      expect(first.code).toBe('A');
      const contractual = nextRevisionSchema.parse(
        (await tomas.get(`/api/projects/${kestrel}/drawings/${d.id}/next-revision?series=contractual`)).body,
      );
      expect(contractual.code).toBe('0');
      const r = await send(tomas, 'post', `/api/projects/${kestrel}/drawings/${d.id}/revisions`, revisionBody());
      expect(r.body.code).toBe('A');
      // The register's own rows: make A issued so B can follow (the transmittal path is tested elsewhere).
      await t.db('drawing_revisions').where({ id: r.body.id }).update({ state: 'issued', issued_at: new Date() });
      const second = nextRevisionSchema.parse(
        (await tomas.get(`/api/projects/${kestrel}/drawings/${d.id}/next-revision`)).body,
      );
      expect(second.code).toBe('B');
    } finally {
      await send(principal, 'put', '/api/drawing-settings', { revisionScheme: 'iso19650', numberPattern: 'S-{seq:3}' });
    }
  });

  it('registers exactly one of five simultaneous revisions of a drawing and tells the others why', async () => {
    const d = drawingSchema.parse(
      (await send(tomas, 'post', `/api/projects/${kestrel}/drawings`, drawingBody({ number: 'S-501' }))).body,
    );
    const results = await Promise.all(
      [tomas, priya, principal, tomas, priya].map((api) =>
        send(api, 'post', `/api/projects/${kestrel}/drawings/${d.id}/revisions`, revisionBody()),
      ),
    );
    const statuses = results.map((r) => r.status).sort();
    expect(statuses).toEqual([201, 409, 409, 409, 409]);
    for (const r of results.filter((x) => x.status === 409))
      expect(r.body.error.message).toContain('P01 of S-501 is still draft');
    const rows = await t.db('drawing_revisions').where({ drawing_id: d.id });
    expect(rows.map((r) => r.code)).toEqual(['P01']);
  });

  it('registers revisions of different drawings at the same moment without losing any', async () => {
    const drawings = await Promise.all(
      ['S-601', 'S-602', 'S-603', 'S-604'].map(async (number) =>
        drawingSchema.parse(
          (await send(tomas, 'post', `/api/projects/${kestrel}/drawings`, drawingBody({ number }))).body,
        ),
      ),
    );
    const results = await Promise.all(
      drawings.map((d, i) =>
        send(i % 2 ? priya : tomas, 'post', `/api/projects/${kestrel}/drawings/${d.id}/revisions`, revisionBody()),
      ),
    );
    expect(results.map((r) => r.status)).toEqual([201, 201, 201, 201]);
    expect(
      await t
        .db('drawing_revisions')
        .whereIn(
          'drawing_id',
          drawings.map((d) => d.id),
        )
        .count('* as n')
        .first(),
    ).toEqual({
      n: '4',
    });
  });

  describe('an issued revision never changes', () => {
    let revisionId: string;
    let fileId: string;
    beforeAll(async () => {
      const { revision } = await approvedRevision({ drawer: tomas, checker: priya, principal }, kestrel, 'S-701');
      revisionId = revision.id;
      // Issue it as a transmittal would (the transmittal itself is tested in transmittals.spec.ts).
      await t.db('drawing_revisions').where({ id: revisionId }).update({ state: 'issued', issued_at: new Date() });
      fileId = (await t.db('revision_files').where({ revision_id: revisionId }).first()).id;
    });

    it('refuses edits, transitions and new files through the API with the reason', async () => {
      const patch = await send(tomas, 'patch', `/api/projects/${kestrel}/revisions/${revisionId}`, {
        description: 'tweak',
      });
      expect(patch.status).toBe(409);
      expect(patch.body.error.message).toBe(
        'Revision P01 has been issued and never changes; register a new revision instead.',
      );
      expect((await transition(principal, revisionId, 'approve')).status).toBe(409);
      const file = await uploadRevisionFile(tomas, kestrel, revisionId, tinyPdf(), 'extra.dxf', 'source');
      expect(file.status).toBe(409);
    });

    it('refuses a direct update or delete through Knex, of the revision and of its files', async () => {
      await expect(
        t.db('drawing_revisions').where({ id: revisionId }).update({ description: 'quietly changed' }),
      ).rejects.toThrow(/has been issued and cannot be changed/);
      await expect(t.db('drawing_revisions').where({ id: revisionId }).update({ state: 'draft' })).rejects.toThrow(
        /cannot be changed/,
      );
      await expect(t.db('drawing_revisions').where({ id: revisionId }).delete()).rejects.toThrow(/cannot be deleted/);
      await expect(t.db('revision_files').where({ id: fileId }).update({ file_name: 'other.pdf' })).rejects.toThrow(
        /files of an issued revision/,
      );
      await expect(t.db('revision_files').where({ id: fileId }).delete()).rejects.toThrow(
        /files of an issued revision/,
      );
      // Superseding is the one change allowed, and it may change nothing else.
      await expect(
        t
          .db('drawing_revisions')
          .where({ id: revisionId })
          .update({ state: 'superseded', superseded_at: new Date(), code: 'P09' }),
      ).rejects.toThrow(/cannot be changed/);
      const row = await t.db('drawing_revisions').where({ id: revisionId }).first();
      expect(row).toMatchObject({ state: 'issued', description: 'First issue for coordination', code: 'P01' });
    });

    it('lets a new revision follow, as P02', async () => {
      const drawingId = (await t.db('drawing_revisions').where({ id: revisionId }).first()).drawing_id;
      const next = await send(
        tomas,
        'post',
        `/api/projects/${kestrel}/drawings/${drawingId}/revisions`,
        revisionBody({ suitability: 'S3' }),
      );
      expect(next.status).toBe(201);
      expect(next.body.code).toBe('P02');
    });

    it('shows the client only what went out, and 404 for the rest', async () => {
      const list = drawingListSchema.parse((await fenwick.get(`/api/projects/${kestrel}/drawings?pageSize=100`)).body);
      const numbers = list.items.map((i) => i.number);
      expect(numbers).toContain('S-701');
      expect(numbers).not.toContain('S-201');
      const s701 = list.items.find((i) => i.number === 'S-701')!;
      expect(s701.current).toMatchObject({ code: 'P01', state: 'issued' });
      const detail = drawingSchema.parse((await fenwick.get(`/api/projects/${kestrel}/drawings/${s701.id}`)).body);
      expect(detail.revisions.map((r) => r.code)).toEqual(['P01']);
      expect(detail.canRegisterRevision).toBe(false);
      const download = await fenwick.get(detail.revisions[0].files[0].downloadUrl).buffer(true).parse(binary);
      expect(download.status).toBe(200);
      expect(download.headers['content-disposition']).toContain("filename*=UTF-8''S-701.pdf");
      const draftDrawing = (await t.db('drawings').where({ project_id: kestrel, number: 'S-201' }).first()).id;
      expect((await fenwick.get(`/api/projects/${kestrel}/drawings/${draftDrawing}`)).status).toBe(404);
      const draftFile = await t
        .db('revision_files as f')
        .join('drawing_revisions as r', 'r.id', 'f.revision_id')
        .where('r.state', 'approved')
        .first('f.id', 'f.revision_id');
      const hidden = await fenwick.get(
        `/api/projects/${kestrel}/revisions/${draftFile.revision_id}/files/${draftFile.id}/download`,
      );
      expect(hidden.status).toBe(404);
      const logged = await t.db('drawing_downloads').where({ user_id: DEMO.users.fenwickContact.id, what: 'file' });
      expect(logged).toHaveLength(1);
    });
  });

  describe('the register page: server-side sort, filter, search and paging', () => {
    it('sorts by number both ways and pages', async () => {
      const asc = drawingListSchema.parse(
        (await tomas.get(`/api/projects/${kestrel}/drawings?sort=number&direction=asc&pageSize=3`)).body,
      );
      const desc = drawingListSchema.parse(
        (await tomas.get(`/api/projects/${kestrel}/drawings?sort=number&direction=desc&pageSize=100`)).body,
      );
      expect(asc.items).toHaveLength(3);
      expect(asc.total).toBe(desc.total);
      expect(asc.items.map((i) => i.number)).toEqual(
        [...desc.items.map((i) => i.number)].sort((a, b) => a.toLowerCase().localeCompare(b.toLowerCase())).slice(0, 3),
      );
      const page2 = drawingListSchema.parse(
        (await tomas.get(`/api/projects/${kestrel}/drawings?sort=number&direction=asc&pageSize=3&page=2`)).body,
      );
      expect(page2.items.map((i) => i.id)).not.toContain(asc.items[0].id);
    });

    it('filters by state and suitability, and searches number and title', async () => {
      const approved = drawingListSchema.parse(
        (await tomas.get(`/api/projects/${kestrel}/drawings?state=approved`)).body,
      );
      expect(approved.items.map((i) => i.number)).toEqual(['S-201']);
      const contractual = drawingListSchema.parse(
        (await tomas.get(`/api/projects/${kestrel}/drawings?suitability=a2`)).body,
      );
      expect(contractual.items.map((i) => i.number)).toEqual(['S-301']);
      const search = drawingListSchema.parse((await tomas.get(`/api/projects/${kestrel}/drawings?q=S-60`)).body);
      expect(search.items.map((i) => i.number).sort()).toEqual(['S-601', 'S-602', 'S-603', 'S-604']);
      const bad = await tomas.get(`/api/projects/${kestrel}/drawings?sort=colour`);
      expect(bad.status).toBe(400);
    });
  });

  it('seeds the demo register safely twice, and its stored files match their recorded SHA-256', async () => {
    await seedDemo(t.db);
    expect(await storeDemoDrawingFiles(t.store)).toBeGreaterThan(0);
    expect(await storeDemoDrawingFiles(t.store)).toBe(0);
    const list = drawingListSchema.parse((await fenwick.get(`/api/projects/${kestrel}/drawings?q=S-00`)).body);
    // S-003 is only a draft: the client sees the two issued drawings.
    expect(list.items.map((i) => `${i.number} ${i.current?.code} ${i.current?.state}`)).toEqual([
      'S-001 P02 issued',
      'S-002 P01 issued',
    ]);
    const s001 = drawingSchema.parse(
      (await fenwick.get(`/api/projects/${kestrel}/drawings/${DEMO_DRAWINGS.foundations.id}`)).body,
    );
    expect(s001.revisions.map((r) => `${r.code} ${r.state}`)).toEqual(['P02 issued', 'P01 superseded']);
    const file = s001.revisions[0].files[0];
    const res = await fenwick.get(file.downloadUrl).buffer(true).parse(binary);
    expect(res.status).toBe(200);
    expect(sha(res.body as Buffer)).toBe(file.sha256);
  });

  describe('exports', () => {
    it('exports the register as CSV, quoted and with the issue history', async () => {
      const res = await tomas.get(`/api/projects/${kestrel}/drawings/export.csv`);
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toContain('text/csv');
      const lines = res.text
        .replace(/^\ufeff/, '')
        .trim()
        .split('\r\n');
      expect(lines[0]).toBe(
        '"Number","Title","Stage","Sheet","Scale","Current revision","State","Suitability","Date of issue","Issue history"',
      );
      const s701 = lines.find((l) => l.startsWith('"S-701"'))!;
      expect(s701).toContain('"P02","draft","S3"');
      expect(s701).toMatch(/"P01 S2 \d{1,2} [A-Z][a-z]{2} \d{4} \(for information\)"$/);
      const filtered = await tomas.get(`/api/projects/${kestrel}/drawings/export.csv?q=S-60`);
      expect(filtered.text.trim().split('\r\n')).toHaveLength(5);
    });

    it('defuses a title that a spreadsheet would run as a formula', async () => {
      await send(
        tomas,
        'post',
        `/api/projects/${kestrel}/drawings`,
        drawingBody({ number: 'S-801', title: '=HYPERLINK("x")' }),
      );
      const res = await tomas.get(`/api/projects/${kestrel}/drawings/export.csv?q=S-801`);
      expect(res.text).toContain(`"'=HYPERLINK(""x"")"`);
    });

    it('exports the register as a PDF whose text lists the drawings', async () => {
      const res = await tomas.get(`/api/projects/${kestrel}/drawings/export.pdf?q=S-70`).buffer(true).parse(binary);
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toBe('application/pdf');
      const text = await pdfText(res.body as Buffer);
      expect(text).toContain('Drawing register');
      expect(text).toContain('S-701');
      expect(text).toContain('1 drawing (filtered: search "S-70")');
      expect(text).not.toContain('S-201');
    });

    it('keeps the exports to the firm', async () => {
      expect((await fenwick.get(`/api/projects/${kestrel}/drawings/export.csv`)).status).toBe(403);
    });
  });
});
