import type TestAgent from 'supertest/lib/agent';
import {
  SCHEME_SCHEMA_VERSION,
  schemeConflictSchema,
  schemeDetailSchema,
  schemeListSchema,
  schemeVersionListSchema,
  schemeVersionSchema,
  type SchemeDetail,
} from '@trabeate/contracts';
import { ENGINE_VERSION } from '@trabeate/structural';
import { DEMO } from '../../seeds/demo';
import { DEMO_RATES } from '../../seeds/demo-data';
import { DEMO_FOOTING_CHOICE, DEMO_SCHEMES } from '../../seeds/demo-schemes';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';

jest.setTimeout(60_000);

const KESTREL = DEMO.projects.kestrel.id;
const base = `/api/projects/${KESTREL}/schemes`;

describe('schemes: create, duplicate, rename, archive, save, history and restore', () => {
  let t: TestApp;
  let engineer: TestAgent;
  let principal: TestAgent;
  let client: TestAgent;

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    engineer = await signedInAs(t, DEMO.users.engineerA.email);
    principal = await signedInAs(t, DEMO.users.principal.email);
    client = await signedInAs(t, DEMO.users.fenwickContact.email);
  });
  afterAll(() => t.close());

  const create = async (name: string): Promise<SchemeDetail> => {
    const res = await send(engineer, 'post', base, { name });
    expect(res.status).toBe(201);
    return schemeDetailSchema.parse(res.body);
  };

  it("gives the demo project its two schemes, with the engine's results stored for each", async () => {
    const res = await principal.get(`${base}?sort=name&direction=asc`);
    expect(res.status).toBe(200);
    const list = schemeListSchema.parse(res.body);
    expect(list.items.map((s) => [s.id, s.name, s.columns])).toEqual([
      [DEMO_SCHEMES.full.id, DEMO_SCHEMES.full.name, 20],
      [DEMO_SCHEMES.fewer.id, DEMO_SCHEMES.fewer.name, 19],
    ]);
    // the principal reads but does not edit
    expect(list.canEdit).toBe(false);
    const fewer = schemeVersionSchema.parse((await principal.get(`${base}/${DEMO_SCHEMES.fewer.id}/versions/1`)).body);
    expect(fewer.checks.engineVersion).toBe(ENGINE_VERSION);
    // One column fewer leaves a beam line spanning two bays: the span check the scheme is there to show.
    expect(fewer.results.checks).toContainEqual(expect.objectContaining({ ruleId: 'beam.span', status: 'fail' }));
    const full = schemeVersionSchema.parse((await principal.get(`${base}/${DEMO_SCHEMES.full.id}/versions/1`)).body);
    expect(full.results.checks.filter((c) => c.ruleId === 'beam.span')).toEqual([]);
  });

  it("creates a scheme from the project's design basis, with version 1 and its results stored", async () => {
    const scheme = await create('Flat-slab study');
    expect(scheme).toMatchObject({ name: 'Flat-slab study', canEdit: true, archivedAt: null });
    expect(scheme.current).toMatchObject({
      version: 1,
      restoredFrom: null,
      savedBy: { id: DEMO.users.engineerA.id },
      checks: { engineVersion: ENGINE_VERSION, ok: true },
    });
    // Kestrel Yard's basis (seeds/demo.ts): EN 1992, 30 MPa, 180 kPa; 7 storeys of 3.1 m; EUR
    expect(scheme.document.basis).toMatchObject({
      codeFamily: 'EN1992',
      concreteMPa: 30,
      bearingPressureKPa: 180,
      storeys: 7,
      storeyHeightM: 3.1,
      rates: { currency: 'EUR', ...DEMO_RATES.kestrel },
    });
    expect(scheme.document).toMatchObject({ id: scheme.id, name: 'Flat-slab study', columns: [] });
    const row = await t.db('scheme_versions').where({ scheme_id: scheme.id, version: 1 }).first();
    expect(row).toMatchObject({
      schema_version: SCHEME_SCHEMA_VERSION,
      engine_version: ENGINE_VERSION,
      author_id: DEMO.users.engineerA.id,
    });
    expect(row.results.caution).toMatch(/licensed structural engineer/);
  });

  it("starts a new scheme at the project's unit rates, as the principal last set them, in the project's currency", async () => {
    const project = (await principal.get(`/api/projects/${KESTREL}/full`)).body;
    const rates = { concretePerM3: 162.5, steelPerKg: 1.9, formworkPerM2: 41 };
    const edit = await send(principal, 'patch', `/api/projects/${KESTREL}`, {
      designBasis: { ...project.designBasis, rates },
    });
    expect(edit.status).toBe(200);
    try {
      const scheme = await create('Rates study');
      expect(scheme.document.basis.rates).toEqual({ currency: 'EUR', ...rates });
      // the demo schemes were priced too, so the comparison has costs to compare
      const demo = schemeDetailSchema.parse((await engineer.get(`${base}/${DEMO_SCHEMES.fewer.id}`)).body);
      expect(demo.document.basis.rates.concretePerM3).toBeGreaterThan(0);
      // a negative rate is refused, naming the field
      const bad = await send(principal, 'patch', `/api/projects/${KESTREL}`, {
        designBasis: { ...project.designBasis, rates: { ...rates, steelPerKg: -1 } },
      });
      expect(bad.status).toBe(400);
      expect(Object.keys(bad.body.error.fields ?? {})).toContain('body.designBasis.rates.steelPerKg');
    } finally {
      await send(principal, 'patch', `/api/projects/${KESTREL}`, { designBasis: project.designBasis });
    }
  });

  it('saves the next version when nothing newer exists, and stores what the engine found in it', async () => {
    const source = schemeDetailSchema.parse((await engineer.get(`${base}/${DEMO_SCHEMES.full.id}`)).body);
    const copy = schemeDetailSchema.parse(
      (await send(engineer, 'post', `${base}/${DEMO_SCHEMES.full.id}/duplicate`, {})).body,
    );
    expect(copy.name).toBe(`${DEMO_SCHEMES.full.name} (copy)`);
    expect(copy.current.version).toBe(1);
    expect(copy.document.columns).toEqual(source.document.columns);

    // Leave out C3, as the demo's second scheme does: the span warning must appear in the stored results.
    const document = { ...copy.document, columns: copy.document.columns.filter((c) => c.id !== 'C3') };
    const res = await send(engineer, 'put', `${base}/${copy.id}/document`, { baseVersion: 1, document });
    expect(res.status).toBe(200);
    const saved = schemeDetailSchema.parse(res.body);
    expect(saved.current).toMatchObject({ version: 2, checks: { engineVersion: ENGINE_VERSION } });
    expect(saved.current.checks.warnings).toBeGreaterThan(copy.current.checks.warnings);
    const stored = await t.db('scheme_versions').where({ scheme_id: copy.id, version: 2 }).first();
    expect(stored.document.columns).toHaveLength(19);
    expect(stored.results.checks).toContainEqual(expect.objectContaining({ ruleId: 'beam.span', status: 'fail' }));
    expect(await t.db('schemes').where({ id: copy.id }).first('current_version')).toEqual({ current_version: 2 });
  });

  it('refuses a save over a newer version with 409 and the version that is current, storing nothing', async () => {
    const scheme = await create('Conflict study');
    const first = await send(engineer, 'put', `${base}/${scheme.id}/document`, {
      baseVersion: 1,
      document: { ...scheme.document, stairs: [] },
    });
    expect(first.status).toBe(200);
    // A second editor that also started from version 1
    const late = await send(engineer, 'put', `${base}/${scheme.id}/document`, {
      baseVersion: 1,
      document: scheme.document,
    });
    expect(late.status).toBe(409);
    const conflict = schemeConflictSchema.parse(late.body);
    expect(conflict.current).toMatchObject({ version: 2, savedBy: { id: DEMO.users.engineerA.id } });
    expect(conflict.error.message).toMatch(/version 2/);
    expect(await t.db('scheme_versions').where({ scheme_id: scheme.id }).count('* as n')).toEqual([{ n: '2' }]);
  });

  it('lets only one of two saves from the same version through when they arrive together', async () => {
    const scheme = await create('Race study');
    const body = { baseVersion: 1, document: scheme.document };
    const answers = await Promise.all([
      send(engineer, 'put', `${base}/${scheme.id}/document`, body),
      send(engineer, 'put', `${base}/${scheme.id}/document`, body),
      send(engineer, 'put', `${base}/${scheme.id}/document`, body),
    ]);
    expect(answers.map((r) => r.status).sort()).toEqual([200, 409, 409]);
    const versions = await t.db('scheme_versions').where({ scheme_id: scheme.id }).orderBy('version').pluck('version');
    expect(versions).toEqual([1, 2]);
  });

  it('refuses a document that is not a scheme, naming the field, and one newer than the server reads', async () => {
    const scheme = await create('Bad input study');
    const bad = await send(engineer, 'put', `${base}/${scheme.id}/document`, {
      baseVersion: 1,
      document: { ...scheme.document, columns: [{ id: 'X1', label: 'X1', x: 1, y: 1, widthMm: -300 }] },
    });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toContain('body.document.columns.0.widthMm');
    const newer = await send(engineer, 'put', `${base}/${scheme.id}/document`, {
      baseVersion: 1,
      document: { ...scheme.document, schemaVersion: 3 },
    });
    expect(newer.status).toBe(400);
    expect(newer.body.error.message).toMatch(/version 3, newer than this server reads/);
    expect(await t.db('scheme_versions').where({ scheme_id: scheme.id }).count('* as n')).toEqual([{ n: '1' }]);
  });

  it('keeps footing choices through a save, reads an older stored save upgraded, and names a blank reason', async () => {
    const demo = schemeDetailSchema.parse((await engineer.get(`${base}/${DEMO_SCHEMES.full.id}`)).body);
    expect(demo.document.schemaVersion).toBe(2);
    expect(demo.document.footingChoices).toEqual([DEMO_FOOTING_CHOICE]);

    const scheme = schemeDetailSchema.parse(
      (await send(engineer, 'post', `${base}/${DEMO_SCHEMES.full.id}/duplicate`, { name: 'Footing study' })).body,
    );
    const choices = [
      { columnId: 'D4', option: 'combinedRectangular', reason: 'One pad under D4 and C4 is simpler to set out.' },
      { columnId: 'D5', option: 'shift', reason: 'Moving D5 in by 0.75 m suits the stair well.' },
    ];
    const saved = await send(engineer, 'put', `${base}/${scheme.id}/document`, {
      baseVersion: 1,
      document: { ...scheme.document, footingChoices: choices },
    });
    expect(saved.status).toBe(200);
    const back = schemeDetailSchema.parse((await engineer.get(`${base}/${scheme.id}`)).body);
    expect(back.document.footingChoices).toEqual(choices);
    expect(back.current.schemaVersion).toBe(2);
    // the record does not change the engine's results: a chosen shift is not a moved column
    const [v1, v2] = await t
      .db('scheme_versions')
      .where({ scheme_id: scheme.id })
      .orderBy('version')
      .select('results', 'schema_version');
    expect(v2.results.footings).toEqual(v1.results.footings);
    expect(v2.schema_version).toBe(2);

    // A save stored under version 1 (before footing choices existed) is read back as version 2.
    const { footingChoices: _c, ...older } = { ...scheme.document, schemaVersion: 1 };
    await t
      .db('scheme_versions')
      .where({ scheme_id: scheme.id, version: 1 })
      .update({
        document: JSON.stringify(older),
        schema_version: 1,
      });
    const upgraded = schemeVersionSchema.parse((await engineer.get(`${base}/${scheme.id}/versions/1`)).body);
    expect(upgraded.document).toMatchObject({ schemaVersion: 2, footingChoices: [] });
    expect(upgraded.document.columns).toEqual(scheme.document.columns);
    // and a version 1 document sent by an older client is saved upgraded
    const fromOlder = await send(engineer, 'put', `${base}/${scheme.id}/document`, { baseVersion: 2, document: older });
    expect(fromOlder.status).toBe(200);
    expect(schemeDetailSchema.parse(fromOlder.body).document.footingChoices).toEqual([]);

    const blank = await send(engineer, 'put', `${base}/${scheme.id}/document`, {
      baseVersion: 3,
      document: { ...scheme.document, footingChoices: [{ columnId: 'D4', option: 'strap', reason: '  ' }] },
    });
    expect(blank.status).toBe(400);
    expect(Object.keys(blank.body.error.fields)).toEqual(['body.document.footingChoices.0.reason']);
    expect(await t.db('scheme_versions').where({ scheme_id: scheme.id }).count('* as n')).toEqual([{ n: '3' }]);
  });

  it('keeps every save with who and when, opens an earlier one, and restores it as a new save', async () => {
    const scheme = await create('History study');
    const withStair = scheme.document;
    const v2 = { ...withStair, stairs: [] };
    expect(
      (await send(engineer, 'put', `${base}/${scheme.id}/document`, { baseVersion: 1, document: v2 })).status,
    ).toBe(200);
    const history = schemeVersionListSchema.parse((await principal.get(`${base}/${scheme.id}/versions`)).body);
    expect(history.total).toBe(2);
    expect(history.items.map((v) => [v.version, v.savedBy?.displayName])).toEqual([
      [2, DEMO.users.engineerA.name],
      [1, DEMO.users.engineerA.name],
    ]);
    const one = schemeVersionSchema.parse((await principal.get(`${base}/${scheme.id}/versions/1`)).body);
    expect(one.document.boundary).toEqual(withStair.boundary);

    const restored = await send(engineer, 'post', `${base}/${scheme.id}/versions/1/restore`);
    expect(restored.status).toBe(201);
    const detail = schemeDetailSchema.parse(restored.body);
    expect(detail.current).toMatchObject({ version: 3, restoredFrom: 1 });
    expect(detail.document).toEqual({ ...withStair, name: 'History study' });
    expect((await principal.get(`${base}/${scheme.id}/versions/9`)).status).toBe(404);
  });

  it('pages the saves newest first: page and pageSize checked by the contract, the total on every page', async () => {
    const scheme = await create('Paging study');
    for (let v = 1; v <= 4; v++) {
      const doc = { ...scheme.document, stairs: scheme.document.stairs.map((f) => ({ ...f, risers: 8 + v })) };
      const res = await send(engineer, 'put', `${base}/${scheme.id}/document`, { baseVersion: v, document: doc });
      expect(res.status).toBe(200);
    }
    const page = async (query: string) => {
      const res = await principal.get(`${base}/${scheme.id}/versions?${query}`);
      expect(res.status).toBe(200);
      return schemeVersionListSchema.parse(res.body);
    };
    const first = await page('page=1&pageSize=2');
    expect([first.items.map((v) => v.version), first.total, first.page, first.pageSize]).toEqual([[5, 4], 5, 1, 2]);
    const last = await page('page=3&pageSize=2');
    expect([last.items.map((v) => v.version), last.total, last.page]).toEqual([[1], 5, 3]);
    // beyond the last page: nothing on it, and the total still says how many there are
    const beyond = await page('page=4&pageSize=2');
    expect([beyond.items, beyond.total]).toEqual([[], 5]);
    // without a query: the contract's defaults (page 1 of 25)
    const plain = await page('');
    expect([plain.items.length, plain.page, plain.pageSize]).toEqual([5, 1, 25]);

    for (const bad of ['page=0', 'pageSize=0', 'pageSize=101', 'page=two', 'pageSize=2.5']) {
      const res = await principal.get(`${base}/${scheme.id}/versions?${bad}`);
      expect([bad, res.status]).toEqual([bad, 400]);
      expect(res.body.error.code).toEqual(expect.any(String));
    }
  });

  it('renames and archives; an archived scheme leaves the active list and refuses saves until restored', async () => {
    const scheme = await create('Rename study');
    const renamed = await send(engineer, 'patch', `${base}/${scheme.id}`, { name: 'Transfer-beam study' });
    expect(renamed.status).toBe(200);
    expect(schemeDetailSchema.parse(renamed.body)).toMatchObject({
      name: 'Transfer-beam study',
      document: { name: 'Transfer-beam study' },
      current: { version: 1 },
    });
    expect((await send(engineer, 'patch', `${base}/${scheme.id}`, { name: '  ' })).status).toBe(400);

    expect((await send(engineer, 'post', `${base}/${scheme.id}/archive`)).body.archivedAt).toEqual(expect.any(String));
    const active = schemeListSchema.parse((await engineer.get(base)).body);
    expect(active.items.map((s) => s.id)).not.toContain(scheme.id);
    const archived = schemeListSchema.parse((await engineer.get(`${base}?status=archived`)).body);
    expect(archived.items.map((s) => s.id)).toEqual([scheme.id]);
    const refused = await send(engineer, 'put', `${base}/${scheme.id}/document`, {
      baseVersion: 1,
      document: scheme.document,
    });
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toMatch(/archived/);
    expect((await send(engineer, 'post', `${base}/${scheme.id}/restore`)).body.archivedAt).toBeNull();
  });

  it('pages and sorts the list on the server', async () => {
    const page = schemeListSchema.parse((await engineer.get(`${base}?pageSize=2&page=1&sort=name&direction=asc`)).body);
    expect(page.items).toHaveLength(2);
    expect(page.total).toBeGreaterThan(2);
    const names = page.items.map((s) => s.name.toLowerCase());
    expect(names).toEqual([...names].sort());
    const next = schemeListSchema.parse((await engineer.get(`${base}?pageSize=2&page=2&sort=name&direction=asc`)).body);
    expect(next.items[0].name.toLowerCase() >= names[1]).toBe(true);
  });

  it("refuses every change in an archived project, and the principal's and a client's edits with the reason", async () => {
    const byPrincipal = await send(principal, 'post', base, { name: 'Principal study' });
    expect(byPrincipal.status).toBe(403);
    expect(byPrincipal.body.error.message).toMatch(/project's engineers/);
    const byClient = await client.get(base);
    expect(byClient.status).toBe(403);
    expect(byClient.body.error.message).toMatch(/firm's working files/);

    await t.db('projects').where({ id: KESTREL }).update({ archived_at: new Date() });
    try {
      const res = await send(engineer, 'post', base, { name: 'Too late' });
      expect(res.status).toBe(409);
      expect(res.body.error.message).toMatch(/archived/);
      expect((await engineer.get(base)).status).toBe(200);
    } finally {
      await t.db('projects').where({ id: KESTREL }).update({ archived_at: null });
    }
  });

  it('answers 404 for a scheme of another project, as for one that does not exist', async () => {
    const scheme = await create('Elsewhere study');
    const other = `/api/projects/${DEMO.projects.alder.id}/schemes/${scheme.id}`;
    expect((await principal.get(other)).status).toBe(404);
  });
});
