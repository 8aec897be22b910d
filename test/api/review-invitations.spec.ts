import request from 'supertest';
import { invitationCreatedSchema, invitationPreviewSchema } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { MAIL_QUEUE } from '../../apps/server/src/jobs';
import type { FakeSmtp } from '../../scripts/fakes/smtp';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs, until } from '../support/agents';
import { startFakeSmtp } from '../support/fakes';

// Each sign-in runs argon2 at the provider; with two workers a file's set-up takes a few seconds.
jest.setTimeout(60_000);

const pendingFor = (t: TestApp, email: string) =>
  t
    .db('invitations')
    .where({ firm_id: DEMO.firm.id })
    .whereRaw('lower(email) = lower(?)', [email])
    .whereNull('accepted_at');

describe('one pending invitation per address', () => {
  let t: TestApp;
  let smtp: FakeSmtp;

  beforeAll(async () => {
    smtp = await startFakeSmtp({ httpPort: 0 });
    t = await testApp({ seed: true, identity: true, mail: { smtpPort: smtp.port } });
  });
  afterAll(async () => {
    await t.close();
    await smtp.stop();
  });

  it('twenty invitations of one address at once make one person, one pending invitation, and mails that all carry its one working link', async () => {
    const principal = await signedInAs(t, DEMO.users.principal.email);
    const email = 'Linnea.Quarrie@sablequay.example';
    const body = { email, displayName: 'Linnea Quarrie', role: 'engineer', projectIds: [DEMO.projects.alder.id] };
    const answers = await Promise.all(
      Array.from({ length: 20 }, (_, i) =>
        // Differently cased, as people type addresses.
        send(principal, 'post', '/api/invitations', { ...body, email: i % 2 ? email.toLowerCase() : email }),
      ),
    );
    expect(answers.map((a) => a.status)).toEqual(Array(20).fill(201));
    const links = new Set(answers.map((a) => invitationCreatedSchema.parse(a.body).invitation.url));
    expect(links.size).toBe(1);
    const [link] = [...links];

    expect(await t.db('users').whereRaw('lower(email) = lower(?)', [email])).toHaveLength(1);
    expect(await pendingFor(t, email)).toHaveLength(1);

    // Every queued mail is delivered; each one carries the same link.
    await until(
      'twenty invitation mails',
      async () => {
        const { rows } = await t.db.raw(
          `select count(*)::int as n from pgboss.job where name = ? and data->>'template' = 'invitation' and state = 'completed'`,
          [MAIL_QUEUE],
        );
        return rows[0].n >= 20;
      },
      40_000,
    );
    const mails = smtp.messages.filter((m) => m.to.some((to) => to.toLowerCase() === email.toLowerCase()));
    expect(mails).toHaveLength(20);
    for (const m of mails) expect(m.text).toContain(link);

    // And that link works: it names the person and is pending.
    const token = link.split('/invitations/')[1];
    const preview = invitationPreviewSchema.parse((await request(t.app).get(`/api/invitations/${token}`)).body);
    expect(preview).toMatchObject({
      email: expect.stringMatching(/^linnea\.quarrie@sablequay\.example$/i),
      status: 'pending',
    });
  });

  it('inviting again later resends the same link with a fresh expiry, and takes the new details', async () => {
    const principal = await signedInAs(t, DEMO.users.principal.email);
    const email = 'oren.falkirk@sablequay.example';
    const first = invitationCreatedSchema.parse(
      (await send(principal, 'post', '/api/invitations', { email, displayName: 'Oren F', role: 'engineer' })).body,
    );
    await t
      .db('invitations')
      .whereRaw('lower(email) = ?', [email])
      .update({ expires_at: new Date(Date.now() + 60_000) });
    const again = invitationCreatedSchema.parse(
      (
        await send(principal, 'post', '/api/invitations', {
          email,
          displayName: 'Oren Falkirk',
          role: 'engineer',
          projectIds: [DEMO.projects.kestrel.id],
        })
      ).body,
    );
    expect(again.invitation.url).toBe(first.invitation.url);
    expect(new Date(again.invitation.expiresAt).getTime()).toBeGreaterThan(Date.now() + 86_400_000);
    expect(again.person).toMatchObject({ displayName: 'Oren Falkirk', projects: [{ id: DEMO.projects.kestrel.id }] });
    expect(await pendingFor(t, email)).toHaveLength(1);
  });

  it('an expired invitation is replaced by a new link; the old one no longer opens', async () => {
    const principal = await signedInAs(t, DEMO.users.principal.email);
    const email = 'tamsin.voller@sablequay.example';
    const first = invitationCreatedSchema.parse(
      (await send(principal, 'post', '/api/invitations', { email, displayName: 'Tamsin Voller', role: 'engineer' }))
        .body,
    );
    await t
      .db('invitations')
      .whereRaw('lower(email) = ?', [email])
      .update({ expires_at: new Date(Date.now() - 1000) });
    const again = invitationCreatedSchema.parse(
      (await send(principal, 'post', '/api/invitations', { email, displayName: 'Tamsin Voller', role: 'engineer' }))
        .body,
    );
    expect(again.invitation.url).not.toBe(first.invitation.url);
    expect(await pendingFor(t, email)).toHaveLength(1);
    const oldToken = first.invitation.url.split('/invitations/')[1];
    expect((await request(t.app).get(`/api/invitations/${oldToken}`)).status).toBe(404);
  });

  it('the database itself refuses a second pending invitation for an address', async () => {
    const principal = await signedInAs(t, DEMO.users.principal.email);
    const email = 'ada.brennock@sablequay.example';
    const created = invitationCreatedSchema.parse(
      (await send(principal, 'post', '/api/invitations', { email, displayName: 'Ada Brennock', role: 'engineer' }))
        .body,
    );
    await expect(
      t.db('invitations').insert({
        firm_id: DEMO.firm.id,
        user_id: created.person.id,
        email: email.toUpperCase(),
        token_hash: 'f'.repeat(64),
        expires_at: new Date(Date.now() + 86_400_000),
      }),
    ).rejects.toMatchObject({ code: '23505', constraint: 'invitations_one_pending_per_address' });
  });
});
