import type TestAgent from 'supertest/lib/agent';
import request from 'supertest';
import {
  downloadLogSchema,
  drawingSchema,
  transmittalListSchema,
  transmittalSchema,
  type Transmittal,
} from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';
import { startFakeSmtp, tinyPdf } from '../support/fakes';
import type { FakeSmtp } from '../../scripts/fakes/smtp';
import { approvedRevision, binary, pdfText, revisionBody, unzip, uploadRevisionFile } from '../support/drawings';

jest.setTimeout(60_000);

const kestrel = DEMO.projects.kestrel.id;
const CONTRACTOR = 'site.office@brackenfold-build.example';

describe('transmittals: issuing approved revisions, the sheet, e-mails, signed links and downloads', () => {
  let t: TestApp;
  let smtp: FakeSmtp;
  let principal: TestAgent;
  let tomas: TestAgent;
  let priya: TestAgent;
  let fenwick: TestAgent;
  let harbourlight: TestAgent;
  let issued: Transmittal;
  const pdfs: Buffer[] = [];
  // The demo seed already issued some on Kestrel Yard; numbers continue from there.
  let demoTransmittals = 0;

  beforeAll(async () => {
    smtp = await startFakeSmtp({ httpPort: null });
    t = await testApp({ seed: true, identity: true, mail: { smtpPort: smtp.port } });
    await t
      .db('project_members')
      .insert({ project_id: kestrel, user_id: DEMO.users.engineerB.id })
      .onConflict(['project_id', 'user_id'])
      .ignore();
    principal = await signedInAs(t, DEMO.users.principal.email);
    tomas = await signedInAs(t, DEMO.users.engineerA.email);
    priya = await signedInAs(t, DEMO.users.engineerB.email);
    fenwick = await signedInAs(t, DEMO.users.fenwickContact.email);
    harbourlight = await signedInAs(t, DEMO.users.harbourlightContact.email);
    demoTransmittals = Number((await t.db('transmittals').where({ project_id: kestrel }).count('* as n').first())!.n);
  });
  afterAll(async () => {
    await t.close();
    await smtp.stop();
  });

  const agents = () => ({ drawer: tomas, checker: priya, principal });

  it('refuses to issue a revision that is not approved, saying which', async () => {
    const d = drawingSchema.parse(
      (
        await send(tomas, 'post', `/api/projects/${kestrel}/drawings`, {
          number: 'S-090',
          title: 'Draft only',
          stageKey: 'column_layout',
          sheetSize: 'A3',
          scale: '1:50',
        })
      ).body,
    );
    const r = await send(tomas, 'post', `/api/projects/${kestrel}/drawings/${d.id}/revisions`, revisionBody());
    const res = await send(principal, 'post', `/api/projects/${kestrel}/transmittals`, {
      purpose: 'information',
      revisionIds: [r.body.id],
      contactIds: [DEMO.users.fenwickContact.id],
    });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toBe('Only approved revisions can be issued: S-090 revision P01 is draft.');
    expect(await t.db('transmittals').count('* as n').first()).toEqual({ n: String(demoTransmittals) });
  });

  it('refuses recipients who are not this project’s client contacts', async () => {
    const { revision } = await approvedRevision(agents(), kestrel, 'S-091');
    const res = await send(principal, 'post', `/api/projects/${kestrel}/transmittals`, {
      purpose: 'information',
      revisionIds: [revision.id],
      contactIds: [DEMO.users.harbourlightContact.id],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toContain('client contacts');
    const byEngineer = await send(tomas, 'post', `/api/projects/${kestrel}/transmittals`, {
      purpose: 'information',
      revisionIds: [revision.id],
      contactIds: [DEMO.users.fenwickContact.id],
    });
    expect(byEngineer.status).toBe(403);
  });

  it('issues approved revisions in one step: numbered, revisions issued, a sheet stored and one e-mail per recipient', async () => {
    const a = await approvedRevision(agents(), kestrel, 'S-101', tinyPdf('S-101 ground floor columns'));
    const b = await approvedRevision(agents(), kestrel, 'S-102', tinyPdf('S-102 first floor columns'));
    pdfs.push(a.pdf, b.pdf);
    const s091 = (await t.db('drawings').where({ project_id: kestrel, number: 'S-091' }).first()).id;
    const s091Revision = (await t.db('drawing_revisions').where({ drawing_id: s091 }).first()).id;
    const res = await send(principal, 'post', `/api/projects/${kestrel}/transmittals`, {
      purpose: 'coordination',
      note: 'Column layout for coordination with the architect’s level 1 plan.',
      revisionIds: [b.revision.id, a.revision.id, s091Revision],
      contactIds: [DEMO.users.fenwickContact.id],
      externalEmails: [CONTRACTOR],
    });
    expect(res.status).toBe(201);
    issued = transmittalSchema.parse(res.body);
    expect(issued.number).toBe(demoTransmittals + 1);
    expect(issued.reference).toBe(
      `${DEMO.projects.kestrel.reference}-TR-${String(demoTransmittals + 1).padStart(3, '0')}`,
    );
    expect(issued.items.map((i) => `${i.number} ${i.code} ${i.state}`)).toEqual([
      'S-091 P01 issued',
      'S-101 P01 issued',
      'S-102 P01 issued',
    ]);
    expect(issued.recipients.map((r) => [r.email, r.acknowledgedAt])).toEqual([
      [DEMO.users.fenwickContact.email, null],
      [CONTRACTOR, null],
    ]);

    const sheet = await principal.get(issued.sheetUrl).buffer(true).parse(binary);
    expect(sheet.status).toBe(200);
    const text = await pdfText(sheet.body as Buffer);
    expect(text).toContain(`Transmittal ${issued.reference}`);
    expect(text).toContain('For coordination');
    expect(text).toContain(CONTRACTOR);
    for (const n of ['S-091', 'S-101', 'S-102']) expect(text).toContain(n);
    expect(text).toContain('Ground floor column layout');
    expect(text).toContain('S2 Shared for information');
    expect(text).toMatch(/1 Dec 2026/);
    expect(text).toContain('licensed structural engineer');

    const toClient = await smtp.waitFor((m) => m.to.includes(DEMO.users.fenwickContact.email));
    expect(toClient.subject).toBe(`Kestrel Yard apartments: drawings issued under ${issued.reference}`);
    expect(toClient.text).toContain('S-101 revision P01 (S2): Ground floor column layout');
    expect(toClient.text).toContain(`/drawings?project=${kestrel}&transmittal=${issued.id}`);
    expect(toClient.text).not.toContain('/api/shared/');
    // The transmittal sheet itself is attached to every recipient's e-mail.
    expect(toClient.attachments).toEqual([
      { filename: `${issued.reference}.pdf`, contentType: 'application/pdf', size: expect.any(Number) },
    ]);
    expect(toClient.attachments[0].size).toBeGreaterThan(1000);
    const toContractor = await smtp.waitFor((m) => m.to.includes(CONTRACTOR));
    expect(toContractor.attachments.map((a) => a.filename)).toEqual([`${issued.reference}.pdf`]);
    expect(toContractor.text).toContain('/api/shared/transmittals/');
    expect(toContractor.text).toContain('work until');
    expect(toContractor.text).not.toContain('acknowledge');
  });

  it('supersedes the earlier issue when the next revision of a drawing is issued', async () => {
    const drawingId = issued.items.find((i) => i.number === 'S-101')!.drawingId;
    const r = await send(
      tomas,
      'post',
      `/api/projects/${kestrel}/drawings/${drawingId}/revisions`,
      revisionBody({ suitability: 'S3' }),
    );
    expect(r.body.code).toBe('P02');
    await uploadRevisionFile(tomas, kestrel, r.body.id, tinyPdf('S-101 P02'), 'S-101 P02.pdf');
    await send(priya, 'post', `/api/projects/${kestrel}/revisions/${r.body.id}/transitions`, { action: 'check' });
    await send(principal, 'post', `/api/projects/${kestrel}/revisions/${r.body.id}/transitions`, { action: 'approve' });
    const second = await send(principal, 'post', `/api/projects/${kestrel}/transmittals`, {
      purpose: 'comment',
      revisionIds: [r.body.id],
      contactIds: [DEMO.users.fenwickContact.id],
    });
    expect(second.status).toBe(201);
    expect(second.body.number).toBe(demoTransmittals + 2);
    const drawing = drawingSchema.parse((await fenwick.get(`/api/projects/${kestrel}/drawings/${drawingId}`)).body);
    expect(drawing.revisions.map((x) => `${x.code} ${x.state}`)).toEqual(['P02 issued', 'P01 superseded']);
    expect(drawing.current).toMatchObject({ code: 'P02', state: 'issued' });
  });

  it('shows a client contact only the transmittals sent to them, and hides them from other clients', async () => {
    const mine = transmittalListSchema.parse((await fenwick.get(`/api/projects/${kestrel}/transmittals`)).body);
    expect(mine.map((x) => x.number).slice(0, 2)).toEqual([demoTransmittals + 2, demoTransmittals + 1]);
    expect(mine[1].myAcknowledgement).toEqual({ acknowledgedAt: null });
    const detail = transmittalSchema.parse(
      (await fenwick.get(`/api/projects/${kestrel}/transmittals/${issued.id}`)).body,
    );
    // The client sees their own receipt, not the other recipients.
    expect(detail.recipients.map((r) => r.email)).toEqual([DEMO.users.fenwickContact.email]);
    expect((await harbourlight.get(`/api/projects/${kestrel}/transmittals/${issued.id}`)).status).toBe(404);
    expect((await harbourlight.get(`/api/projects/${kestrel}/transmittals/${issued.id}/zip`)).status).toBe(404);
  });

  it('streams every file of a transmittal, with its sheet, as one ZIP', async () => {
    const res = await fenwick.get(issued.zipUrl).buffer(true).parse(binary);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/zip');
    expect(Number(res.headers['content-length'])).toBe((res.body as Buffer).length);
    const entries = await unzip(res.body as Buffer);
    expect([...entries.keys()].sort()).toEqual(
      [
        `${issued.reference}.pdf`,
        'S-091 rev P01/S-091.pdf',
        'S-101 rev P01/S-101.pdf',
        'S-102 rev P01/S-102.pdf',
      ].sort(),
    );
    expect(entries.get('S-101 rev P01/S-101.pdf')!.equals(pdfs[0])).toBe(true);
    expect(entries.get('S-102 rev P01/S-102.pdf')!.equals(pdfs[1])).toBe(true);
  });

  it('lets the client acknowledge once, and shows the principal who has and who has not', async () => {
    const ack = await send(fenwick, 'post', `/api/projects/${kestrel}/transmittals/${issued.id}/acknowledge`);
    expect(ack.status).toBe(200);
    const first = transmittalSchema.parse(ack.body).myAcknowledgement!.acknowledgedAt;
    expect(first).not.toBeNull();
    const again = await send(fenwick, 'post', `/api/projects/${kestrel}/transmittals/${issued.id}/acknowledge`);
    expect(again.body.myAcknowledgement.acknowledgedAt).toBe(first);
    expect(
      (await send(principal, 'post', `/api/projects/${kestrel}/transmittals/${issued.id}/acknowledge`)).status,
    ).toBe(403);
    const seen = transmittalSchema.parse(
      (await principal.get(`/api/projects/${kestrel}/transmittals/${issued.id}`)).body,
    );
    expect(seen.recipients.map((r) => [r.email, r.acknowledgedAt !== null])).toEqual([
      [DEMO.users.fenwickContact.email, true],
      [CONTRACTOR, false],
    ]);
  });

  describe('signed links for an outside recipient', () => {
    const linkFor = async (item: 'sheet' | 'zip' | 'file') => {
      const mail = await smtp.waitFor((m) => m.to.includes(CONTRACTOR));
      const links = [...mail.text.matchAll(/http:\/\/127\.0\.0\.1:4310(\/api\/shared\/transmittals\/\S+)/g)].map(
        (m) => m[1],
      );
      if (item === 'file') return links.find((l) => !/\/(zip|sheet)\?/.test(l))!;
      return links.find((l) => l.includes(`/${item}?`))!;
    };

    it('downloads with the link from the e-mail, without signing in, and logs it', async () => {
      const anonymous = request(t.app);
      const file = await anonymous
        .get(await linkFor('file'))
        .buffer(true)
        .parse(binary);
      expect(file.status).toBe(200);
      expect(file.headers['content-type']).toBe('application/pdf');
      const zip = await anonymous
        .get(await linkFor('zip'))
        .buffer(true)
        .parse(binary);
      expect(zip.status).toBe(200);
      expect((await unzip(zip.body as Buffer)).size).toBe(4);
    });

    it('answers 403 saying why for a tampered link', async () => {
      const link = await linkFor('file');
      const later = link.replace(/e=(\d+)/, (_m, e) => `e=${Number(e) + 86_400 * 365}`);
      const res = await request(t.app).get(later);
      expect(res.status).toBe(403);
      expect(res.body.error.message).toContain('has been changed');
      const otherItem = link.replace(/\/transmittals\/([^/]+)\/[^?]+/, (_m, id) => `/transmittals/${id}/zip`);
      expect((await request(t.app).get(otherItem)).status).toBe(403);
    });

    it("answers 403 saying when it expired once the clock passes the expiry, in the firm's date format and zone", async () => {
      const link = await linkFor('sheet');
      expect((await request(t.app).get(link)).status).toBe(200);
      const expires = Number(/e=(\d+)/.exec(link)![1]) * 1000;
      const firm = await t.db('firms').where({ id: DEMO.firm.id }).first('time_zone');
      await t.db('firms').where({ id: DEMO.firm.id }).update({ time_zone: 'Asia/Kolkata' });
      const now = jest.spyOn(Date, 'now').mockReturnValue(expires + 1000);
      try {
        const res = await request(t.app).get(link);
        expect(res.status).toBe(403);
        // the hour and minute where the firm is, from Intl (India: UTC+5:30, IANA tz database)
        const hm = new Intl.DateTimeFormat('en-GB', {
          timeZone: 'Asia/Kolkata',
          hour: '2-digit',
          minute: '2-digit',
          hourCycle: 'h23',
        }).format(new Date(expires));
        expect(res.body.error.message).toMatch(
          new RegExp(`expired on \\d{1,2} [A-Z][a-z]{2} \\d{4}, ${hm} GMT\\+5:30\\.`),
        );
      } finally {
        now.mockRestore();
        await t.db('firms').where({ id: DEMO.firm.id }).update({ time_zone: firm.time_zone });
      }
    });

    it('records every download in the log the principal reads: who or which link, what, when, from where', async () => {
      const log = downloadLogSchema.parse(
        (await principal.get(`/api/projects/${kestrel}/transmittals/${issued.id}/downloads`)).body,
      );
      const viaLink = log.filter((l) => l.viaLink);
      expect(viaLink.map((l) => l.what).sort()).toEqual(['file', 'sheet', 'zip']);
      expect(viaLink.every((l) => l.who === CONTRACTOR && l.ip)).toBe(true);
      expect(log.some((l) => l.what === 'zip' && l.who.includes(DEMO.users.fenwickContact.email))).toBe(true);
      expect((await fenwick.get(`/api/projects/${kestrel}/transmittals/${issued.id}/downloads`)).status).toBe(403);
    });
  });
});
