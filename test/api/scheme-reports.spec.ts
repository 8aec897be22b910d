import { createHash } from 'node:crypto';
import type TestAgent from 'supertest/lib/agent';
import type { Response } from 'supertest';
import {
  drawingSchema,
  planSheetRegisteredSchema,
  schemeReportSchema,
  schemeVersionSchema,
  type SchemeReport,
  type SchemeVersion,
} from '@trabeate/contracts';
import { CAUTION, ENGINE_VERSION, type SchemeResult } from '@trabeate/structural';
import { DEMO } from '../../seeds/demo';
import { DEMO_FOOTING_CHOICE, DEMO_SCHEMES } from '../../seeds/demo-schemes';
import { PRINT_COLOURS, printable } from '../../apps/server/src/look/print-look';
import { FOOTING_OPTION_LABELS } from '@trabeate/contracts';
import { DEMO_DRAWINGS } from '../../seeds/demo-drawings';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs, until } from '../support/agents';

// pdf-parse 1.1.1's index runs a debug self-test when required directly; its library file does not.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const pdfParse = require('pdf-parse/lib/pdf-parse.js') as (
  b: Buffer,
  options?: {
    pagerender?: (page: { getTextContent: () => Promise<{ items: { str: string }[] }> }) => Promise<string>;
  },
) => Promise<{ text: string; numpages: number }>;

jest.setTimeout(90_000);

const KESTREL = DEMO.projects.kestrel.id;
const schemes = `/api/projects/${KESTREL}/schemes`;
const at = (schemeId: string, version = 1) => `${schemes}/${schemeId}/versions/${version}`;

const binary = (req: ReturnType<TestAgent['get']>) =>
  req.buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });

// Text extraction joins words differently from how they were laid out: compare without whitespace.
const squash = (s: string) => s.replace(/\s+/g, '');

/** The text of each page, in page order (pdf-parse renders pages one after another). */
async function pageTexts(pdf: Buffer): Promise<string[]> {
  const pages: string[] = [];
  await pdfParse(pdf, {
    pagerender: async (page) => {
      const content = await page.getTextContent();
      const text = content.items.map((i) => i.str).join(' ');
      pages.push(text);
      return text;
    },
  });
  return pages;
}

// The words the report must give each kind of source (the brief: every check names its source and
// whether it is a design code or common practice).
const KIND_IN_WORDS: Record<string, string> = {
  code: 'design code',
  practice: 'common practice',
  memory: 'from memory',
  derived: 'derived',
  project: 'set for this project',
};
const f0 = (v: number) => v.toFixed(0);
const f2 = (v: number) => v.toFixed(2);

describe('scheme outputs: calculation report, plan sheet, registering the sheet', () => {
  let t: TestApp;
  let engineer: TestAgent;
  let principal: TestAgent;
  let client: TestAgent;
  let outsider: TestAgent;
  const stored: Record<string, SchemeVersion> = {};

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    engineer = await signedInAs(t, DEMO.users.engineerA.email);
    principal = await signedInAs(t, DEMO.users.principal.email);
    client = await signedInAs(t, DEMO.users.fenwickContact.email);
    outsider = await signedInAs(t, DEMO.users.engineerB.email);
    for (const s of [DEMO_SCHEMES.full, DEMO_SCHEMES.fewer])
      stored[s.id] = schemeVersionSchema.parse((await principal.get(at(s.id))).body);
  });
  afterAll(() => t.close());

  async function finished(agent: TestAgent, created: Response): Promise<SchemeReport> {
    expect(created.status).toBe(202);
    const report = schemeReportSchema.parse(created.body);
    expect(report.state).toBe('queued');
    let last = report;
    await until(
      'the report job',
      async () => {
        last = schemeReportSchema.parse((await agent.get(`/api/projects/${KESTREL}/scheme-reports/${report.id}`)).body);
        return last.state === 'done' || last.state === 'failed';
        // a deadline for a loaded shared machine, not a speed check (bench figures are printed elsewhere)
      },
      120_000,
    );
    return last;
  }

  async function reportText(agent: TestAgent, report: SchemeReport) {
    const file = await binary(agent.get(`/api/projects/${KESTREL}/scheme-reports/${report.id}/file`));
    expect(file.status).toBe(200);
    expect(file.headers['content-type']).toBe('application/pdf');
    const pdf = file.body as Buffer;
    return { ...(await pdfParse(pdf)), pdf };
  }

  it.each([
    ['A (full grid)', DEMO_SCHEMES.full],
    ['B (one column fewer)', DEMO_SCHEMES.fewer],
  ])(
    "writes scheme %s's report through the job queue from its stored results, with the caution and footer on every page",
    async (_name, scheme) => {
      const report = await finished(engineer, await send(engineer, 'post', `${at(scheme.id)}/reports`, {}));
      expect(report).toMatchObject({ state: 'done', failure: null, progress: { done: 8, total: 8 } });
      const { text, numpages, pdf } = await reportText(engineer, report);
      expect(numpages).toBe(report.pages);
      const flat = squash(text);
      const v = stored[scheme.id];
      const results = v.results as unknown as SchemeResult;
      const b = v.document.basis;
      // design basis as saved (Kestrel Yard's: EN 1992, 30 MPa, 180 kPa, 7 storeys of 3.1 m), each
      // value beside its label and with its unit
      expect(text).toContain('EN1992');
      for (const [label, value] of [
        ['Concrete strength', `${b.concreteMPa} MPa`],
        ['Reinforcement yield strength', `${b.steelMPa} MPa`],
        ['Imposed load, floors', `${b.imposedKPa} kPa`],
        ['Superimposed dead load', `${b.superimposedDeadKPa} kPa`],
        ['Wall load on beams', `${b.wallLoadKNPerM} kN/m`],
        ['Allowable bearing pressure', `${b.bearingPressureKPa} kPa`],
        ['Founding depth', `${b.foundingDepthM} m`],
        ['Storeys × storey height', `${b.storeys} × ${b.storeyHeightM} m`],
        ['Beam width', `${b.beamWidthMm} mm`],
      ])
        expect(flat).toContain(squash(`${label} ${value}`));
      // a failing check in full: rule, severity, finding, value against limit, source and its kind
      const failing = v.results.checks[0];
      expect(failing).toBeDefined();
      const source = printable(failing.source);
      const kind = KIND_IN_WORDS[failing.sourceKind];
      const sourced = source.toLowerCase().includes(kind) ? source : `${source} (${kind})`;
      expect(flat).toContain(squash(`${failing.ruleId} ${failing.severity} ${printable(failing.message)}`));
      expect(flat).toContain(
        squash(
          `${failing.value.toFixed(1)} ${failing.unit}, ${failing.sense === 'max' ? 'at most' : 'at least'} ${failing.limit.toFixed(1)} ${sourced}`,
        ),
      );
      // schedules: a full row of each, from the stored results
      expect(flat).toContain('Columnschedule');
      expect(flat).toContain('Beamschedule');
      expect(flat).toContain('Footingschedule');
      for (const c of v.document.columns) expect(text).toContain(c.label);
      const col = v.document.columns[0];
      const load = results.loads.columns.find((l) => l.columnId === col.id)!;
      const size = results.sizes.columns.find((l) => l.columnId === col.id)!;
      expect(flat).toContain(
        squash(
          `${col.label} ${f2(col.x)}, ${f2(col.y)} ${col.widthMm} × ${col.depthMm}${col.orientationDeg === 90 ? ' (turned)' : ''} ${f0(load.factoredKN[0])} ${f0(size.providedCapacityKN)} ${f2(size.utilisation[0])} ${f0(size.requiredSideMm[0])}`,
        ),
      );
      const beam = results.sizes.beams[0];
      expect(flat).toContain(
        squash(
          `${beam.memberId} ${f2(beam.spanM)} ${beam.condition} ${f0(beam.widthMm)} ${beam.designMomentKNm.toFixed(1)} ${f0(beam.fromSpanDepthMm)}, ${f0(beam.fromMomentMm)} ${f0(beam.adoptedDepthMm)} ${beam.governs}`,
        ),
      );
      const pad = results.sizes.footings[0];
      const padColumn = v.document.columns.find((c) => c.id === pad.columnId)!;
      expect(flat).toContain(
        squash(
          `${padColumn.label} ${f0(pad.serviceKN)} ${f2(pad.areaM2)} ${f2(pad.adoptedSideM)} ${f2(pad.thicknessM)} ${f0(pad.factoredPressureKPa)}`,
        ),
      );
      expect(flat).toContain(squash(`engine ${ENGINE_VERSION}`));
      // the caution and the footer (project, scheme, version, page n of m) on every page, each page read alone
      const pages = await pageTexts(pdf);
      expect(pages).toHaveLength(numpages);
      const row = await t.db('projects').where({ id: KESTREL }).first('reference', 'name');
      const project = `${row.reference} ${row.name}`;
      pages.forEach((page, i) => {
        const onPage = squash(page);
        expect(onPage).toContain(squash(`PRELIMINARY. ${CAUTION}`));
        expect(onPage).toContain(squash(`${project} · ${scheme.name} · version 1 · page ${i + 1} of ${numpages}`));
      });
      // the beam lines are drawn from the engine's envelope diagram, not the simplified fallback
      expect(flat).toContain('Envelopesofthefactoredloadarrangements');
      expect(flat).not.toContain('(simplifieddiagram)');
      // the recorded footing choice with its reason, in words (scheme A records one for D4)
      const choices = v.document.footingChoices ?? [];
      if (scheme.id === DEMO_SCHEMES.full.id) expect(choices).toEqual([DEMO_FOOTING_CHOICE]);
      for (const c of choices) {
        expect(flat).toContain(squash(`Chosen: ${FOOTING_OPTION_LABELS[c.option]}.`));
        expect(flat).toContain(squash(c.reason).slice(0, 60));
      }
      // the shipped face has no Greek letters: the engine's symbols and our own notes' are spelled
      // out, never dropped (the footing note's plan-area rule uses alpha)
      expect(flat).toContain(squash('(1 + alpha)·P / qa'));
      expect(text).not.toMatch(/[\u0370-\u03ff\u2200-\u2211\u2213-\u22ff]/u);
    },
  );

  it('files the finished report on the stage named, as a deliverable of the requester', async () => {
    const report = await finished(
      engineer,
      await send(engineer, 'post', `${at(DEMO_SCHEMES.full.id)}/reports`, { stageKey: 'beam_framing' }),
    );
    expect(report).toMatchObject({ state: 'done', stageKey: 'beam_framing', failure: null });
    const row = await t.db('deliverables').where({ id: report.deliverableId }).first();
    expect(row).toMatchObject({
      stage_key: 'beam_framing',
      uploaded_by: DEMO.users.engineerA.id,
      content_type: 'application/pdf',
    });
  });

  it('refuses a report of a version that does not exist with 404, before queueing anything', async () => {
    const before = await t.db('scheme_reports').count<{ n: string }[]>('* as n');
    expect((await send(engineer, 'post', `${at(DEMO_SCHEMES.full.id, 99)}/reports`, {})).status).toBe(404);
    expect(await t.db('scheme_reports').count<{ n: string }[]>('* as n')).toEqual(before);
  });

  it('draws the plan sheet with grid, columns, property lines and our title panel, as PDF and as SVG', async () => {
    const v = stored[DEMO_SCHEMES.full.id];
    const pdf = await binary(principal.get(`${at(DEMO_SCHEMES.full.id)}/sheet.pdf?size=A3&scale=200`));
    expect(pdf.status).toBe(200);
    const { text, numpages } = await pdfParse(pdf.body as Buffer);
    expect(numpages).toBe(1);
    const flat = squash(text);
    for (const c of v.document.columns) expect(text).toContain(c.label);
    for (const g of v.document.grid) expect(text).toContain(g.label);
    for (const field of ['Drawingnumber', 'Revision', 'Suitability', 'Scale', 'Drawn', 'Checked', 'Approved', 'Date'])
      expect(flat).toContain(field);
    expect(flat).toContain('1:200atA3');
    expect(flat).toContain('PROPERTYLINE');
    expect(flat).toContain(DEMO.projects.kestrel.reference);
    expect(flat).toContain(squash(CAUTION.slice(0, 50)));

    const svg = await binary(principal.get(`${at(DEMO_SCHEMES.full.id)}/sheet.svg?size=A3&scale=200`));
    expect(svg.status).toBe(200);
    expect(svg.headers['content-type']).toMatch(/^image\/svg\+xml/);
    const body = (svg.body as Buffer).toString('utf8');
    // same geometry: one filled rectangle per column in both
    const columnShapes = (body.match(/<polygon [^>]*fill="#1d2427" stroke="#1d2427" stroke-width="0.35"/g) ?? [])
      .length;
    expect(columnShapes).toBe(v.document.columns.length);
    expect(body).toContain('>PROPERTY LINE<');
  });

  it('draws the footing the engineer chose at a property line instead of the plain pad, labelled, in the SVG and the PDF', async () => {
    // Scheme A records a strap for D4 (tied to C4); scheme B records no choice.
    const v = stored[DEMO_SCHEMES.full.id];
    // the stored results as the engine wrote them (the contract leaves their inner shapes open)
    const results = v.results as unknown as SchemeResult;
    const option = results.footings.boundary.find((o) => o.columnId === DEMO_FOOTING_CHOICE.columnId)!;
    expect(option.interiorColumnId).toBe('C4');
    const strap = option.strap!;
    const k = 1000 / 200; // sheet mm per plan m at 1:200
    const svgOf = async (schemeId: string) =>
      ((await binary(principal.get(`${at(schemeId)}/sheet.svg?size=A3&scale=200`))).body as Buffer).toString('utf8');
    const boxes = (svg: string, attrs: RegExp) =>
      [...svg.matchAll(/<polygon points="([^"]+)"([^>]*)\/>/g)]
        .filter((m) => attrs.test(m[2]))
        .map((m) => {
          const pts = m[1].split(' ').map((p) => p.split(',').map(Number));
          const xs = pts.map((p) => p[0]);
          const ys = pts.map((p) => p[1]);
          return { x0: Math.min(...xs), x1: Math.max(...xs), y0: Math.min(...ys), y1: Math.max(...ys) };
        });
    const chosenStyle = new RegExp(`stroke="${PRINT_COLOURS.accent}" stroke-width="0.35" stroke-dasharray="2 1"`);
    const padStyle = new RegExp(`stroke="${PRINT_COLOURS.ink}" stroke-width="0.25" stroke-dasharray="2 1"`);

    const svg = await svgOf(DEMO_SCHEMES.full.id);
    const chosen = boxes(svg, chosenStyle);
    // exterior pad, strap and interior pad
    expect(chosen).toHaveLength(3);
    const size = (b: (typeof chosen)[number]) => [b.x1 - b.x0, b.y1 - b.y0].sort((a, b) => a - b);
    const close = (a: number, b: number) => Math.abs(a - b) < 0.05;
    const exterior = chosen.find((b) => {
      const [short, long] = size(b);
      const want = [strap.exteriorLengthM * k, strap.exteriorWidthM * k].sort((a, b) => a - b);
      return close(short, want[0]) && close(long, want[1]);
    });
    expect(exterior).toBeDefined();
    expect(chosen.some((b) => size(b).every((side) => close(side, strap.interiorSideM * k)))).toBe(true);
    // The exterior pad of a strap footing sits against the property line (the point of the
    // option: common practice, no source): one of its edges lies on the line D4 faces.
    const lines = [
      ...svg.matchAll(
        new RegExp(
          `<line x1="([\\d.]+)" y1="([\\d.]+)" x2="([\\d.]+)" y2="([\\d.]+)" stroke="${PRINT_COLOURS.accent}" stroke-width="0.7"`,
          'g',
        ),
      ),
    ].map((m) => m.slice(1, 5).map(Number));
    const onLine = lines.some(
      ([x1, , x2]) => (close(x1, x2) && close(x1, exterior!.x0)) || (close(x1, x2) && close(x1, exterior!.x1)),
    );
    const onRow = lines.some(
      ([, y1, , y2]) => (close(y1, y2) && close(y1, exterior!.y0)) || (close(y1, y2) && close(y1, exterior!.y1)),
    );
    expect(onLine || onRow).toBe(true);
    // D4's and C4's plain pads give way to the chosen footing; every other column keeps its own
    const pads = results.sizes.footings.filter((f) => f.adoptedSideM > 0).length;
    expect(boxes(svg, padStyle)).toHaveLength(pads - 2);
    expect(svg).toContain('>D4: Strap to an interior column (chosen)<');
    // the words sit below the outlines they name, not across them
    const labelY = Number(/<text x="[\d.]+" y="([\d.]+)"[^>]*>D4: Strap/.exec(svg)![1]);
    expect(labelY).toBeGreaterThan(Math.max(...chosen.map((b) => b.y1)));

    // scheme B: no choice recorded, so only the plain pads
    const plain = await svgOf(DEMO_SCHEMES.fewer.id);
    expect(boxes(plain, chosenStyle)).toHaveLength(0);
    expect(plain).not.toContain('(chosen)');

    const pdf = await binary(principal.get(`${at(DEMO_SCHEMES.full.id)}/sheet.pdf?size=A3&scale=200`));
    expect(squash((await pdfParse(pdf.body as Buffer)).text)).toContain(
      squash('D4: Strap to an interior column (chosen)'),
    );
  });

  it('refuses a scale at which the plan does not fit the sheet, naming the smallest that fits', async () => {
    const res = await principal.get(`${at(DEMO_SCHEMES.full.id)}/sheet.pdf?size=A4&scale=50`);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/smallest scale that fits is 1:(\d+)/);
    const smallest = Number(/1:(\d+)\.$/.exec(res.body.error.message)![1]);
    expect(smallest).toBeGreaterThan(50);
    expect((await principal.get(`${at(DEMO_SCHEMES.full.id)}/sheet.svg?size=A4&scale=${smallest}`)).status).toBe(200);
    // and a scale that is not on the list is a plain 400
    expect((await principal.get(`${at(DEMO_SCHEMES.full.id)}/sheet.svg?size=A3&scale=123`)).status).toBe(400);
  });

  it('registers the sheet as a new draft revision of a drawing, recording the scheme version, then it follows check and approve', async () => {
    const res = await send(engineer, 'post', `${at(DEMO_SCHEMES.fewer.id)}/sheet/revisions`, {
      size: 'A3',
      scale: 200,
      drawingId: DEMO_DRAWINGS.columns.id,
      suitability: 'S3',
      purpose: 'comment',
    });
    expect(res.status).toBe(201);
    const out = planSheetRegisteredSchema.parse(res.body);
    expect(out).toMatchObject({ drawingNumber: 'S-002', version: 1, schemeId: DEMO_SCHEMES.fewer.id });
    expect(out.revision).toMatchObject({ code: 'P02', state: 'draft', suitability: 'S3' });
    expect(out.revision.files).toEqual([expect.objectContaining({ role: 'pdf' })]);
    const row = await t.db('drawing_revisions').where({ id: out.revision.id }).first();
    expect(row).toMatchObject({ scheme_id: DEMO_SCHEMES.fewer.id, scheme_version: 1 });
    // the description and the reply name the scheme and the version the sheet came from
    const origin = `Column layout from scheme ${DEMO_SCHEMES.fewer.name}, version 1`;
    expect(out.revision.description).toBe(origin);
    expect(out.revision.fromScheme).toEqual({ id: DEMO_SCHEMES.fewer.id, name: DEMO_SCHEMES.fewer.name, version: 1 });
    // and so does the register's own reply, where a revision uploaded by hand has none
    const drawing = drawingSchema.parse(
      (await principal.get(`/api/projects/${KESTREL}/drawings/${out.drawingId}`)).body,
    );
    const [sheetRevision, ...older] = drawing.revisions;
    expect(sheetRevision).toMatchObject({ id: out.revision.id, description: origin });
    expect(sheetRevision.fromScheme).toEqual({
      id: DEMO_SCHEMES.fewer.id,
      name: DEMO_SCHEMES.fewer.name,
      version: 1,
    });
    expect(older.length).toBeGreaterThan(0);
    for (const r of older) expect(r.fromScheme).toBeNull();
    // the stored PDF carries the drawing number and revision in its title panel
    const file = await binary(
      principal.get(`/api/projects/${KESTREL}/revisions/${out.revision.id}/files/${out.revision.files[0].id}/download`),
    );
    expect(file.status).toBe(200);
    const flat = squash((await pdfParse(file.body as Buffer)).text);
    expect(flat).toContain('S-002');
    expect(flat).toContain('P02');
    // a second sheet while this draft is open is refused, as for any revision
    const again = await send(engineer, 'post', `${at(DEMO_SCHEMES.fewer.id)}/sheet/revisions`, {
      size: 'A3',
      scale: 200,
      drawingId: DEMO_DRAWINGS.columns.id,
    });
    expect(again.status).toBe(409);
    // the register's own flow takes it on
    const checked = await send(principal, 'post', `/api/projects/${KESTREL}/revisions/${out.revision.id}/transitions`, {
      action: 'check',
    });
    expect([200, 201]).toContain(checked.status);
    // Once out, a client contact sees the revision but not the scheme behind it (schemes are the firm's).
    const approved = await send(
      principal,
      'post',
      `/api/projects/${KESTREL}/revisions/${out.revision.id}/transitions`,
      {
        action: 'approve',
      },
    );
    expect(approved.status).toBe(200);
    await t
      .db('drawing_revisions')
      .where({ id: out.revision.id })
      .update({ state: 'issued', issued_at: t.db.fn.now() });
    const seenByClient = drawingSchema
      .parse((await client.get(`/api/projects/${KESTREL}/drawings/${out.drawingId}`)).body)
      .revisions.find((r) => r.id === out.revision.id);
    expect(seenByClient).toMatchObject({ state: 'issued', fromScheme: null });
  });

  it("registers the sheet on a new drawing with the register's next number", async () => {
    const proposed = (await principal.get(`/api/projects/${KESTREL}/drawings/next-number`)).body;
    const res = await send(principal, 'post', `${at(DEMO_SCHEMES.full.id)}/sheet/revisions`, {
      size: 'A2',
      scale: 100,
      newDrawing: { title: 'Column layout, scheme A', stageKey: 'column_layout' },
      description: 'First layout for the architect.',
    });
    expect(res.status).toBe(201);
    const out = planSheetRegisteredSchema.parse(res.body);
    if (proposed?.number) expect(out.drawingNumber).toBe(proposed.number);
    expect(out.revision.description).toBe(
      `First layout for the architect. Column layout from scheme ${DEMO_SCHEMES.full.name}, version 1`,
    );
    expect(out.revision).toMatchObject({ code: 'P01', state: 'draft' });
    const drawing = await t.db('drawings').where({ id: out.drawingId }).first();
    expect(drawing).toMatchObject({ sheet_size: 'A2', scale: '1:100', stage_key: 'column_layout' });
  });

  it("the stored sheet's title panel carries the register's checker and approver once the revision is checked and approved", async () => {
    const res = await send(principal, 'post', `${at(DEMO_SCHEMES.full.id)}/sheet/revisions`, {
      size: 'A3',
      scale: 200,
      newDrawing: { title: 'Column layout for checking', stageKey: 'column_layout' },
    });
    expect(res.status).toBe(201);
    const { revision } = planSheetRegisteredSchema.parse(res.body);
    const stored = async () => {
      const r = drawingSchema
        .parse((await principal.get(`/api/projects/${KESTREL}/drawings/${revision.drawingId}`)).body)
        .revisions.find((x) => x.id === revision.id)!;
      const [pdf] = r.files;
      const file = await binary(principal.get(pdf.downloadUrl));
      expect(file.status).toBe(200);
      const bytes = file.body as Buffer;
      // the register's SHA-256 is the file's own: the file was replaced, not altered behind the register
      expect(createHash('sha256').update(bytes).digest('hex')).toBe(pdf.sha256);
      return { revision: r, flat: squash((await pdfParse(bytes)).text) };
    };
    const principalName = squash(DEMO.users.principal.name);
    const checkerName = squash(DEMO.users.engineerA.name);
    const registered = await stored();
    expect(registered.flat).toContain(`Drawn${principalName}`);
    expect(registered.flat).toContain('Checked—Approved—');

    const checked = await send(engineer, 'post', `/api/projects/${KESTREL}/revisions/${revision.id}/transitions`, {
      action: 'check',
    });
    expect(checked.status).toBe(200);
    const afterCheck = await stored();
    expect(afterCheck.revision.checkedBy?.displayName).toBe(DEMO.users.engineerA.name);
    expect(afterCheck.flat).toContain(`Drawn${principalName}Checked${checkerName}Approved—`);
    expect(afterCheck.revision.files[0].sha256).not.toBe(registered.revision.files[0].sha256);
    expect(Date.parse(afterCheck.revision.files[0].uploadedAt)).toBeGreaterThan(
      Date.parse(registered.revision.files[0].uploadedAt),
    );

    const approved = await send(principal, 'post', `/api/projects/${KESTREL}/revisions/${revision.id}/transitions`, {
      action: 'approve',
    });
    expect(approved.status).toBe(200);
    const afterApproval = await stored();
    expect(afterApproval.flat).toContain(`Drawn${principalName}Checked${checkerName}Approved${principalName}`);
    // the same sheet otherwise: its number, revision and scheme
    expect(afterApproval.flat).toContain(squash(`${revision.code}`));
    expect(afterApproval.flat).toContain(squash(`${DEMO_SCHEMES.full.name}, version 1`));
    // one PDF on the revision, the replaced objects gone from the register
    expect(await t.db('revision_files').where({ revision_id: revision.id })).toHaveLength(1);
  });

  it('refuses to check a plan sheet while file storage is down (503), leaving the draft and its PDF as they were', async () => {
    const res = await send(principal, 'post', `${at(DEMO_SCHEMES.fewer.id)}/sheet/revisions`, {
      size: 'A3',
      scale: 200,
      newDrawing: { title: 'Column layout, storage outage', stageKey: 'column_layout' },
    });
    expect(res.status).toBe(201);
    const { revision } = planSheetRegisteredSchema.parse(res.body);
    const before = await t.db('revision_files').where({ revision_id: revision.id }).first();
    await t.s3.halt();
    try {
      const refused = await send(engineer, 'post', `/api/projects/${KESTREL}/revisions/${revision.id}/transitions`, {
        action: 'check',
      });
      expect(refused.status).toBe(503);
    } finally {
      await t.s3.resume();
    }
    expect(await t.db('drawing_revisions').where({ id: revision.id }).first()).toMatchObject({
      state: 'draft',
      checked_by: null,
    });
    expect(await t.db('revision_files').where({ revision_id: revision.id }).first()).toEqual(before);
  });

  it('refuses registering at a scale that does not fit, creating no drawing', async () => {
    const before = await t.db('drawings').where({ project_id: KESTREL }).count<{ n: string }[]>('* as n');
    const res = await send(engineer, 'post', `${at(DEMO_SCHEMES.full.id)}/sheet/revisions`, {
      size: 'A4',
      scale: 20,
      newDrawing: { title: 'Too large', stageKey: 'column_layout' },
    });
    expect(res.status).toBe(400);
    expect(await t.db('drawings').where({ project_id: KESTREL }).count<{ n: string }[]>('* as n')).toEqual(before);
  });

  it('keeps every output from clients and from engineers off the project', async () => {
    for (const agent of [client, outsider]) {
      const sheet = await agent.get(`${at(DEMO_SCHEMES.full.id)}/sheet.svg`);
      expect([403, 404]).toContain(sheet.status);
      const report = await send(agent, 'post', `${at(DEMO_SCHEMES.full.id)}/reports`, {});
      expect([403, 404]).toContain(report.status);
    }
    expect((await client.get(`${at(DEMO_SCHEMES.full.id)}/sheet.svg`)).status).toBe(403);
    expect((await outsider.get(`${at(DEMO_SCHEMES.full.id)}/sheet.svg`)).status).toBe(404);
  });
});
