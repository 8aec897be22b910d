import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';

jest.setTimeout(30_000);

describe('changing an engineer into another role', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
  });
  afterAll(() => t.close());

  it('frees the stages they were assigned to, so nobody holds a stage they cannot move', async () => {
    const principal = await signedInAs(t, DEMO.users.principal.email);
    const engineer = DEMO.users.engineerA.id;
    const assigned = await t.db('stages').where({ assignee_id: engineer }).count({ n: '*' });
    expect(Number(assigned[0].n)).toBeGreaterThan(0);

    const res = await send(principal, 'patch', `/api/people/${engineer}`, {
      role: 'client',
      clientOrganisationId: DEMO.clients.fenwick.id,
    });
    expect(res.status).toBe(200);
    expect(await t.db('stages').where({ assignee_id: engineer })).toHaveLength(0);
    expect(await t.db('project_members').where({ user_id: engineer })).toHaveLength(0);
  });

  it('keeps the stages of an engineer whose name alone changes', async () => {
    const principal = await signedInAs(t, DEMO.users.principal.email);
    const engineer = DEMO.users.engineerB.id;
    const stagesOf = () =>
      t.db('stages').where({ assignee_id: engineer }).orderBy(['project_id', 'key']).select('project_id', 'key');
    const before = await stagesOf();
    expect(before.length).toBeGreaterThan(0);
    const res = await send(principal, 'patch', `/api/people/${engineer}`, { displayName: 'Priya Lindqvist-Moe' });
    expect(res.status).toBe(200);
    expect(await stagesOf()).toEqual(before);
  });
});
