import type TestAgent from 'supertest/lib/agent';
import {
  activityListSchema,
  checkKey,
  schemeResultsSchema,
  stageSchema,
  schemeReportSchema,
  stageSubmissionListSchema,
  type StageKey,
} from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { DEMO_SCHEMES, kestrelSchemes } from '../../seeds/demo-schemes';
import { insertNewScheme } from '../../apps/server/src/schemes/schemes.service';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs, until } from '../support/agents';

jest.setTimeout(30_000);

// The check gate in front of a stage's review: Column layout is submitted with a scheme version,
// its error-level checks (as the save stored them) each answered by a justification, and the
// principal's decision is recorded against that version, with the draft invoice approval offers.
// The scheme with one error is the demo's scheme B (one interior column left out), whose stored
// results hold exactly one failing error-level check; the tests read which one from the stored
// results rather than assuming it.
describe('stage review: the check gate, justifications and the decision by version', () => {
  let t: TestApp;
  let principal: TestAgent;
  let tomas: TestAgent; // assigned engineer
  let client: TestAgent;
  let projectId: string;
  let withError: string; // scheme id: one error-level check
  let clean: string; // scheme id: no error-level check
  let errorChecks: Array<{ ruleId: string; elements: string[]; message: string }>;

  const stagePath = (key: StageKey) => `/api/projects/${projectId}/stages/${key}`;
  const move = (api: TestAgent, key: StageKey, body: object) =>
    send(api, 'post', `${stagePath(key)}/transitions`, body);
  const state = async (key: StageKey) => (await t.db('stages').where({ project_id: projectId, key }).first()).state;
  const submissions = async (key: StageKey) =>
    stageSubmissionListSchema.parse((await principal.get(`${stagePath(key)}/submissions`)).body).items;
  const justification = (text = 'B3 is carried on a deepened transfer beam; column sized in the next stage.') =>
    errorChecks.map((c) => ({ ruleId: c.ruleId, elements: c.elements, text }));

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    principal = await signedInAs(t, DEMO.users.principal.email);
    tomas = await signedInAs(t, DEMO.users.engineerA.email);
    client = await signedInAs(t, DEMO.users.fenwickContact.email);
    const created = await send(principal, 'post', '/api/projects', {
      reference: 'SQ-RV-1',
      name: 'Stage review test',
      clientOrganisationId: DEMO.clients.fenwick.id,
      storeys: 7,
      storeyHeightM: 3.1,
      currency: 'EUR',
      designBasis: {
        codeFamily: 'EN1992',
        concreteMPa: 30,
        steelMPa: 500,
        imposedKPa: 2,
        superimposedDeadKPa: 1.5,
        bearingPressureKPa: 180,
        foundingDepthM: 1.5,
      },
    });
    projectId = created.body.id;
    await send(principal, 'put', `/api/projects/${projectId}/members/${DEMO.users.fenwickContact.id}`);
    for (const key of ['column_layout', 'design_basis', 'beam_framing', 'foundations'] as const)
      await send(principal, 'patch', stagePath(key), { assigneeId: DEMO.users.engineerA.id });
    const agreement = await send(principal, 'put', `/api/projects/${projectId}/fee-agreement`, {
      basis: 'lump_sum',
      lumpSumMinor: 1_000_000,
      currency: 'EUR',
      taxRateBp: 2000,
      taxLabel: 'VAT',
      paymentTermsDays: 30,
      billingContactId: DEMO.users.fenwickContact.id,
      stageShares: {
        design_basis: 1000,
        column_layout: 2000,
        beam_framing: 2500,
        slab_panels: 2000,
        stairs: 500,
        foundations: 2000,
      },
    });
    expect(agreement.status).toBe(200);

    const docs = kestrelSchemes({ codeFamily: 'EN1992', concreteMPa: 30, bearingPressureKPa: 180 });
    await t.db.transaction(async (trx) => {
      const common = { firmId: DEMO.firm.id, projectId, authorId: DEMO.users.engineerA.id };
      withError = await insertNewScheme(trx, { ...common, name: 'One column fewer', document: () => docs.fewer });
      clean = await insertNewScheme(trx, { ...common, name: 'Full grid', document: () => docs.full });
    });
    const stored = await t.db('scheme_versions').where({ scheme_id: withError, version: 1 }).first('results');
    errorChecks = schemeResultsSchema
      .parse(stored.results)
      .checks.filter((c) => c.status === 'fail' && c.severity === 'error');
    // The premise of the scenario: exactly one error-level check in the stored results.
    expect(errorChecks).toHaveLength(1);
    expect((await move(tomas, 'column_layout', { action: 'start' })).status).toBe(200);
  });
  afterAll(() => t.close());

  it('refuses to submit Column layout without a scheme (400 naming the field)', async () => {
    const res = await move(tomas, 'column_layout', { action: 'submit' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty(['body.scheme']);
    expect(await state('column_layout')).toBe('in_progress');
  });

  it('refuses with 409 naming each unjustified error-level check by rule id and element', async () => {
    const res = await move(tomas, 'column_layout', { action: 'submit', scheme: { schemeId: withError } });
    expect(res.status).toBe(409);
    const [only] = errorChecks;
    expect(res.body.error.message).toContain(`${only.ruleId} @ ${only.elements.join(', ')}`);
    expect(res.body.error.message).toContain('version 1');
    expect(Object.keys(res.body.error.fields)).toEqual([checkKey(only)]);
    expect(await state('column_layout')).toBe('in_progress');
    expect(await t.db('stage_submissions').where({ project_id: projectId })).toHaveLength(0);
  });

  it('refuses an empty or whitespace-only justification with 400', async () => {
    for (const text of ['', '   \n\t']) {
      const res = await move(tomas, 'column_layout', {
        action: 'submit',
        scheme: { schemeId: withError, version: 1 },
        justifications: errorChecks.map((c) => ({ ruleId: c.ruleId, elements: c.elements, text })),
      });
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
    }
    expect(await state('column_layout')).toBe('in_progress');
  });

  it('refuses a justification for a check that is not an error at that version with 400', async () => {
    const res = await move(tomas, 'column_layout', {
      action: 'submit',
      scheme: { schemeId: withError },
      justifications: [...justification(), { ruleId: 'column.capacity', elements: ['Z99'], text: 'No such column.' }],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toContain('column.capacity @ Z99');
    expect(res.body.error.fields).toHaveProperty(['body.justifications.1']);
    // A warning is not something the gate asks to justify either.
    const stored = await t.db('scheme_versions').where({ scheme_id: withError, version: 1 }).first('results');
    const warning = schemeResultsSchema
      .parse(stored.results)
      .checks.find((c) => c.status === 'fail' && c.severity === 'warning')!;
    const onWarning = await move(tomas, 'column_layout', {
      action: 'submit',
      scheme: { schemeId: withError },
      justifications: [...justification(), { ruleId: warning.ruleId, elements: warning.elements, text: 'Fine.' }],
    });
    expect(onWarning.status).toBe(400);
  });

  it('refuses an unknown scheme or version with 400, and a scheme on a stage that has none', async () => {
    const unknownVersion = await move(tomas, 'column_layout', {
      action: 'submit',
      scheme: { schemeId: clean, version: 9 },
    });
    expect(unknownVersion.status).toBe(400);
    expect(unknownVersion.body.error.fields).toHaveProperty(['body.scheme.version']);
    const otherProject = await move(tomas, 'column_layout', {
      action: 'submit',
      scheme: { schemeId: '0b8c2d1e-0000-4000-8000-000000000402' }, // Kestrel Yard's, not this project's
    });
    expect(otherProject.status).toBe(400);
    await move(tomas, 'design_basis', { action: 'start' });
    const onDesignBasis = await move(tomas, 'design_basis', { action: 'submit', scheme: { schemeId: clean } });
    expect(onDesignBasis.status).toBe(400);
  });

  it('accepts the submission with a justification and records the version, check summary and justification', async () => {
    const res = await move(tomas, 'column_layout', {
      action: 'submit',
      comment: 'Scheme with C3 left out.',
      scheme: { schemeId: withError },
      justifications: justification('  B3 is carried on a deepened transfer beam.  '),
    });
    expect(res.status).toBe(200);
    expect(stageSchema.parse(res.body).state).toBe('under_review');

    const row = await t.db('stage_submissions').where({ project_id: projectId, stage_key: 'column_layout' }).first();
    expect(row).toMatchObject({ scheme_id: withError, scheme_version: 1, submitted_by: DEMO.users.engineerA.id });
    expect(row.justifications).toEqual([
      {
        ruleId: errorChecks[0].ruleId,
        elements: errorChecks[0].elements,
        text: 'B3 is carried on a deepened transfer beam.',
      },
    ]);
    const [latest] = await submissions('column_layout');
    expect(latest.scheme).toEqual({
      id: withError,
      name: 'One column fewer',
      version: 1,
      currentVersion: 1,
      changedSinceSubmitted: false,
      report: null,
    });
    // The summary counts what the save stored (error_count there also counts input problems: none here).
    const counts = await t.db('scheme_versions').where({ scheme_id: withError, version: 1 }).first();
    expect(latest.checks).toMatchObject({ errors: counts.error_count, warnings: counts.warning_count });
    expect(latest.checks!.rules[0]).toMatchObject({ ruleId: errorChecks[0].ruleId, errors: 1 });
    expect(latest.checks!.failing[0]).toMatchObject({ severity: 'error', elements: errorChecks[0].elements });
    expect(latest.decision).toBeNull();

    const log = activityListSchema.parse((await principal.get(`/api/projects/${projectId}/activity`)).body);
    expect(log.items[0].summary).toBe(
      `${DEMO.users.engineerA.name} submitted Column layout for review (One column fewer, version 1), with 1 error-level check justified`,
    );
  });

  it('shows "changed since submitted" once the scheme is saved again', async () => {
    const detail = await tomas.get(`/api/projects/${projectId}/schemes/${withError}`);
    const saved = await send(tomas, 'put', `/api/projects/${projectId}/schemes/${withError}/document`, {
      baseVersion: 1,
      document: detail.body.document,
    });
    expect(saved.status).toBe(200);
    const [latest] = await submissions('column_layout');
    expect(latest.scheme).toMatchObject({ version: 1, currentVersion: 2, changedSinceSubmitted: true });
  });

  it("the demo's Column layout under review rests on scheme A's first save, with its stored summary", async () => {
    const res = await principal.get(`/api/projects/${DEMO.projects.kestrel.id}/stages/column_layout/submissions`);
    const [seeded] = stageSubmissionListSchema.parse(res.body).items;
    expect(seeded.scheme).toMatchObject({ id: DEMO_SCHEMES.full.id, version: 1 });
    const stored = await t.db('scheme_versions').where({ scheme_id: DEMO_SCHEMES.full.id, version: 1 }).first();
    expect(seeded.checks).toMatchObject({ errors: 0, warnings: stored.warning_count });
    expect(seeded.decision).toBeNull();
  });

  it('keeps clients to the stage progress: the submissions and their checks answer 403', async () => {
    const res = await client.get(`${stagePath('column_layout')}/submissions`);
    expect(res.status).toBe(403);
    const stages = await client.get(`/api/projects/${projectId}/stages`);
    expect(stages.status).toBe(200);
    expect(JSON.stringify(stages.body)).not.toMatch(/justif|column\.capacity/);
  });

  it('a return is recorded against the version; a resubmission with a clean scheme passes with no justification', async () => {
    const returned = await move(principal, 'column_layout', { action: 'return', comment: 'Try the full grid.' });
    expect(returned.status).toBe(200);
    const [first] = await submissions('column_layout');
    expect(first.decision).toMatchObject({ outcome: 'returned', comment: 'Try the full grid.', offeredInvoice: null });
    expect(first.decision!.by.id).toBe(DEMO.users.principal.id);
    const again = await move(tomas, 'column_layout', { action: 'submit', scheme: { schemeId: clean } });
    expect(again.status).toBe(200);
    const list = await submissions('column_layout');
    // Every submission is kept, newest first.
    expect(list.map((s) => s.scheme?.name)).toEqual(['Full grid', 'One column fewer']);
    expect(list[0]).toMatchObject({ justifications: [], checks: { errors: 0 } });
  });

  it('approval is recorded against the submitted version and offers the draft invoice for the stage fee share', async () => {
    const res = await move(principal, 'column_layout', { action: 'approve' });
    expect(res.status).toBe(200);
    const [approved] = await submissions('column_layout');
    // 20 % of the 10 000.00 lump sum, plus 20 % VAT: 2 000.00 + 400.00.
    expect(approved.decision).toMatchObject({
      outcome: 'approved',
      offeredInvoice: { state: 'draft', number: null, totalMinor: 240_000, currency: 'EUR' },
    });
    const invoice = await t.db('invoices').where({ id: approved.decision!.offeredInvoice!.id }).first();
    expect(invoice).toMatchObject({ project_id: projectId, stage_key: 'column_layout', state: 'draft' });
    const log = activityListSchema.parse((await principal.get(`/api/projects/${projectId}/activity`)).body);
    const entry = log.items.find((a) => a.action === 'stage.approved')!;
    expect(entry.summary).toBe(`${DEMO.users.principal.name} approved Column layout (Full grid, version 1)`);
  });
  // Beam framing and Foundations rest on a scheme too (SCHEME_STAGE_KEYS): the same gate applies.
  it.each(['beam_framing', 'foundations'] as const)(
    '%s is gated the same way: 409 naming the unjustified error check, accepted with its justification, the version recorded',
    async (key) => {
      expect((await move(tomas, key, { action: 'start' })).status).toBe(200);
      // the newest save of the scheme with one error (an earlier test saves it again)
      const { version } = (await t
        .db('scheme_versions')
        .where({ scheme_id: withError })
        .max('version as version')
        .first()) as { version: number };
      const refused = await move(tomas, key, { action: 'submit', scheme: { schemeId: withError, version } });
      expect(refused.status).toBe(409);
      const [only] = errorChecks;
      expect(refused.body.error.message).toContain(`${only.ruleId} @ ${only.elements.join(', ')}`);
      expect(refused.body.error.message).toContain(`version ${version}`);
      expect(Object.keys(refused.body.error.fields)).toEqual([checkKey(only)]);
      expect(await state(key)).toBe('in_progress');
      expect(await t.db('stage_submissions').where({ project_id: projectId, stage_key: key })).toHaveLength(0);

      const accepted = await move(tomas, key, {
        action: 'submit',
        scheme: { schemeId: withError, version },
        justifications: justification(`Answered for ${key}: transfer beam carries B3.`),
      });
      expect(accepted.status).toBe(200);
      expect(stageSchema.parse(accepted.body).state).toBe('under_review');
      const rows = await t.db('stage_submissions').where({ project_id: projectId, stage_key: key });
      expect(rows).toHaveLength(1);
      expect(rows[0]).toMatchObject({
        scheme_id: withError,
        scheme_version: version,
        submitted_by: DEMO.users.engineerA.id,
      });
      expect(rows[0].justifications).toEqual([
        { ruleId: only.ruleId, elements: only.elements, text: `Answered for ${key}: transfer beam carries B3.` },
      ]);
      const [latest] = await submissions(key);
      expect(latest.scheme).toMatchObject({ id: withError, version });
      expect(latest.justifications).toHaveLength(1);
    },
  );
  it('links the review to a report already written for the submitted version, not to one of another version', async () => {
    const [submitted] = await submissions('beam_framing');
    const version = submitted.scheme!.version;
    expect(version).toBeGreaterThan(1);
    expect(submitted.scheme!.report).toBeNull();
    const written = async (v: number) => {
      const created = await send(
        tomas,
        'post',
        `/api/projects/${projectId}/schemes/${withError}/versions/${v}/reports`,
        {},
      );
      expect(created.status).toBe(202);
      const id = schemeReportSchema.parse(created.body).id;
      let state = 'queued';
      // a deadline for a loaded shared machine, not a speed check
      await until(
        'the report job',
        async () => {
          state = schemeReportSchema.parse(
            (await tomas.get(`/api/projects/${projectId}/scheme-reports/${id}`)).body,
          ).state;
          return state === 'done' || state === 'failed';
        },
        120_000,
      );
      expect(state).toBe('done');
      return id;
    };
    // a report of an earlier version is not the submitted version's
    await written(version - 1);
    expect((await submissions('beam_framing'))[0].scheme!.report).toBeNull();
    const id = await written(version);
    const [linked] = await submissions('beam_framing');
    expect(linked.scheme!.report).toMatchObject({
      id,
      fileUrl: `/api/projects/${projectId}/scheme-reports/${id}/file`,
    });
    expect(linked.scheme!.report!.pages).toBeGreaterThan(0);
    const file = await principal.get(linked.scheme!.report!.fileUrl);
    expect(file.status).toBe(200);
    expect(file.headers['content-type']).toBe('application/pdf');
    // the other stage submitted with the same version links the same report
    expect((await submissions('foundations'))[0].scheme!.report).toMatchObject({ id });
  });
});
