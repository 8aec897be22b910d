import type TestAgent from 'supertest/lib/agent';
import {
  feeAgreementSchema,
  invoiceListSchema,
  invoiceSchema,
  receivablesSchema,
  type FeeAgreementWrite,
  type StageShares,
} from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { MAIL_QUEUE } from '../../apps/server/src/jobs';
import { createNotices } from '../../apps/server/src/notices/notices';
import { createLogger } from '../../apps/server/src/core/logger';
import { issueInvoice } from '../../apps/server/src/invoices/invoices.service';
import type { Caller } from '../../apps/server/src/access/policy';
import type { ObjectStore } from '../../apps/server/src/storage';
import { applyRate, splitFee } from '../../apps/server/src/invoices/money';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';

// pdf-parse 1.1.1's index runs a debug self-test when required directly; its library file does not.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const pdfParse = require('pdf-parse/lib/pdf-parse.js') as (b: Buffer) => Promise<{ text: string }>;

jest.setTimeout(60_000);

const SHARES: StageShares = {
  design_basis: 1000,
  column_layout: 2000,
  beam_framing: 2500,
  slab_panels: 2000,
  stairs: 500,
  foundations: 2000,
};

const agreement = (over: Partial<FeeAgreementWrite> = {}): FeeAgreementWrite => ({
  basis: 'lump_sum',
  lumpSumMinor: 4_800_000, // EUR 48 000.00
  currency: 'EUR',
  taxRateBp: 2000,
  taxLabel: 'VAT',
  paymentTermsDays: 30,
  billingContactId: DEMO.users.fenwickContact.id,
  stageShares: SHARES,
  ...over,
});

describe('money: rounding in integer minor units', () => {
  it('rounds a tax of exactly half a minor unit up, and a negative half away from zero', () => {
    // 5 cents at 10 % is 0.5 cent: half up gives 1 (common practice for invoice tax rounding).
    expect(applyRate(5, 1000)).toBe(1);
    expect(applyRate(4, 1000)).toBe(0);
    expect(applyRate(-5, 1000)).toBe(-1);
    // 1 234 567 cents at 20 % = 246 913.4 → 246 913
    expect(applyRate(1_234_567, 2000)).toBe(246_913);
  });

  it('keeps exact results beyond 2^53 intermediate products', () => {
    expect(applyRate(9_000_000_000_000, 9999)).toBe(8_999_100_000_000);
  });

  it('splits a fee over stages so the parts add up to the fee exactly', () => {
    const parts = splitFee(1001, [3333, 3333, 3334]);
    expect(parts.reduce((a, b) => a + b, 0)).toBe(1001);
    expect(parts).toEqual([334, 333, 334]);
  });
});

describe('fees and invoices through the API', () => {
  let t: TestApp;
  let principal: TestAgent;
  let client: TestAgent;
  let otherClient: TestAgent;
  let projectId: string;
  const base = () => `/api/projects/${projectId}`;
  const mails = async (template: string) =>
    (
      await t.db.raw(`select data from pgboss.job where name = ? and data->>'template' = ? order by created_on`, [
        MAIL_QUEUE,
        template,
      ])
    ).rows.map(
      (r: {
        data: { to: string[]; subject: string; attachments?: Array<{ filename: string; contentBase64: string }> };
      }) => r.data,
    );

  const newProject = async (reference: string, currency = 'EUR') => {
    const res = await send(principal, 'post', '/api/projects', {
      reference,
      name: `Fee test ${reference}`,
      clientOrganisationId: DEMO.clients.fenwick.id,
      storeys: 3,
      storeyHeightM: 3,
      currency,
      designBasis: {
        codeFamily: 'EN1992',
        concreteMPa: 30,
        steelMPa: 500,
        imposedKPa: 2,
        superimposedDeadKPa: 1,
        bearingPressureKPa: 150,
        foundingDepthM: 1,
      },
    });
    expect(res.status).toBe(201);
    await send(principal, 'put', `/api/projects/${res.body.id}/members/${DEMO.users.fenwickContact.id}`);
    return res.body.id as string;
  };

  const draft = async (lines: object[], pid = projectId) => {
    const res = await send(principal, 'post', `/api/projects/${pid}/invoices`, { lines });
    expect(res.status).toBe(201);
    return invoiceSchema.parse(res.body);
  };

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    principal = await signedInAs(t, DEMO.users.principal.email);
    client = await signedInAs(t, DEMO.users.fenwickContact.email);
    otherClient = await signedInAs(t, DEMO.users.harbourlightContact.email);
    projectId = await newProject('SQ-FEE-1');
  });
  afterAll(() => t.close());

  it('refuses stage shares that do not add up to exactly 100 %, naming the field', async () => {
    const res = await send(
      principal,
      'put',
      `${base()}/fee-agreement`,
      agreement({ stageShares: { ...SHARES, stairs: 499 } }),
    );
    expect(res.status).toBe(400);
    expect(res.body.error.fields['body.stageShares']).toEqual(['the stage shares must add up to exactly 100 %']);
  });

  it("refuses a billing contact who is not one of the project's client contacts", async () => {
    const res = await send(
      principal,
      'put',
      `${base()}/fee-agreement`,
      agreement({ billingContactId: DEMO.users.harbourlightContact.id }),
    );
    expect(res.status).toBe(400);
    expect(res.body.error.fields['body.billingContactId']).toBeDefined();
  });

  it('sets a lump-sum agreement and shows each stage its share of the fee', async () => {
    const res = await send(principal, 'put', `${base()}/fee-agreement`, agreement());
    expect(res.status).toBe(200);
    const a = feeAgreementSchema.parse(res.body);
    expect(a.originalFeeMinor).toBe(4_800_000);
    expect(a.currentFeeMinor).toBe(4_800_000);
    expect(a.stages.find((s) => s.stageKey === 'beam_framing')?.amountMinor).toBe(1_200_000);
    expect(a.editable).toBe(true);
  });

  it('computes a percentage fee from the estimated construction cost', async () => {
    const pid = await newProject('SQ-FEE-PCT');
    const res = await send(
      principal,
      'put',
      `/api/projects/${pid}/fee-agreement`,
      agreement({ basis: 'percentage', lumpSumMinor: null, percentageBp: 750, constructionCostMinor: 123_456_789 }),
    );
    // 123 456 789 × 7.5 % = 9 259 259.175 → 9 259 259
    expect(feeAgreementSchema.parse(res.body).originalFeeMinor).toBe(9_259_259);
  });

  it('offers a draft for the stage share when the principal approves a stage', async () => {
    await t
      .db('stages')
      .where({ project_id: projectId, key: 'design_basis' })
      .update({ state: 'under_review', assignee_id: DEMO.users.engineerA.id });
    const res = await send(principal, 'post', `${base()}/stages/design_basis/transitions`, { action: 'approve' });
    expect(res.status).toBe(200);
    const list = invoiceListSchema.parse((await principal.get(`${base()}/invoices`)).body);
    expect(list.items).toHaveLength(1);
    const inv = invoiceSchema.parse((await principal.get(`${base()}/invoices/${list.items[0].id}`)).body);
    expect(inv).toMatchObject({
      state: 'draft',
      number: null,
      stageKey: 'design_basis',
      subtotalMinor: 480_000,
      taxMinor: 96_000,
      totalMinor: 576_000,
    });
  });

  it('lets the principal add lines to a draft, and hides drafts from the client', async () => {
    const [{ id }] = await t.db('invoices').where({ project_id: projectId, stage_key: 'design_basis' });
    const res = await send(principal, 'put', `${base()}/invoices/${id}`, {
      lines: [
        { kind: 'stage_fee', description: 'Design basis', stageKey: 'design_basis', netMinor: 480_000 },
        { kind: 'expense', description: 'Site visit travel', netMinor: 5, taxRateBp: 1000 },
      ],
    });
    expect(res.status).toBe(200);
    const inv = invoiceSchema.parse(res.body);
    // The expense line's tax is exactly half a cent and rounds up on the line.
    expect(inv.lines[1]).toMatchObject({ netMinor: 5, taxMinor: 1, totalMinor: 6 });
    expect(inv.totalMinor).toBe(480_000 + 96_000 + 6);
    expect((await client.get(`${base()}/invoices/${id}`)).status).toBe(404);
    expect(invoiceListSchema.parse((await client.get('/api/invoices')).body).items.map((i) => i.id)).not.toContain(id);
  });

  it('issues a draft with the next number, a PDF with its text, and an e-mail with the PDF to the billing contact', async () => {
    const [{ id }] = await t.db('invoices').where({ project_id: projectId, stage_key: 'design_basis' });
    const res = await send(principal, 'post', `${base()}/invoices/${id}/issue`);
    expect(res.status).toBe(200);
    const inv = invoiceSchema.parse(res.body);
    const year = new Date().getUTCFullYear();
    expect(inv).toMatchObject({ state: 'issued', number: `INV-${year}-0001`, hasPdf: true, dueMinor: 576_006 });

    const pdf = await client
      .get(`${base()}/invoices/${id}/pdf`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(pdf.status).toBe(200);
    const text = (await pdfParse(pdf.body as Buffer)).text;
    expect(text).toContain(`Invoice INV-${year}-0001`);
    expect(text).toContain('Sable Quay Structural');
    expect(text).toContain('Fenwick Row Developments');
    expect(text).toContain('€5,760.06');
    expect(text).toContain('Site visit travel');
    expect(text).toMatch(/Due: \d{1,2} \w+ \d{4}/);
    expect(text).toContain(`bank transfer quoting INV-${year}-0001`);

    const [mail] = await mails('invoice-issued');
    expect(mail.to).toEqual([DEMO.users.fenwickContact.email]);
    expect(mail.attachments?.[0].filename).toBe(`INV-${year}-0001.pdf`);
    expect(Buffer.from(mail.attachments![0].contentBase64, 'base64').subarray(0, 5).toString()).toBe('%PDF-');
  });

  it('never edits or re-issues an issued invoice (409 saying why), and a fee change is then a variation', async () => {
    const [{ id }] = await t.db('invoices').where({ project_id: projectId, stage_key: 'design_basis' });
    const edit = await send(principal, 'put', `${base()}/invoices/${id}`, {
      lines: [{ kind: 'expense', description: 'x', netMinor: 1 }],
    });
    expect(edit.status).toBe(409);
    expect(edit.body.error.message).toMatch(/never edited.*credit note/);
    expect((await send(principal, 'post', `${base()}/invoices/${id}/issue`)).status).toBe(409);
    const change = await send(principal, 'put', `${base()}/fee-agreement`, agreement({ lumpSumMinor: 5_000_000 }));
    expect(change.status).toBe(409);
    expect(change.body.error.message).toMatch(/fee variation/);

    const v = await send(principal, 'post', `${base()}/fee-variations`, {
      amountMinor: 600_000,
      reason: 'Added a basement level at the client’s request',
      effectiveOn: '2026-11-30',
    });
    expect(v.status).toBe(201);
    const a = feeAgreementSchema.parse(v.body);
    expect(a).toMatchObject({ originalFeeMinor: 4_800_000, currentFeeMinor: 5_400_000, editable: false });
    expect(a.variations).toHaveLength(1);
    expect(a.stages.find((s) => s.stageKey === 'design_basis')).toMatchObject({
      amountMinor: 540_000,
      invoicedMinor: 480_000,
    });
  });

  it('records part-payments by bank transfer, refuses more than is owed, and marks the invoice paid at the end', async () => {
    const [{ id }] = await t.db('invoices').where({ project_id: projectId, stage_key: 'design_basis' });
    const pay = (amountMinor: number) =>
      send(principal, 'post', `${base()}/invoices/${id}/payments`, {
        amountMinor,
        receivedOn: '2026-12-01',
        reference: 'BT-7781',
      });
    const part = await pay(200_000);
    expect(part.status).toBe(201);
    expect(invoiceSchema.parse(part.body)).toMatchObject({ state: 'part_paid', paidMinor: 200_000, dueMinor: 376_006 });
    const over = await pay(376_007);
    expect(over.status).toBe(409);
    const rest = await pay(376_006);
    expect(invoiceSchema.parse(rest.body)).toMatchObject({ state: 'paid', dueMinor: 0 });
    expect((await pay(1)).status).toBe(409);
    const voided = await send(principal, 'post', `${base()}/invoices/${id}/void`, { reason: 'wrong client' });
    expect(voided.status).toBe(409);
    expect(voided.body.error.message).toMatch(/credit note/);
  });

  it('corrects an issued invoice with a credit note numbered in its own series', async () => {
    const inv = await draft([{ kind: 'additional_service', description: 'Extra site inspection', netMinor: 100_000 }]);
    const issued = invoiceSchema.parse((await send(principal, 'post', `${base()}/invoices/${inv.id}/issue`)).body);
    const year = new Date().getUTCFullYear();
    expect(issued.number).toBe(`INV-${year}-0002`);
    const res = await send(principal, 'post', `${base()}/invoices/${inv.id}/credit-notes`, {
      reason: 'Inspection charged twice',
      lines: [{ description: 'Extra site inspection (credited)', netMinor: 50_000, taxRateBp: 2000 }],
    });
    expect(res.status).toBe(201);
    const cn = invoiceSchema.parse(res.body);
    expect(cn).toMatchObject({
      kind: 'credit_note',
      number: `CN-${year}-0001`,
      totalMinor: 60_000,
      creditsInvoice: { id: inv.id },
    });
    const after = invoiceSchema.parse((await principal.get(`${base()}/invoices/${inv.id}`)).body);
    expect(after).toMatchObject({ creditedMinor: 60_000, dueMinor: 60_000, state: 'issued' });
    const tooMuch = await send(principal, 'post', `${base()}/invoices/${inv.id}/credit-notes`, {
      reason: 'again',
      lines: [{ description: 'too much', netMinor: 60_001 }],
    });
    expect(tooMuch.status).toBe(409);
  });

  it('voids an unpaid invoice with a reason; its number stays used', async () => {
    const inv = await draft([{ kind: 'expense', description: 'Printing', netMinor: 2_000 }]);
    const issued = invoiceSchema.parse((await send(principal, 'post', `${base()}/invoices/${inv.id}/issue`)).body);
    const res = await send(principal, 'post', `${base()}/invoices/${inv.id}/void`, {
      reason: 'Sent to the wrong project',
    });
    expect(invoiceSchema.parse(res.body)).toMatchObject({
      state: 'void',
      number: issued.number,
      voidReason: 'Sent to the wrong project',
    });
    const next = await draft([{ kind: 'expense', description: 'Printing', netMinor: 2_000 }]);
    const nextIssued = invoiceSchema.parse((await send(principal, 'post', `${base()}/invoices/${next.id}/issue`)).body);
    expect(Number(nextIssued.number!.slice(-4))).toBe(Number(issued.number!.slice(-4)) + 1);
  });

  it('bills a zero-decimal currency in whole units, tax rounded half up per line', async () => {
    const pid = await newProject('SQ-FEE-JPY', 'JPY');
    await send(
      principal,
      'put',
      `/api/projects/${pid}/fee-agreement`,
      agreement({ currency: 'JPY', lumpSumMinor: 3_000_000, taxRateBp: 1000, taxLabel: 'Consumption tax' }),
    );
    // ¥1 005 at 10 % = ¥100.5 → ¥101; ¥1 004 → ¥100.4 → ¥100.
    const inv = await draft(
      [
        { kind: 'expense', description: 'Courier', netMinor: 1_005 },
        { kind: 'expense', description: 'Copies', netMinor: 1_004 },
      ],
      pid,
    );
    expect(inv.lines.map((l) => l.taxMinor)).toEqual([101, 100]);
    expect(inv).toMatchObject({ currency: 'JPY', totalMinor: 2_210 });
    const issued = await send(principal, 'post', `/api/projects/${pid}/invoices/${inv.id}/issue`);
    expect(issued.status).toBe(200);
  });

  it('lists invoices across projects with server-side filter and sort, and shows receivables by age', async () => {
    const list = invoiceListSchema.parse(
      (await principal.get('/api/invoices?state=void&sort=number&direction=asc')).body,
    );
    expect(list.items.every((i) => i.state === 'void')).toBe(true);
    const search = invoiceListSchema.parse((await principal.get('/api/invoices?q=SQ-FEE-JPY')).body);
    expect(search.items.map((i) => i.project.reference)).toEqual(['SQ-FEE-JPY']);
    const overdueId = (
      await t
        .db('invoices')
        .where({ project_id: projectId, state: 'issued', kind: 'invoice', total_minor: 120_000 })
        .first('id')
    ).id;
    await t
      .db('invoices')
      .where({ id: overdueId })
      .update({ due_on: t.db.raw(`current_date - 45`) });
    const r = receivablesSchema.parse((await principal.get('/api/receivables')).body);
    const eur = r.rows.find((x) => x.currency === 'EUR')!;
    expect(eur.client.name).toBe('Fenwick Row Developments');
    expect(eur.bands.d31_60).toBe(60_000);
    expect((await client.get('/api/receivables')).status).toBe(403);
  });

  it("shows a client their organisation's issued invoices only; another client sees none of them", async () => {
    const mine = invoiceListSchema.parse((await client.get('/api/invoices')).body);
    expect(mine.items.length).toBeGreaterThan(0);
    expect(mine.items.every((i) => i.state !== 'draft' && i.client.id === DEMO.clients.fenwick.id)).toBe(true);
    const theirs = invoiceListSchema.parse((await otherClient.get('/api/invoices')).body);
    expect(theirs.items.some((i) => i.client.id === DEMO.clients.fenwick.id)).toBe(false);
    expect((await otherClient.get(`${base()}/invoices`)).status).toBe(404);
  });

  it('numbers invoices issued in parallel without gaps or duplicates, even when some issues roll back', async () => {
    const pid = await newProject('SQ-FEE-PAR');
    await send(principal, 'put', `/api/projects/${pid}/fee-agreement`, agreement());
    const drafts = [];
    for (let i = 0; i < 24; i++)
      drafts.push(await draft([{ kind: 'expense', description: `Item ${i}`, netMinor: 100 + i }], pid));
    // Every fourth PDF upload fails after the number was taken: those issues must roll back whole.
    let calls = 0;
    const flaky: ObjectStore = {
      ...t.store,
      putStream: async (key, body, opts) => {
        calls += 1;
        if (calls % 4 === 0) throw new Error('storage hiccup');
        return t.store.putStream(key, body, opts);
      },
    };
    const caller: Caller = {
      userId: DEMO.users.principal.id,
      firmId: DEMO.firm.id,
      email: DEMO.users.principal.email,
      displayName: DEMO.users.principal.name,
      role: 'principal',
      clientOrganisationId: null,
    };
    const notices = createNotices(t.jobs, 'http://127.0.0.1:4310', createLogger('silent'));
    const results = await Promise.allSettled(
      drafts.map((d) => issueInvoice({ db: t.db, notices, store: flaky }, caller, pid, d.id)),
    );
    const failed = results.filter((r) => r.status === 'rejected').length;
    expect(failed).toBe(6);
    expect(await t.db('invoices').where({ project_id: pid, state: 'draft' }).count('* as n')).toEqual([{ n: '6' }]);
    const seqs: number[] = await t
      .db('invoices')
      .where({ firm_id: DEMO.firm.id, series: 'invoice' })
      .orderBy('seq')
      .pluck('seq');
    expect(seqs).toEqual(seqs.map((_, i) => i + 1));
    expect(new Set(seqs).size).toBe(seqs.length);
  });
});

describe('overdue reminders', () => {
  let t: TestApp;
  let principal: TestAgent;
  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    principal = await signedInAs(t, DEMO.users.principal.email);
  });
  afterAll(() => t.close());

  it('sends each reminder step once per invoice as the clock moves, and none when switched off', async () => {
    const pid = DEMO.projects.kestrel.id;
    expect((await send(principal, 'put', `/api/projects/${pid}/fee-agreement`, agreement())).status).toBe(200);
    const ids: string[] = [];
    for (const netMinor of [10_000, 20_000]) {
      const d = await send(principal, 'post', `/api/projects/${pid}/invoices`, {
        lines: [{ kind: 'expense', description: 'Survey', netMinor }],
      });
      const issued = invoiceSchema.parse(
        (await send(principal, 'post', `/api/projects/${pid}/invoices/${d.body.id}/issue`)).body,
      );
      ids.push(issued.id);
    }
    await t.db('invoices').whereIn('id', ids).update({ due_on: '2027-01-10' });
    await send(principal, 'put', `/api/projects/${pid}/invoices/${ids[1]}/reminders`, { enabled: false });
    const { sendOverdueReminders } = await import('../../apps/server/src/invoices/reminders');
    const notices = createNotices(t.jobs, 'http://127.0.0.1:4310', createLogger('silent'));
    const run = (today: string) => sendOverdueReminders(t.db, notices, today, [7, 14, 30]);
    expect(await run('2027-01-12')).toBe(0); // 2 days late: no step reached yet
    expect(await run('2027-01-17')).toBe(1); // 7 days
    expect(await run('2027-01-18')).toBe(0); // still the 7-day step: already sent
    expect(await run('2027-01-24')).toBe(1); // 14 days
    expect(await run('2027-02-09')).toBe(1); // 30 days
    expect(await run('2027-02-09')).toBe(0);
    const sent = await t.db('invoice_reminders').orderBy('days_late').select('invoice_id', 'days_late');
    expect(sent).toEqual([7, 14, 30].map((d) => ({ invoice_id: ids[0], days_late: d })));
    const queued = (
      await t.db.raw(`select data from pgboss.job where name = ? and data->>'template' = 'invoice-overdue'`, [
        MAIL_QUEUE,
      ])
    ).rows;
    expect(queued).toHaveLength(3);
    expect(queued[0].data.to).toEqual([DEMO.users.fenwickContact.email]);
  });
});
