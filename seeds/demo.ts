import type { Knex } from 'knex';
import { DEMO, DEMO_RATES } from './demo-data';
import { seedIdentityAccounts } from './identity';
import { seedDemoSchemes, seedDemoSubmission } from './demo-schemes';
import { seedDemoDrawings } from './demo-drawings';
import { seedDemoFees } from './demo-fees';

// The demo is a scenario of our own invention: a small structural consultancy in the fictional
// town of Marrowby, its two client organisations and their projects. No real people or firms.
export { DEMO } from './demo-data';

/**
 * Inserts the demo scenario unless it is already there, then adds what later steps brought (project
 * memberships, identity accounts) where missing; safe to run again.
 */
export async function seedDemo(db: Knex, opts: { fees?: boolean } = {}): Promise<boolean> {
  const existing = await db('firms').where({ id: DEMO.firm.id }).first();
  if (!existing) await insertCore(db);
  await seedMemberships(db);
  await seedDesignBasis(db);
  await seedStages(db);
  await seedDemoDrawings(db);
  await seedIdentityAccounts(db);
  if (opts.fees ?? true) await seedDemoFees(db);
  await seedDemoSchemes(db);
  await seedDemoSubmission(db);
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
      {
        ...DEMO.clients.fenwick,
        firm_id: DEMO.firm.id,
        billing_email: 'accounts@fenwickrow.example',
        address: '4 Tallow Yard, Marrowby',
      },
      {
        ...DEMO.clients.harbourlight,
        firm_id: DEMO.firm.id,
        billing_email: 'estates@harbourlight.example',
        address: 'Harbourlight House, Quayside Walk, Marrowby',
      },
    ]);
    const u = DEMO.users;
    await trx('users').insert([
      {
        id: u.principal.id,
        firm_id: DEMO.firm.id,
        email: u.principal.email,
        display_name: u.principal.name,
        firm_role: 'principal',
      },
      {
        id: u.engineerA.id,
        firm_id: DEMO.firm.id,
        email: u.engineerA.email,
        display_name: u.engineerA.name,
        firm_role: 'engineer',
      },
      {
        id: u.engineerB.id,
        firm_id: DEMO.firm.id,
        email: u.engineerB.email,
        display_name: u.engineerB.name,
        firm_role: 'engineer',
      },
      {
        id: u.fenwickContact.id,
        firm_id: DEMO.firm.id,
        email: u.fenwickContact.email,
        display_name: u.fenwickContact.name,
        client_organisation_id: DEMO.clients.fenwick.id,
      },
      {
        id: u.harbourlightContact.id,
        firm_id: DEMO.firm.id,
        email: u.harbourlightContact.email,
        display_name: u.harbourlightContact.name,
        client_organisation_id: DEMO.clients.harbourlight.id,
      },
    ]);
    await trx('projects').insert([
      {
        id: DEMO.projects.kestrel.id,
        firm_id: DEMO.firm.id,
        reference: DEMO.projects.kestrel.reference,
        name: 'Kestrel Yard apartments',
        client_organisation_id: DEMO.clients.fenwick.id,
        site_address: '17–19 Chandler Street, Marrowby',
        building_use:
          'Residential apartments over ground-floor shops; plot bounded by neighbours on the north and east',
        storeys: 7,
        storey_height_m: 3.1,
        floor_area_m2: 3150,
        estimated_cost: 4_850_000,
        currency: 'EUR',
        design_basis: JSON.stringify(DESIGN_BASIS.kestrel),
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
        design_basis: JSON.stringify(DESIGN_BASIS.alder),
      },
    ]);
  });
}

// Invented design bases in the shape the API takes (projectDesignBasisSchema: MPa, kPa, m).
const DESIGN_BASIS = {
  kestrel: {
    codeFamily: 'EN1992',
    concreteMPa: 30,
    steelMPa: 500,
    imposedKPa: 2.0,
    superimposedDeadKPa: 1.5,
    bearingPressureKPa: 180,
    foundingDepthM: 1.5,
    rates: DEMO_RATES.kestrel,
  },
  alder: {
    codeFamily: 'EN1992',
    concreteMPa: 25,
    steelMPa: 500,
    imposedKPa: 3.0,
    superimposedDeadKPa: 1.2,
    bearingPressureKPa: 150,
    foundingDepthM: 1.2,
    rates: DEMO_RATES.alder,
  },
} as const;

/** Demo databases seeded before the design basis had its API shape get the new one. */
async function seedDesignBasis(db: Knex): Promise<void> {
  for (const [name, basis] of Object.entries(DESIGN_BASIS)) {
    const id = DEMO.projects[name as keyof typeof DEMO.projects].id;
    await db('projects')
      .where({ id })
      .whereRaw(`design_basis ->> 'concreteMPa' is null`)
      .update({ design_basis: JSON.stringify(basis) });
    // Seeded before projects carried unit rates: add the rates alone, keeping the rest as edited.
    await db('projects')
      .where({ id })
      .whereRaw(`not (design_basis \\? 'rates')`)
      .update({
        design_basis: db.raw(`design_basis || jsonb_build_object('rates', ?::jsonb)`, [JSON.stringify(basis.rates)]),
      });
  }
}

const STAGE_KEYS = ['design_basis', 'column_layout', 'beam_framing', 'slab_panels', 'stairs', 'foundations'] as const;
const DAY = 86_400_000;
const dateIn = (days: number) => new Date(Date.now() + days * DAY).toISOString().slice(0, 10);
const at = (days: number) => new Date(Date.now() + days * DAY);

/**
 * The six stages of each demo project, once: Kestrel Yard has its design basis approved, the
 * column layout under review and the beam framing late; Alder Lane's design basis came back with
 * comments. Due dates are relative to the day of seeding, so "late" shows on a fresh demo.
 */
async function seedStages(db: Knex): Promise<void> {
  const u = DEMO.users;
  const p = DEMO.projects;
  const present = await db('stages').whereIn('project_id', [p.kestrel.id, p.alder.id]).count<{ n: string }[]>('* as n');
  if (Number(present[0].n) > 0) {
    // Migrated databases already have the stages (not started); the scenario goes in only once.
    const touched = await db('activity').whereIn('project_id', [p.kestrel.id, p.alder.id]).first('id');
    if (touched) return;
  }
  await db.transaction(async (trx) => {
    await trx('stages').whereIn('project_id', [p.kestrel.id, p.alder.id]).del();
    const plan: Record<string, Array<[string, number, Record<string, unknown>]>> = {
      [p.kestrel.id]: [
        ['approved', -40, { started_at: at(-60), submitted_at: at(-44), approved_at: at(-41) }],
        ['under_review', -2, { started_at: at(-38), submitted_at: at(-3) }],
        ['in_progress', -5, { started_at: at(-20) }],
        ['not_started', 21, {}],
        ['not_started', 35, {}],
        ['not_started', 56, {}],
      ],
      [p.alder.id]: [
        ['returned', 10, { started_at: at(-14), submitted_at: at(-4) }],
        ['not_started', 30, {}],
        ['not_started', 45, {}],
        ['not_started', 60, {}],
        ['not_started', 70, {}],
        ['not_started', 90, {}],
      ],
    };
    const assignee: Record<string, string> = { [p.kestrel.id]: u.engineerA.id, [p.alder.id]: u.engineerB.id };
    for (const [projectId, stages] of Object.entries(plan)) {
      await trx('stages').insert(
        stages.map(([state, due, times], i) => ({
          project_id: projectId,
          key: STAGE_KEYS[i],
          position: i + 1,
          state,
          assignee_id: assignee[projectId],
          due_date: dateIn(due),
          ...times,
        })),
      );
    }
    await trx('stage_comments').insert([
      {
        project_id: p.kestrel.id,
        stage_key: 'design_basis',
        author_id: u.principal.id,
        action: 'approve',
        created_at: at(-41),
        body: 'Loads and bearing pressure agree with the site investigation summary. Approved.',
      },
      {
        project_id: p.kestrel.id,
        stage_key: 'column_layout',
        author_id: u.engineerA.id,
        action: 'submit',
        created_at: at(-3),
        body: 'Grid C moved 400 mm inward along the party wall so the footings stay inside the plot. Two options for the corner column are in the notes.',
      },
      {
        project_id: p.alder.id,
        stage_key: 'design_basis',
        author_id: u.principal.id,
        action: 'return',
        created_at: at(-2),
        body: 'The hall needs the assembly imposed load, not the classroom value. Please revise and resubmit.',
      },
    ]);
    const firm = DEMO.firm.id;
    const entry = (
      projectId: string,
      actor: string,
      days: number,
      action: string,
      objectType: string,
      stageKey: string | null,
      summary: string,
    ) => ({
      firm_id: firm,
      project_id: projectId,
      actor_id: actor,
      at: at(days),
      action,
      object_type: objectType,
      object_id: stageKey ? `${projectId}:${stageKey}` : projectId,
      stage_key: stageKey,
      summary,
    });
    await trx('activity').insert([
      entry(
        p.kestrel.id,
        u.principal.id,
        -70,
        'project.created',
        'project',
        null,
        `${u.principal.name} created the project ${p.kestrel.reference} Kestrel Yard apartments`,
      ),
      entry(
        p.kestrel.id,
        u.engineerA.id,
        -44,
        'stage.submitted',
        'stage',
        'design_basis',
        `${u.engineerA.name} submitted Design basis for review`,
      ),
      entry(
        p.kestrel.id,
        u.principal.id,
        -41,
        'stage.approved',
        'stage',
        'design_basis',
        `${u.principal.name} approved Design basis`,
      ),
      entry(
        p.kestrel.id,
        u.engineerA.id,
        -20,
        'stage.started',
        'stage',
        'beam_framing',
        `${u.engineerA.name} started Beam framing`,
      ),
      entry(
        p.kestrel.id,
        u.engineerA.id,
        -3,
        'stage.submitted',
        'stage',
        'column_layout',
        `${u.engineerA.name} submitted Column layout for review`,
      ),
      entry(
        p.alder.id,
        u.principal.id,
        -30,
        'project.created',
        'project',
        null,
        `${u.principal.name} created the project ${p.alder.reference} Alder Lane school teaching block`,
      ),
      entry(
        p.alder.id,
        u.engineerB.id,
        -4,
        'stage.submitted',
        'stage',
        'design_basis',
        `${u.engineerB.name} submitted Design basis for review`,
      ),
      entry(
        p.alder.id,
        u.principal.id,
        -2,
        'stage.returned',
        'stage',
        'design_basis',
        `${u.principal.name} returned Design basis`,
      ),
    ]);
  });
}
