import request from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import { invitationCreatedSchema, invitationPreviewSchema, meSchema, personSchema } from '@trabeate/contracts';
import { ensureAccount } from '../../apps/identity/src/accounts';
import { DEMO } from '../../seeds/demo';
import { DEMO_PASSWORD } from '../../seeds/identity';
import { testApp, type TestApp } from '../support/app';
import { signIn, xsrfToken } from '../support/identity';

// Each sign-in runs argon2 at the provider; with two workers a file's set-up takes a few seconds.
jest.setTimeout(30_000);

describe('people, invitations and access changes', () => {
  let t: TestApp;
  let principal: TestAgent;
  const as = async (email: string) => {
    const api = request.agent(t.app);
    await signIn(api, t.identity!, email);
    await api.get('/api/me');
    return api;
  };
  const send = (api: TestAgent, method: 'post' | 'patch' | 'delete' | 'put', path: string, body?: object) => {
    const req = api[method](path).set('X-XSRF-TOKEN', xsrfToken(api));
    return body ? req.send(body) : req;
  };

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    principal = await as(DEMO.users.principal.email);
  });
  afterAll(() => t.close());

  it('lists everyone in the firm with role, organisation, status and projects', async () => {
    const res = await principal.get('/api/people');
    expect(res.status).toBe(200);
    const people = personSchema.array().parse(res.body);
    expect(people).toHaveLength(5);
    expect(people.find((p) => p.id === DEMO.users.fenwickContact.id)).toMatchObject({
      role: 'client',
      clientOrganisation: { id: DEMO.clients.fenwick.id, name: DEMO.clients.fenwick.name },
      status: 'active',
      projects: [
        { id: DEMO.projects.kestrel.id, reference: DEMO.projects.kestrel.reference, name: 'Kestrel Yard apartments' },
      ],
    });
  });

  it('invites an engineer: returns the link once, and the first sign-in with that e-mail binds the account', async () => {
    const res = await send(principal, 'post', '/api/invitations', {
      email: 'juno.farrant@sablequay.example',
      displayName: 'Juno Farrant',
      role: 'engineer',
      projectIds: [DEMO.projects.alder.id],
    });
    expect(res.status).toBe(201);
    const created = invitationCreatedSchema.parse(res.body);
    expect(created.person).toMatchObject({
      status: 'invited',
      role: 'engineer',
      projects: [{ id: DEMO.projects.alder.id }],
    });
    const token = created.invitation.url.split('/invitations/')[1];
    expect(created.invitation.url).toBe(`http://127.0.0.1:4310/invitations/${token}`);
    expect(await t.db('invitations').where({ token_hash: token }).first()).toBeUndefined(); // only a hash is kept

    const preview = invitationPreviewSchema.parse((await request(t.app).get(`/api/invitations/${token}`)).body);
    expect(preview).toMatchObject({
      email: 'juno.farrant@sablequay.example',
      role: 'engineer',
      firmName: DEMO.firm.name,
      status: 'pending',
    });

    await ensureAccount(t.db, { email: 'Juno.Farrant@sablequay.example', name: 'Juno F.', password: DEMO_PASSWORD });
    const juno = await as('juno.farrant@sablequay.example');
    expect(meSchema.parse((await juno.get('/api/me')).body)).toMatchObject({
      access: 'granted',
      user: { role: 'engineer', displayName: 'Juno Farrant' },
    });
    expect(((await juno.get('/api/projects')).body.items as Array<{ id: string }>).map((p) => p.id)).toEqual([
      DEMO.projects.alder.id,
    ]);
    expect((await request(t.app).get(`/api/invitations/${token}`)).body.status).toBe('accepted');
  });

  it('gives access to someone already signed in without it as soon as they are invited', async () => {
    const wren = await as('wren.adebayo@stray.example');
    expect((await wren.get('/api/me')).body.access).toBe('none');
    const res = await send(principal, 'post', '/api/invitations', {
      email: 'wren.adebayo@stray.example',
      displayName: 'Wren Adebayo',
      role: 'client',
      clientOrganisationId: DEMO.clients.fenwick.id,
      projectIds: [DEMO.projects.kestrel.id],
    });
    expect(res.status).toBe(201);
    expect(meSchema.parse((await wren.get('/api/me')).body)).toMatchObject({
      access: 'granted',
      user: { role: 'client' },
    });
    expect((await wren.get(`/api/projects/${DEMO.projects.kestrel.id}`)).status).toBe(200);
  });

  it("refuses to put a client contact on another organisation's project, and names the field", async () => {
    const res = await send(principal, 'post', '/api/invitations', {
      email: 'mismatch@fenwickrow.example',
      displayName: 'Mismatch',
      role: 'client',
      clientOrganisationId: DEMO.clients.fenwick.id,
      projectIds: [DEMO.projects.alder.id],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['body.projectIds']).toBeDefined();
    const noOrg = await send(principal, 'post', '/api/invitations', {
      email: 'no.org@x.example',
      displayName: 'No Org',
      role: 'client',
    });
    expect(noOrg.status).toBe(400);
    expect(noOrg.body.error.fields['body.clientOrganisationId']).toBeDefined();
  });

  it('answers 409 when inviting someone who already has access', async () => {
    await as(DEMO.users.engineerA.email);
    const res = await send(principal, 'post', '/api/invitations', {
      email: DEMO.users.engineerA.email.toUpperCase(),
      displayName: 'Again',
      role: 'engineer',
    });
    expect(res.status).toBe(409);
  });

  it('does not let an expired invitation bind', async () => {
    const res = await send(principal, 'post', '/api/invitations', {
      email: 'late.arrival@sablequay.example',
      displayName: 'Late Arrival',
      role: 'engineer',
    });
    await t
      .db('invitations')
      .where({ user_id: res.body.person.id })
      .update({ expires_at: new Date(Date.now() - 1000) });
    await ensureAccount(t.db, { email: 'late.arrival@sablequay.example', name: 'Late', password: DEMO_PASSWORD });
    const late = await as('late.arrival@sablequay.example');
    expect((await late.get('/api/me')).body.access).toBe('none');
  });

  it("changes a role, which takes effect in the person's open session and clears memberships that no longer fit", async () => {
    const tomas = await as(DEMO.users.engineerA.email);
    expect((await tomas.get(`/api/projects/${DEMO.projects.kestrel.id}`)).body.abilities.work).toBe(true);
    const res = await send(principal, 'patch', `/api/people/${DEMO.users.engineerA.id}`, {
      role: 'client',
      clientOrganisationId: DEMO.clients.fenwick.id,
    });
    expect(res.status).toBe(200);
    expect(personSchema.parse(res.body)).toMatchObject({
      role: 'client',
      clientOrganisation: { id: DEMO.clients.fenwick.id },
      projects: [],
    });
    expect((await tomas.get('/api/me')).body.user.role).toBe('client');
    expect((await tomas.get(`/api/projects/${DEMO.projects.kestrel.id}`)).status).toBe(404);
    const back = await send(principal, 'patch', `/api/people/${DEMO.users.engineerA.id}`, { role: 'engineer' });
    expect(back.body).toMatchObject({ role: 'engineer', clientOrganisation: null });
  });

  it('does not let the principal change their own role or remove their own access', async () => {
    const role = await send(principal, 'patch', `/api/people/${DEMO.users.principal.id}`, { role: 'engineer' });
    expect(role.status).toBe(403);
    expect(role.body.error.message).toMatch(/own role/);
    const remove = await send(principal, 'delete', `/api/people/${DEMO.users.principal.id}/access`);
    expect(remove.status).toBe(403);
  });

  it('removes access and ends every session of that person', async () => {
    const rafe1 = await as(DEMO.users.harbourlightContact.email);
    const rafe2 = await as(DEMO.users.harbourlightContact.email);
    const res = await send(principal, 'delete', `/api/people/${DEMO.users.harbourlightContact.id}/access`);
    expect(res.status).toBe(204);
    for (const api of [rafe1, rafe2]) expect((await api.get('/api/me')).status).toBe(401);
    expect(
      (await t.db('sessions').whereRaw(`(sess::jsonb -> 'auth') ->> 'userId' = ?`, [DEMO.users.harbourlightContact.id]))
        .length,
    ).toBe(0);
    const again = await as(DEMO.users.harbourlightContact.email);
    expect((await again.get('/api/me')).body.access).toBe('none');
    const listed = (await principal.get('/api/people')).body.find(
      (p: { id: string }) => p.id === DEMO.users.harbourlightContact.id,
    );
    expect(listed.status).toBe('removed');
  });

  it('assigns and unassigns an engineer on a project', async () => {
    const priya = await as(DEMO.users.engineerB.email);
    expect((await priya.get(`/api/projects/${DEMO.projects.kestrel.id}`)).status).toBe(404);
    expect(
      (await send(principal, 'put', `/api/projects/${DEMO.projects.kestrel.id}/members/${DEMO.users.engineerB.id}`))
        .status,
    ).toBe(204);
    expect((await priya.get(`/api/projects/${DEMO.projects.kestrel.id}`)).status).toBe(200);
    expect(
      (await send(principal, 'delete', `/api/projects/${DEMO.projects.kestrel.id}/members/${DEMO.users.engineerB.id}`))
        .status,
    ).toBe(204);
    expect((await priya.get(`/api/projects/${DEMO.projects.kestrel.id}`)).status).toBe(404);
    const wrongOrg = await send(
      principal,
      'put',
      `/api/projects/${DEMO.projects.alder.id}/members/${DEMO.users.fenwickContact.id}`,
    );
    expect(wrongOrg.status).toBe(409);
  });
});
