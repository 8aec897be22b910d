import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';

// Each sign-in runs argon2 at the provider; with two workers a file's set-up takes a few seconds.
jest.setTimeout(30_000);

describe('invitations sent twice at once (a double click, two tabs)', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
  });
  afterAll(() => t.close());

  it('answers both like two invitations one after the other: one person, one live invitation, no 500', async () => {
    const principal = await signedInAs(t, DEMO.users.principal.email);
    // The race is narrow; a few addresses make a collision near certain without the lock.
    for (let i = 0; i < 8; i++) {
      const body = {
        email: `wren.ashdown${i}@sablequay.example`,
        displayName: 'Wren Ashdown',
        role: 'engineer',
        projectIds: [DEMO.projects.alder.id],
      };
      const [a, b] = await Promise.all([
        send(principal, 'post', '/api/invitations', body),
        send(principal, 'post', '/api/invitations', body),
      ]);
      expect([a.status, b.status]).toEqual([201, 201]);
      const users = await t.db('users').whereRaw('lower(email) = lower(?)', [body.email]).select('id');
      expect(users).toHaveLength(1);
      // The later invitation replaces the earlier one, as it does when sent one after the other.
      expect(await t.db('invitations').where({ user_id: users[0].id }).whereNull('accepted_at')).toHaveLength(1);
      expect(await t.db('project_members').where({ user_id: users[0].id })).toHaveLength(1);
    }
  });
});
