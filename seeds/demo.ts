import type { Knex } from 'knex';
import { DEMO } from './demo-data';
import { seedIdentityAccounts } from './identity';

// The demo is a scenario of our own invention: a small structural consultancy in the fictional
// town of Marrowby, its two client organisations and their projects. No real people or firms.
export { DEMO } from './demo-data';

/**
 * Inserts the demo scenario unless it is already there, then adds what later steps brought (project
 * memberships, identity accounts) where missing; safe to run again.
 */
export async function seedDemo(db: Knex): Promise<boolean> {
  const existing = await db('firms').where({ id: DEMO.firm.id }).first();
  if (!existing) await insertCore(db);
  await seedMemberships(db);
  await seedIdentityAccounts(db);
  return !existing;
}

/**
 * Tomas is assigned to Kestrel Yard and Priya to Alder Lane; each client's contact belongs to
 * their own organisation's project.
 */
async function seedMemberships(db: Knex): Promise<void> {
  const u = DEMO.users;
  const p = DEMO.projects;
  await db('project_members')
    .insert([
      { project_id: p.kestrel.id, user_id: u.engineerA.id, added_by: u.principal.id },
      { project_id: p.alder.id, user_id: u.engineerB.id, added_by: u.principal.id },
      { project_id: p.kestrel.id, user_id: u.fenwickContact.id, added_by: u.principal.id },
      { project_id: p.alder.id, user_id: u.harbourlightContact.id, added_by: u.principal.id },
    ])
    .onConflict(['project_id', 'user_id'])
    .ignore();
}

async function insertCore(db: Knex): Promise<void> {
  await db.transaction(async (trx) => {
    await trx('firms').insert({ ...DEMO.firm, default_currency: 'EUR' });
    await trx('client_organisations').insert([
      { ...DEMO.clients.fenwick, firm_id: DEMO.firm.id, billing_email: 'accounts@fenwickrow.example', address: '4 Tallow Yard, Marrowby' },
      { ...DEMO.clients.harbourlight, firm_id: DEMO.firm.id, billing_email: 'estates@harbourlight.example', address: 'Harbourlight House, Quayside Walk, Marrowby' },
    ]);
    const u = DEMO.users;
    await trx('users').insert([
      { id: u.principal.id, firm_id: DEMO.firm.id, email: u.principal.email, display_name: u.principal.name, firm_role: 'principal' },
      { id: u.engineerA.id, firm_id: DEMO.firm.id, email: u.engineerA.email, display_name: u.engineerA.name, firm_role: 'engineer' },
      { id: u.engineerB.id, firm_id: DEMO.firm.id, email: u.engineerB.email, display_name: u.engineerB.name, firm_role: 'engineer' },
      { id: u.fenwickContact.id, firm_id: DEMO.firm.id, email: u.fenwickContact.email, display_name: u.fenwickContact.name, client_organisation_id: DEMO.clients.fenwick.id },
      { id: u.harbourlightContact.id, firm_id: DEMO.firm.id, email: u.harbourlightContact.email, display_name: u.harbourlightContact.name, client_organisation_id: DEMO.clients.harbourlight.id },
    ]);
    await trx('projects').insert([
      {
        id: DEMO.projects.kestrel.id,
        firm_id: DEMO.firm.id,
        reference: DEMO.projects.kestrel.reference,
        name: 'Kestrel Yard apartments',
        client_organisation_id: DEMO.clients.fenwick.id,
        site_address: '17–19 Chandler Street, Marrowby',
        building_use: 'Residential apartments over ground-floor shops; plot bounded by neighbours on the north and east',
        storeys: 7,
        storey_height_m: 3.1,
        floor_area_m2: 3150,
        estimated_cost: 4_850_000,
        currency: 'EUR',
        design_basis: JSON.stringify({ codeFamily: 'EN', concrete: 'C30/37', steel: 'B500B', imposedKPa: 2.0, superimposedDeadKPa: 1.5, bearingKPa: 180, foundingDepthM: 1.5 }),
      },
      {
        id: DEMO.projects.alder.id,
        firm_id: DEMO.firm.id,
        reference: DEMO.projects.alder.reference,
        name: 'Alder Lane school teaching block',
        client_organisation_id: DEMO.clients.harbourlight.id,
        site_address: 'Alder Lane, Marrowby',
        building_use: 'Two-storey teaching block with classrooms and a hall',
        storeys: 2,
        storey_height_m: 3.6,
        floor_area_m2: 1420,
        estimated_cost: 2_300_000,
        currency: 'EUR',
        design_basis: JSON.stringify({ codeFamily: 'EN', concrete: 'C25/30', steel: 'B500B', imposedKPa: 3.0, superimposedDeadKPa: 1.2, bearingKPa: 150, foundingDepthM: 1.2 }),
      },
    ]);
  });
}
