import { formatDay } from '@trabeate/dates';
import type TestAgent from 'supertest/lib/agent';
import { outboxPageSchema } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { MAIL_QUEUE } from '../../apps/server/src/jobs';
import type { FakeSmtp } from '../../scripts/fakes/smtp';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs, until } from '../support/agents';
import { startFakeSmtp } from '../support/fakes';

jest.setTimeout(60_000);

describe('e-mail notices go through the queue and survive a mail server outage', () => {
  let t: TestApp;
  let smtp: FakeSmtp;
  let smtpPort: number;
  let httpPort: number;
  let principal: TestAgent;
  let tomas: TestAgent;
  const kestrel = DEMO.projects.kestrel.id;

  beforeAll(async () => {
    smtp = await startFakeSmtp({ httpPort: 0 });
    smtpPort = smtp.port;
    httpPort = smtp.httpPort!;
    t = await testApp({
      seed: true,
      identity: true,
      mail: { smtpPort },
      config: { DEV_OUTBOX_URL: `http://127.0.0.1:${httpPort}` },
    });
    principal = await signedInAs(t, DEMO.users.principal.email);
    tomas = await signedInAs(t, DEMO.users.engineerA.email);
  });
  afterAll(async () => {
    await t.close();
    await smtp.stop();
  });

  it('with the SMTP server down, an approval notice waits, and is delivered once the server is back', async () => {
    await smtp.stop();
    // Seeded: Kestrel Yard's column layout is under review, assigned to Tomas.
    const res = await send(principal, 'post', `/api/projects/${kestrel}/stages/column_layout/transitions`, {
      action: 'approve',
    });
    expect(res.status).toBe(200);
    await until('a failed delivery attempt', async () => {
      const { rows } = await t.db.raw(
        `select state, retry_count from pgboss.job where name = ? and data->>'template' = 'stage-approved'`,
        [MAIL_QUEUE],
      );
      return rows.length === 1 && rows[0].state === 'retry' && rows[0].retry_count >= 1;
    });
    smtp = await startFakeSmtp({ port: smtpPort, httpPort });
    const msg = await smtp.waitFor((m) => m.to.includes(DEMO.users.engineerA.email), 20_000);
    expect(msg.subject).toBe('Kestrel Yard apartments: Column layout is approved');
    expect(msg.text).toContain(`${DEMO.users.principal.name} has approved Column layout of Kestrel Yard apartments`);
    expect(msg.text).toContain(`http://127.0.0.1:4310/projects/${kestrel}?stage=column_layout`);
  });

  it('an invitation is e-mailed with its link', async () => {
    const res = await send(principal, 'post', '/api/invitations', {
      email: 'mira.sollen@sablequay.example',
      displayName: 'Mira Sollen',
      role: 'engineer',
      projectIds: [kestrel],
    });
    expect(res.status).toBe(201);
    const msg = await smtp.waitFor((m) => m.to.includes('mira.sollen@sablequay.example'));
    expect(msg.subject).toBe(`${DEMO.users.principal.name} invites you to ${DEMO.firm.name} on Trabeate`);
    expect(msg.text).toContain(res.body.invitation.url);
    // The expiry in the app's one date format ("20 Dec 2026"), never an ISO date.
    expect(msg.text).toContain(
      `works until ${formatDay(res.body.invitation.expiresAt, { timeZone: 'Europe/London' })}.`,
    );
    expect(msg.text).toMatch(/works until \d{1,2} [A-Z][a-z]{2} \d{4}\./);
    const entry = await t
      .db('activity')
      .where({ project_id: kestrel, action: 'membership.added', object_id: res.body.person.id })
      .first();
    expect(entry.summary).toBe(`${DEMO.users.principal.name} invited Mira Sollen to the project team`);
  });

  it('a change that fails queues no mail', async () => {
    const before = (await t.db.raw(`select count(*)::int as n from pgboss.job where name = ?`, [MAIL_QUEUE])).rows[0].n;
    // The beam framing is in progress: approving it is refused, so nothing is queued.
    const res = await send(principal, 'post', `/api/projects/${kestrel}/stages/beam_framing/transitions`, {
      action: 'approve',
    });
    expect(res.status).toBe(409);
    expect((await t.db.raw(`select count(*)::int as n from pgboss.job where name = ?`, [MAIL_QUEUE])).rows[0].n).toBe(
      before,
    );
  });

  it('the development outbox lists the caught messages, newest first, for the principal only', async () => {
    const res = await principal.get('/api/dev/outbox?pageSize=100');
    expect(res.status).toBe(200);
    const { items: messages } = outboxPageSchema.parse(res.body);
    expect(messages[0]).toMatchObject({
      to: ['mira.sollen@sablequay.example'],
      html: expect.stringContaining('Accept the invitation'),
    });
    expect(messages.map((m) => m.subject)).toContain('Kestrel Yard apartments: Column layout is approved');
    expect((await tomas.get('/api/dev/outbox')).status).toBe(403);
  });

  it('the development outbox is paged by the server: each page holds the next messages, newest first', async () => {
    const all = outboxPageSchema.parse((await principal.get('/api/dev/outbox?pageSize=100')).body);
    expect(all.total).toBeGreaterThanOrEqual(2);
    expect(all.items).toHaveLength(all.total);
    const first = outboxPageSchema.parse((await principal.get('/api/dev/outbox?pageSize=1')).body);
    const second = outboxPageSchema.parse((await principal.get('/api/dev/outbox?page=2&pageSize=1')).body);
    expect(first).toMatchObject({ total: all.total, page: 1, pageSize: 1 });
    expect(second).toMatchObject({ total: all.total, page: 2, pageSize: 1 });
    expect([first.items[0].id, second.items[0].id]).toEqual([all.items[0].id, all.items[1].id]);
    const past = outboxPageSchema.parse((await principal.get(`/api/dev/outbox?page=${all.total + 1}&pageSize=1`)).body);
    expect(past).toMatchObject({ items: [], total: all.total });
    // The default page is 25 messages, as on every paged list.
    expect(outboxPageSchema.parse((await principal.get('/api/dev/outbox')).body).pageSize).toBe(25);
    for (const bad of ['page=0', 'pageSize=101', 'pageSize=two'])
      expect((await principal.get(`/api/dev/outbox?${bad}`)).status).toBe(400);
  });

  it('without the local fake configured, the outbox is not there', async () => {
    const bare = await testApp({ seed: true, identity: true });
    try {
      const api = await signedInAs(bare, DEMO.users.principal.email);
      const res = await api.get('/api/dev/outbox');
      expect(res.status).toBe(404);
      expect(res.body.error.message).toMatch(/only when the local mail fake is configured/);
    } finally {
      await bare.close();
    }
  });
});
