import type TestAgent from 'supertest/lib/agent';
import {
  activityListSchema,
  projectListSchema,
  projectPageSchema,
  STAGE_KEYS,
  type ProjectCreate,
} from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { DEMO_RATES } from '../../seeds/demo-data';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';

jest.setTimeout(30_000);

const basis = {
  codeFamily: 'EN1992',
  concreteMPa: 30,
  steelMPa: 500,
  imposedKPa: 2.5,
  superimposedDeadKPa: 1.5,
  bearingPressureKPa: 200,
  foundingDepthM: 1.4,
} as const;
const project = (n: number, extra: Partial<ProjectCreate> = {}): ProjectCreate => ({
  reference: `SQ-T-${String(n).padStart(3, '0')}`,
  name: `Test block ${n}`,
  clientOrganisationId: n % 2 ? DEMO.clients.fenwick.id : DEMO.clients.harbourlight.id,
  siteAddress: `${n} Ropewalk, Marrowby`,
  buildingUse: 'Offices',
  storeys: (n % 9) + 1,
  storeyHeightM: 3.2,
  floorAreaM2: 800,
  estimatedCost: 1_000_000 + n,
  currency: 'EUR',
  designBasis: basis,
  ...extra,
});

describe('projects: create, edit, archive, list with paging and filters', () => {
  let t: TestApp;
  let principal: TestAgent;
  let engineer: TestAgent;
  let client: TestAgent;

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    principal = await signedInAs(t, DEMO.users.principal.email);
    engineer = await signedInAs(t, DEMO.users.engineerA.email);
    client = await signedInAs(t, DEMO.users.fenwickContact.email);
  });
  afterAll(() => t.close());

  it('the principal creates a project with its six stages, not started, and an activity entry', async () => {
    const res = await send(principal, 'post', '/api/projects', project(1));
    expect(res.status).toBe(201);
    const page = projectPageSchema.parse(res.body);
    expect(page).toMatchObject({
      reference: 'SQ-T-001',
      storeys: 2,
      designBasis: basis,
      archivedAt: null,
      finance: { estimatedCost: 1_000_001, currency: 'EUR' },
    });
    expect(page.stages.map((s) => [s.key, s.state, s.position])).toEqual(
      STAGE_KEYS.map((k, i) => [k, 'not_started', i + 1]),
    );
    const activity = await t.db('activity').where({ project_id: page.id });
    expect(activity).toEqual([
      expect.objectContaining({
        action: 'project.created',
        object_type: 'project',
        object_id: page.id,
        actor_id: DEMO.users.principal.id,
      }),
    ]);
  });

  it("keeps the project's unit rates with its design basis for the firm, and keeps them from the client", async () => {
    const rates = { concretePerM3: 151, steelPerKg: 1.42, formworkPerM2: 29.5 };
    const res = await send(principal, 'post', '/api/projects', project(9, { designBasis: { ...basis, rates } }));
    expect(res.status).toBe(201);
    const stored = await t.db('projects').where({ id: res.body.id }).first('design_basis');
    expect(stored.design_basis.rates).toEqual(rates);
    expect(projectPageSchema.parse(res.body)).toMatchObject({ designBasis: { rates }, currency: 'EUR' });
    const kestrel = `/api/projects/${DEMO.projects.kestrel.id}/full`;
    const asEngineer = projectPageSchema.parse((await engineer.get(kestrel)).body);
    expect(asEngineer.designBasis?.rates).toEqual(DEMO_RATES.kestrel);
    const asClient = projectPageSchema.parse((await client.get(kestrel)).body);
    expect(asClient.designBasis).toMatchObject({ codeFamily: 'EN1992' });
    expect(asClient.designBasis?.rates).toBeUndefined();
  });

  it('refuses a reference the firm already uses, naming the field', async () => {
    const res = await send(
      principal,
      'post',
      '/api/projects',
      project(2, { reference: DEMO.projects.kestrel.reference }),
    );
    expect(res.status).toBe(409);
    expect(res.body.error.fields).toEqual({ 'body.reference': ['already used by another project of the firm'] });
    expect(await t.db('projects').where({ name: 'Test block 2' }).first()).toBeUndefined();
  });

  it('names each invalid field, nested ones included', async () => {
    const res = await send(principal, 'post', '/api/projects', {
      ...project(3),
      storeys: 0,
      currency: 'euro',
      designBasis: { ...basis, concreteMPa: 5 },
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual([
      'body.currency',
      'body.designBasis.concreteMPa',
      'body.storeys',
    ]);
    const unknownOrg = await send(
      principal,
      'post',
      '/api/projects',
      project(4, { clientOrganisationId: '0b8c2d1e-0000-4000-8000-00000000ffff' }),
    );
    expect(unknownOrg.status).toBe(400);
    expect(unknownOrg.body.error.fields).toHaveProperty(['body.clientOrganisationId']);
  });

  it('engineers and clients cannot create projects', async () => {
    expect((await send(engineer, 'post', '/api/projects', project(5))).status).toBe(403);
    expect((await send(client, 'post', '/api/projects', project(6))).status).toBe(403);
  });

  it('edits some fields, records which changed, and answers the same when nothing changed', async () => {
    const created = projectPageSchema.parse((await send(principal, 'post', '/api/projects', project(7))).body);
    const res = await send(principal, 'patch', `/api/projects/${created.id}`, {
      name: 'Test block seven',
      storeys: 5,
      designBasis: { ...basis, imposedKPa: 3 },
    });
    expect(res.status).toBe(200);
    expect(projectPageSchema.parse(res.body)).toMatchObject({
      name: 'Test block seven',
      storeys: 5,
      designBasis: { imposedKPa: 3 },
      siteAddress: '7 Ropewalk, Marrowby',
    });
    const entry = await t.db('activity').where({ project_id: created.id, action: 'project.updated' }).first();
    expect(entry.details.fields.sort()).toEqual(['designBasis', 'name', 'storeys']);
    expect(entry.summary).toBe('Ines Varga-Holm changed the name, storeys, design basis');
    const again = await send(principal, 'patch', `/api/projects/${created.id}`, { name: 'Test block seven' });
    expect(again.status).toBe(200);
    expect(await t.db('activity').where({ project_id: created.id, action: 'project.updated' })).toHaveLength(1);
    expect((await send(principal, 'patch', `/api/projects/${created.id}`, {})).status).toBe(400);
  });

  it('archives instead of deleting: an archived project leaves the active list, refuses edits and comes back when restored', async () => {
    const created = projectPageSchema.parse((await send(principal, 'post', '/api/projects', project(8))).body);
    const archived = await send(principal, 'post', `/api/projects/${created.id}/archive`);
    expect(archived.status).toBe(200);
    expect(archived.body.archivedAt).toEqual(expect.any(String));
    expect(archived.body.abilities.work).toBe(false);
    expect((await send(principal, 'post', `/api/projects/${created.id}/archive`)).status).toBe(409);
    const edit = await send(principal, 'patch', `/api/projects/${created.id}`, { name: 'Changed' });
    expect(edit.status).toBe(409);
    expect(edit.body.error.message).toMatch(/archived/);
    const active = projectListSchema.parse((await principal.get('/api/projects?q=SQ-T-008')).body);
    expect(active.total).toBe(0);
    const inArchive = projectListSchema.parse((await principal.get('/api/projects?q=SQ-T-008&status=archived')).body);
    expect(inArchive.items.map((p) => [p.reference, p.archived])).toEqual([['SQ-T-008', true]]);
    expect((await send(principal, 'post', `/api/projects/${created.id}/restore`)).body.archivedAt).toBeNull();
    const log = activityListSchema.parse(
      (await principal.get(`/api/projects/${created.id}/activity?objectType=project`)).body,
    );
    expect(log.items.map((a) => a.action)).toEqual(['project.restored', 'project.archived', 'project.created']);
    expect(await t.db('projects').where({ id: created.id }).first()).toBeDefined();
  });

  describe('the list of many projects', () => {
    beforeAll(async () => {
      // 40 more projects, straight into the table, each with its stages as the API makes them.
      for (let n = 100; n < 140; n++) {
        const p = project(n);
        const [{ id }] = await t
          .db('projects')
          .insert({
            firm_id: DEMO.firm.id,
            reference: p.reference,
            name: p.name,
            client_organisation_id: p.clientOrganisationId,
            site_address: p.siteAddress,
            storeys: p.storeys,
            updated_at: new Date(Date.UTC(2026, 0, 1) + n * 3_600_000),
          })
          .returning('id');
        await t.db('stages').insert(STAGE_KEYS.map((key, i) => ({ project_id: id, key, position: i + 1 })));
      }
    });

    it('pages through the projects in the order asked, with the total', async () => {
      const first = projectListSchema.parse(
        (await principal.get('/api/projects?q=SQ-T-1&sort=reference&direction=asc&pageSize=15')).body,
      );
      expect(first.total).toBe(40);
      expect(first.items.map((p) => p.reference)).toEqual(Array.from({ length: 15 }, (_, i) => `SQ-T-${100 + i}`));
      const third = projectListSchema.parse(
        (await principal.get('/api/projects?q=SQ-T-1&sort=reference&direction=asc&pageSize=15&page=3')).body,
      );
      expect(third.items.map((p) => p.reference)).toEqual(Array.from({ length: 10 }, (_, i) => `SQ-T-${130 + i}`));
      const beyond = projectListSchema.parse((await principal.get('/api/projects?q=SQ-T-1&pageSize=15&page=9')).body);
      expect(beyond).toMatchObject({ items: [], total: 40, page: 9 });
    });

    it('sorts by storeys, by client and by last change', async () => {
      const byStoreys = projectListSchema.parse(
        (await principal.get('/api/projects?q=SQ-T-1&sort=storeys&direction=desc&pageSize=100')).body,
      ).items;
      const storeys = byStoreys.map((p) => p.storeys);
      expect(storeys).toEqual([...storeys].sort((a, b) => b - a));
      const byClient = projectListSchema.parse(
        (await principal.get('/api/projects?q=SQ-T-1&sort=client&direction=asc&pageSize=100')).body,
      ).items;
      expect(byClient[0].clientOrganisation.name).toBe(DEMO.clients.fenwick.name);
      expect(byClient[39].clientOrganisation.name).toBe(DEMO.clients.harbourlight.name);
      const recent = projectListSchema.parse(
        (await principal.get('/api/projects?q=SQ-T-1&sort=updatedAt&direction=desc&pageSize=2')).body,
      ).items;
      expect(recent.map((p) => p.reference)).toEqual(['SQ-T-139', 'SQ-T-138']);
    });

    it('filters by client organisation and by text in the name, reference, site or client, with % taken literally', async () => {
      const fenwick = projectListSchema.parse(
        (await principal.get(`/api/projects?q=SQ-T-1&clientOrganisationId=${DEMO.clients.fenwick.id}&pageSize=100`))
          .body,
      );
      expect(fenwick.total).toBe(20);
      expect(fenwick.items.every((p) => p.clientOrganisation.id === DEMO.clients.fenwick.id)).toBe(true);
      const byName = projectListSchema.parse((await principal.get('/api/projects?q=test%20block%20117')).body);
      expect(byName.items.map((p) => p.reference)).toEqual(['SQ-T-117']);
      const byClientName = projectListSchema.parse(
        (await principal.get('/api/projects?q=harbourlight&pageSize=100')).body,
      );
      expect(byClientName.items.every((p) => p.clientOrganisation.name === DEMO.clients.harbourlight.name)).toBe(true);
      expect((await principal.get('/api/projects?q=%25')).body.total).toBe(0);
    });

    it('names the query field that is wrong', async () => {
      const res = await principal.get('/api/projects?pageSize=500&sort=colour');
      expect(res.status).toBe(400);
      expect(Object.keys(res.body.error.fields).sort()).toEqual(['query.pageSize', 'query.sort']);
    });

    it("shows each project's current stage and how many stages are late", async () => {
      const list = projectListSchema.parse(
        (await principal.get('/api/projects?pageSize=100&sort=reference&direction=asc')).body,
      );
      const kestrel = list.items.find((p) => p.id === DEMO.projects.kestrel.id)!;
      // Seeded: design basis approved, column layout under review (due 2 days ago), beam framing in
      // progress (due 5 days ago). Only beam framing is late: the review waits on the principal.
      expect(kestrel.currentStage).toEqual({ key: 'column_layout', title: 'Column layout', state: 'under_review' });
      expect(kestrel.lateStages).toBe(1);
    });

    it('lists for an engineer and a client only the projects they may see', async () => {
      const mine = projectListSchema.parse((await engineer.get('/api/projects?pageSize=100')).body);
      expect(mine.items.map((p) => p.id)).toEqual([DEMO.projects.kestrel.id]);
      expect(mine.total).toBe(1);
      const theirs = projectListSchema.parse(
        (await client.get(`/api/projects?clientOrganisationId=${DEMO.clients.harbourlight.id}`)).body,
      );
      expect(theirs.total).toBe(0);
    });
  });
});
