import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import { checkoutOutcomeSchema, checkoutStartSchema, invoiceSchema, type StageShares } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { MAIL_QUEUE } from '../../apps/server/src/jobs';
import { FAKE_STRIPE_KEYS, type FakeStripe } from '../../scripts/fakes/stripe';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';
import { startFakeStripe, TEST_CARDS } from '../support/fakes';

jest.setTimeout(60_000);

const SHARES: StageShares = {
  design_basis: 1000,
  column_layout: 2000,
  beam_framing: 2500,
  slab_panels: 2000,
  stairs: 500,
  foundations: 2000,
};

describe('paying an invoice by card through the payments fake', () => {
  let fake: FakeStripe;
  let t: TestApp;
  let server: Server;
  let principal: TestAgent;
  let client: TestAgent;
  let otherClient: TestAgent;
  let projectId: string;
  const base = () => `/api/projects/${projectId}`;

  type QueuedMail = { to: string[]; subject: string; text: string };
  const mails = async (template: string): Promise<QueuedMail[]> =>
    (
      await t.db.raw(`select data from pgboss.job where name = ? and data->>'template' = ? order by created_on`, [
        MAIL_QUEUE,
        template,
      ])
    ).rows.map((r: { data: QueuedMail }) => r.data);

  /** An issued invoice of `netMinor` (plus 20 % tax) on the test project. */
  const issued = async (netMinor: number) => {
    const draft = await send(principal, 'post', `${base()}/invoices`, {
      lines: [{ kind: 'additional_service', description: 'Retaining wall check', netMinor }],
    });
    expect(draft.status).toBe(201);
    const res = await send(principal, 'post', `${base()}/invoices/${draft.body.id}/issue`);
    expect(res.status).toBe(200);
    return invoiceSchema.parse(res.body);
  };
  const checkout = async (invoiceId: string) => {
    const res = await send(client, 'post', `${base()}/invoices/${invoiceId}/checkout`);
    expect(res.status).toBe(201);
    return checkoutStartSchema.parse(res.body);
  };
  const reconcile = async (invoiceId: string, sessionId: string, as = client) => {
    const res = await send(as, 'post', `${base()}/invoices/${invoiceId}/checkout/${sessionId}/reconcile`);
    expect(res.status).toBe(200);
    return checkoutOutcomeSchema.parse(res.body);
  };
  const cardPayments = (invoiceId: string) => t.db('payments').where({ invoice_id: invoiceId, method: 'card' });
  const postEvent = (body: string, signature: string) =>
    request(t.app)
      .post('/api/webhooks/stripe')
      .set('Content-Type', 'application/json')
      .set('Stripe-Signature', signature)
      .send(body);

  beforeAll(async () => {
    fake = await startFakeStripe();
    t = await testApp({
      seed: true,
      identity: true,
      config: {
        STRIPE_SECRET_KEY: FAKE_STRIPE_KEYS.secretKey,
        STRIPE_WEBHOOK_SECRET: FAKE_STRIPE_KEYS.webhookSecret,
        STRIPE_API_HOST: '127.0.0.1',
        STRIPE_API_PORT: fake.port,
        STRIPE_API_PROTOCOL: 'http',
      },
    });
    // The fake posts its events over HTTP, so this app listens on loopback for them.
    server = createServer(t.app);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
    fake.setWebhook(`http://127.0.0.1:${(server.address() as AddressInfo).port}/api/webhooks/stripe`);
    principal = await signedInAs(t, DEMO.users.principal.email);
    client = await signedInAs(t, DEMO.users.fenwickContact.email);
    otherClient = await signedInAs(t, DEMO.users.harbourlightContact.email);
    const project = await send(principal, 'post', '/api/projects', {
      reference: 'SQ-PAY-1',
      name: 'Card payment test',
      clientOrganisationId: DEMO.clients.fenwick.id,
      storeys: 2,
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
    expect(project.status).toBe(201);
    projectId = project.body.id;
    await send(principal, 'put', `${base()}/members/${DEMO.users.fenwickContact.id}`);
    const a = await send(principal, 'put', `${base()}/fee-agreement`, {
      basis: 'lump_sum',
      lumpSumMinor: 2_000_000,
      currency: 'EUR',
      taxRateBp: 2000,
      taxLabel: 'VAT',
      paymentTermsDays: 30,
      billingContactId: DEMO.users.fenwickContact.id,
      stageShares: SHARES,
    });
    expect(a.status).toBe(200);
  });
  afterAll(async () => {
    server?.closeAllConnections();
    await new Promise((r) => server?.close(r));
    await t?.close();
    await fake?.stop();
  });
  afterEach(() => fake.holdWebhooks(false));

  it('pays on the checkout page: the webhook records the amount Stripe reports, with a receipt and a notice to the principal', async () => {
    const inv = await issued(100_000); // 1 000.00 + 20 % VAT = 1 200.00
    const start = await checkout(inv.id);
    expect(start.url).toMatch(new RegExp(`^http://127\\.0\\.0\\.1:${fake.port}/checkout/cs_`));
    const session = await t.db('checkout_sessions').where({ id: start.sessionId }).first();
    expect({ invoice: session.invoice_id, amount: Number(session.amount_minor) }).toEqual({
      invoice: inv.id,
      amount: 120_000,
    });
    const page = await fetch(start.url);
    expect(await page.text()).toContain('€1,200.00');

    const paid = await fake.submitCard(start.sessionId, TEST_CARDS.success);
    expect(paid.location).toContain(`/fees/return?project=${projectId}&invoice=${inv.id}&session=${start.sessionId}`);

    const after = invoiceSchema.parse((await client.get(`${base()}/invoices/${inv.id}`)).body);
    expect(after).toMatchObject({ state: 'paid', paidMinor: 120_000, dueMinor: 0, overpaidMinor: 0 });
    expect(await cardPayments(inv.id)).toHaveLength(1);
    const receipts = (await mails('payment-receipt')).filter((m) => m.text.includes(inv.number!));
    expect(receipts.map((m) => m.to)).toEqual([[DEMO.users.fenwickContact.email]]);
    expect(receipts[0].text).toContain('card payment of €1,200.00');
    const notices = (await mails('payment-notice')).filter((m) => m.text.includes(inv.number!));
    expect(notices.map((m) => m.to)).toEqual([[DEMO.users.principal.email]]);
    expect(notices[0].subject).toContain('paid €1,200.00');
    expect(notices[0].text).not.toContain('Overpayment');

    // The return page asks afterwards: paid, and still one payment.
    expect((await reconcile(inv.id, start.sessionId)).outcome).toBe('paid');
    expect(await cardPayments(inv.id)).toHaveLength(1);
    // Paid in full: no new checkout.
    expect((await send(client, 'post', `${base()}/invoices/${inv.id}/checkout`)).status).toBe(409);
  });

  it('refuses an event with a bad signature (400) and one signed too long ago, and records neither', async () => {
    const inv = await issued(10_000);
    const start = await checkout(inv.id);
    const body = JSON.stringify({
      id: 'evt_forged_1',
      object: 'event',
      type: 'checkout.session.completed',
      created: Math.floor(Date.now() / 1000),
      data: {
        object: { id: start.sessionId, payment_status: 'paid', amount_total: 12_000, currency: 'eur' },
      },
    });
    const forged = await postEvent(body, `t=${Math.floor(Date.now() / 1000)},v1=${'0'.repeat(64)}`);
    expect(forged.status).toBe(400);
    expect(forged.body.error.message).toMatch(/signature/);
    const stale = await postEvent(body, fake.sign(body, Math.floor(Date.now() / 1000) - 3600));
    expect(stale.status).toBe(400);
    expect(stale.body.error.message).toMatch(/older than/);
    const unsigned = await request(t.app)
      .post('/api/webhooks/stripe')
      .set('Content-Type', 'application/json')
      .send(body);
    expect(unsigned.status).toBe(400);
    expect(await t.db('stripe_events').where({ id: 'evt_forged_1' })).toHaveLength(0);
    expect(await cardPayments(inv.id)).toHaveLength(0);
    // The same body, properly signed now, is accepted: the refusals were about the signature.
    expect((await postEvent(body, fake.sign(body))).status).toBe(200);
    expect(await cardPayments(inv.id)).toHaveLength(1);
  });

  it('never pays twice for a duplicated event or a second event about the same session', async () => {
    const inv = await issued(20_000);
    const start = await checkout(inv.id);
    fake.holdWebhooks(true);
    await fake.submitCard(start.sessionId, TEST_CARDS.success);
    const completed = fake.events.filter((e) => e.type === 'checkout.session.completed').at(-1)!;
    expect(await fake.releaseWebhooks()).toEqual([200]);
    const body = JSON.stringify({ object: 'event', ...completed });
    const again = await postEvent(body, fake.sign(body));
    expect(again.status).toBe(200);
    expect(again.body).toEqual({ received: true, duplicate: true });
    const other = JSON.stringify({ object: 'event', ...completed, id: `${completed.id}_redelivered` });
    expect((await postEvent(other, fake.sign(other))).status).toBe(200);
    const rows = await cardPayments(inv.id);
    expect(rows.map((p) => Number(p.amount_minor))).toEqual([24_000]);
    expect((await mails('payment-receipt')).filter((m) => m.text.includes(inv.number!))).toHaveLength(1);
  });

  it('keeps the invoice paid when a refusal event arrives after the payment (events out of order)', async () => {
    const inv = await issued(30_000);
    const start = await checkout(inv.id);
    fake.holdWebhooks(true);
    await fake.submitCard(start.sessionId, TEST_CARDS.decline);
    await fake.submitCard(start.sessionId, TEST_CARDS.success);
    // Delivered newest first: the completion, then the older refusal.
    expect(await fake.releaseWebhooks('reversed')).toEqual([200, 200]);
    const after = invoiceSchema.parse((await client.get(`${base()}/invoices/${inv.id}`)).body);
    expect(after).toMatchObject({ state: 'paid', dueMinor: 0 });
    expect((await reconcile(inv.id, start.sessionId)).outcome).toBe('paid');
    expect(await cardPayments(inv.id)).toHaveLength(1);
  });

  it('shows the invoice paid from the session when no webhook has come, and the late webhook changes nothing', async () => {
    const inv = await issued(40_000);
    const start = await checkout(inv.id);
    fake.holdWebhooks(true);
    await fake.submitCard(start.sessionId, TEST_CARDS.success);
    expect(await cardPayments(inv.id)).toHaveLength(0);
    const outcome = await reconcile(inv.id, start.sessionId);
    expect(outcome.outcome).toBe('paid');
    expect(outcome.invoice).toMatchObject({ state: 'paid', paidMinor: 48_000 });
    expect(await fake.releaseWebhooks()).toEqual([200]);
    expect(await cardPayments(inv.id)).toHaveLength(1);
    expect((await mails('payment-notice')).filter((m) => m.text.includes(inv.number!))).toHaveLength(1);
  });

  it('records a card payment on an invoice already paid by transfer as an overpayment and flags it to the principal', async () => {
    const inv = await issued(50_000);
    const start = await checkout(inv.id);
    const transfer = await send(principal, 'post', `${base()}/invoices/${inv.id}/payments`, {
      amountMinor: 60_000,
      receivedOn: '2026-12-01',
      reference: 'BT-77120',
    });
    expect(transfer.status).toBe(201);
    await fake.submitCard(start.sessionId, TEST_CARDS.success);
    const after = invoiceSchema.parse((await principal.get(`${base()}/invoices/${inv.id}`)).body);
    expect(after).toMatchObject({ state: 'paid', paidMinor: 120_000, overpaidMinor: 60_000, dueMinor: 0 });
    expect(after.payments.find((p) => p.method === 'card')).toMatchObject({
      amountMinor: 60_000,
      overpaidMinor: 60_000,
    });
    const [notice] = (await mails('payment-notice')).filter((m) => m.text.includes(inv.number!));
    expect(notice.text).toContain('Overpayment: €600.00 more than was owed');
  });

  it('leaves the invoice unchanged when the card is declined, and tells the client why', async () => {
    const inv = await issued(70_000);
    const start = await checkout(inv.id);
    const refused = await fake.submitCard(start.sessionId, TEST_CARDS.decline);
    expect(refused.location).toBe(`/checkout/${start.sessionId}?declined=1`);
    const outcome = await reconcile(inv.id, start.sessionId);
    expect(outcome.outcome).toBe('declined');
    expect(outcome.message).toContain('Your card was declined.');
    expect(outcome.message).toContain('card_declined');
    expect(outcome.invoice).toMatchObject({ state: 'issued', paidMinor: 0, dueMinor: 84_000 });
    expect(await t.db('payments').where({ invoice_id: inv.id })).toHaveLength(0);
    expect((await t.db('checkout_sessions').where({ id: start.sessionId }).first()).outcome).toBe('declined');
  });

  it("hides another organisation's invoice from checkout and a session from another invoice", async () => {
    const inv = await issued(1_000);
    const start = await checkout(inv.id);
    expect((await send(otherClient, 'post', `${base()}/invoices/${inv.id}/checkout`)).status).toBe(404);
    expect((await send(principal, 'post', `${base()}/invoices/${inv.id}/checkout`)).status).toBe(403);
    const other = await issued(2_000);
    const res = await send(client, 'post', `${base()}/invoices/${other.id}/checkout/${start.sessionId}/reconcile`);
    expect(res.status).toBe(404);
  });
});
