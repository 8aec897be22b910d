import type TestAgent from 'supertest/lib/agent';
import { activityListSchema, feeAgreementSchema, invoiceSchema, type FeeAgreementWrite } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';

jest.setTimeout(60_000);

const agreement = (over: Partial<FeeAgreementWrite> = {}): FeeAgreementWrite => ({
  basis: 'lump_sum',
  lumpSumMinor: 2_400_000, // EUR 24 000.00
  currency: 'EUR',
  taxRateBp: 2000,
  taxLabel: 'VAT',
  paymentTermsDays: 30,
  billingContactId: DEMO.users.fenwickContact.id,
  stageShares: {
    design_basis: 1000,
    column_layout: 2000,
    beam_framing: 2500,
    slab_panels: 2000,
    stairs: 500,
    foundations: 2000,
  },
  ...over,
});

describe('fee actions in the project activity log', () => {
  let t: TestApp;
  let principal: TestAgent;
  let client: TestAgent;
  let engineer: TestAgent;
  let projectId: string;
  const base = () => `/api/projects/${projectId}`;
  const entries = async (agent: TestAgent) => {
    const res = await agent.get(`${base()}/activity?pageSize=100`);
    expect(res.status).toBe(200);
    return activityListSchema.parse(res.body).items;
  };
  const draft = async (netMinor: number) => {
    const res = await send(principal, 'post', `${base()}/invoices`, {
      lines: [{ kind: 'additional_service', description: 'Extra site inspection', netMinor }],
    });
    expect(res.status).toBe(201);
    return invoiceSchema.parse(res.body);
  };

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    principal = await signedInAs(t, DEMO.users.principal.email);
    client = await signedInAs(t, DEMO.users.fenwickContact.email);
    engineer = await signedInAs(t, DEMO.users.engineerA.email);
    const res = await send(principal, 'post', '/api/projects', {
      reference: 'SQ-FEE-LOG',
      name: 'Fee log test',
      clientOrganisationId: DEMO.clients.fenwick.id,
      storeys: 3,
      storeyHeightM: 3,
      currency: 'EUR',
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
    projectId = res.body.id;
    for (const u of [DEMO.users.fenwickContact.id, DEMO.users.engineerA.id]) {
      expect((await send(principal, 'put', `${base()}/members/${u}`)).status).toBeLessThan(300);
    }

    // Every fee action once: set, change, vary, issue, pay by transfer, credit, void.
    expect((await send(principal, 'put', `${base()}/fee-agreement`, agreement())).status).toBe(200);
    expect(
      (await send(principal, 'put', `${base()}/fee-agreement`, agreement({ lumpSumMinor: 2_600_000 }))).status,
    ).toBe(200);
    const varied = await send(principal, 'post', `${base()}/fee-variations`, {
      amountMinor: -150_000,
      reason: 'Basement omitted by the client',
      effectiveOn: '2026-11-20',
    });
    expect(varied.status).toBe(201);
    expect(feeAgreementSchema.parse(varied.body).currentFeeMinor).toBe(2_450_000);

    const paid = await draft(100_000);
    expect((await send(principal, 'post', `${base()}/invoices/${paid.id}/issue`)).status).toBe(200);
    const transfer = await send(principal, 'post', `${base()}/invoices/${paid.id}/payments`, {
      amountMinor: 50_000,
      receivedOn: '2026-11-25',
      reference: 'TRF-0091',
    });
    expect(transfer.status).toBe(201);
    const credit = await send(principal, 'post', `${base()}/invoices/${paid.id}/credit-notes`, {
      reason: 'Inspection shortened to half a day',
      lines: [{ description: 'Half a day less on site', netMinor: 10_000, taxRateBp: 2000 }], // 100.00 + 20 % = 120.00
    });
    expect(credit.status).toBe(201);
    const dropped = await draft(5_000);
    expect(
      (await send(principal, 'post', `${base()}/invoices/${dropped.id}/void`, { reason: 'Raised twice' })).status,
    ).toBe(200);
  });
  afterAll(() => t.close());

  const FEE_ACTIONS = [
    'fee_agreement.set',
    'fee_agreement.changed',
    'fee_agreement.variation',
    'invoice.issued',
    'payment.recorded',
    'invoice.credited',
    'invoice.voided',
  ];

  it('shows the principal each fee action with what changed, in words and amounts', async () => {
    const items = await entries(principal);
    const fee = items.filter((e) => ['fee_agreement', 'invoice', 'payment'].includes(e.objectType));
    expect(fee.map((e) => e.action).sort()).toEqual([...FEE_ACTIONS].sort());
    const said = (action: string) => fee.find((e) => e.action === action)!;
    expect(said('fee_agreement.set').summary).toBe('Fee agreement set: lump sum €24,000.00');
    expect(said('fee_agreement.changed').summary).toBe('Fee agreement changed: lump sum €26,000.00');
    expect(said('fee_agreement.variation').summary).toBe('Fee variation −€1,500.00: Basement omitted by the client');
    expect(said('invoice.issued').summary).toMatch(/^Invoice INV-\d{4}-\d{4} issued for €1,200\.00, due /);
    expect(said('payment.recorded').summary).toMatch(/^€500\.00 received by bank transfer on invoice INV-/);
    expect(said('invoice.credited').summary).toMatch(/^Credit note CN-\d{4}-\d{4} for €120\.00 against invoice INV-/);
    expect(said('invoice.voided').summary).toBe('A draft invoice voided: Raised twice');
    for (const e of fee) expect(e.actor?.id).toBe(DEMO.users.principal.id);
  });

  it("shows the project's client the same fee entries", async () => {
    const items = await entries(client);
    expect(
      items
        .filter((e) => FEE_ACTIONS.includes(e.action))
        .map((e) => e.action)
        .sort(),
    ).toEqual([...FEE_ACTIONS].sort());
  });

  it('hides every fee entry from an engineer on the project, even when asked for by type', async () => {
    const items = await entries(engineer);
    expect(items.length).toBeGreaterThan(0); // the project's own entries are there
    expect(items.filter((e) => ['fee_agreement', 'invoice', 'payment'].includes(e.objectType))).toEqual([]);
    const asked = await engineer.get(`${base()}/activity?objectType=invoice`);
    expect(activityListSchema.parse(asked.body).items).toEqual([]);
  });

  it('leaves no entry behind when the action is refused', async () => {
    const before = (await entries(principal)).length;
    const refused = await send(principal, 'post', `${base()}/fee-variations`, {
      amountMinor: -99_000_000,
      reason: 'More than the whole fee',
      effectiveOn: '2026-11-30',
    });
    expect(refused.status).toBe(409);
    expect((await entries(principal)).length).toBe(before);
  });
});
