import type { Knex } from 'knex';
import { ensureAccount } from '../apps/identity/src/accounts';
import { DEMO } from './demo-data';

/**
 * LOCAL ONLY. Accounts at the local identity provider for the demo people, one per role, all with
 * this password. Production signs in at the firm's own provider and never has these.
 */
export const DEMO_PASSWORD = 'sable-quay-local-demo';

/** Creates the demo's identity accounts that are missing; safe to run again. */
export async function seedIdentityAccounts(db: Knex): Promise<number> {
  let created = 0;
  for (const u of Object.values(DEMO.users)) {
    if (await ensureAccount(db, { email: u.email, name: u.name, password: DEMO_PASSWORD })) created++;
  }
  // Someone the provider knows whom the firm has not invited: shows the "no access yet" page.
  if (await ensureAccount(db, { email: 'wren.adebayo@stray.example', name: 'Wren Adebayo', password: DEMO_PASSWORD }))
    created++;
  return created;
}
