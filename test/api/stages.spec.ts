import type TestAgent from 'supertest/lib/agent';
import { activityListSchema, commentSchema, projectPageSchema, stageSchema, type StageKey } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { MAIL_QUEUE } from '../../apps/server/src/jobs';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';

jest.setTimeout(30_000);

describe('design stages: assignment and the enforced workflow', () => {
  let t: TestApp;
  let principal: TestAgent;
  let tomas: TestAgent; // assigned to Kestrel Yard's stages
  let priya: TestAgent; // an engineer, not on Kestrel Yard at first
  let client: TestAgent;
  let projectId: string;

  const stagePath = (key: StageKey) => `/api/projects/${projectId}/stages/${key}`;
  const move = (api: TestAgent, key: StageKey, body: object) =>
    send(api, 'post', `${stagePath(key)}/transitions`, body);
  const state = async (key: StageKey) => (await t.db('stages').where({ project_id: projectId, key }).first()).state;
  const mails = async (template: string) =>
    (
      await t.db.raw(`select data from pgboss.job where name = ? and data->>'template' = ? order by created_on`, [
        MAIL_QUEUE,
        template,
      ])
    ).rows.map((r: { data: { to: string[]; subject: string; text: string } }) => r.data);

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    principal = await signedInAs(t, DEMO.users.principal.email);
    tomas = await signedInAs(t, DEMO.users.engineerA.email);
    priya = await signedInAs(t, DEMO.users.engineerB.email);
    client = await signedInAs(t, DEMO.users.fenwickContact.email);
    const created = await send(principal, 'post', '/api/projects', {
      reference: 'SQ-ST-1',
      name: 'Stage workflow test',
      clientOrganisationId: DEMO.clients.fenwick.id,
      storeys: 4,
      storeyHeightM: 3,
      currency: 'EUR',
      designBasis: {
        codeFamily: 'EN1992',
        concreteMPa: 30,
        steelMPa: 500,
        imposedKPa: 2,
        superimposedDeadKPa: 1,
        bearingPressureKPa: 150,
        foundingDepthM: 1,
      },
    });
    projectId = created.body.id;
    await send(principal, 'put', `/api/projects/${projectId}/members/${DEMO.users.fenwickContact.id}`);
  });
  afterAll(() => t.close());

  it('the principal assigns an engineer and a due date; the engineer joins the team and both changes are logged', async () => {
    const res = await send(principal, 'patch', stagePath('design_basis'), {
      assigneeId: DEMO.users.engineerA.id,
      dueDate: '2030-05-01',
    });
    expect(res.status).toBe(200);
    expect(stageSchema.parse(res.body)).toMatchObject({
      assignee: { id: DEMO.users.engineerA.id, displayName: DEMO.users.engineerA.name },
      dueDate: '2030-05-01',
      late: false,
    });
    expect(
      await t.db('project_members').where({ project_id: projectId, user_id: DEMO.users.engineerA.id }).first(),
    ).toBeDefined();
    const log = activityListSchema.parse((await principal.get(`/api/projects/${projectId}/activity`)).body);
    expect(log.items.slice(0, 2).map((a) => a.action)).toEqual(['stage.updated', 'membership.added']);
    expect(log.items[0].summary).toBe(
      `${DEMO.users.principal.name} assigned ${DEMO.users.engineerA.name} and set the due date to 2030-05-01 on Design basis`,
    );
  });

  it("refuses to assign a stage to someone who is not one of the firm's engineers, naming the field", async () => {
    const res = await send(principal, 'patch', stagePath('column_layout'), {
      assigneeId: DEMO.users.fenwickContact.id,
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ 'body.assigneeId': ['not an engineer of this firm'] });
    expect((await send(tomas, 'patch', stagePath('column_layout'), { dueDate: '2030-01-01' })).status).toBe(403);
  });

  it('a stage with nobody assigned cannot be started (409 saying what to do)', async () => {
    const res = await move(tomas, 'column_layout', { action: 'start' });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toBe(
      'Nobody is assigned to Column layout yet; the principal assigns an engineer first.',
    );
  });

  it('only the assigned engineer starts and submits; others get 403 saying who may', async () => {
    const byPrincipal = await move(principal, 'design_basis', { action: 'start' });
    expect(byPrincipal.status).toBe(403);
    expect(byPrincipal.body.error.message).toBe('Only the engineer assigned to Design basis can start it.');
    await send(principal, 'put', `/api/projects/${projectId}/members/${DEMO.users.engineerB.id}`);
    expect((await move(priya, 'design_basis', { action: 'start' })).status).toBe(403);
    const byClient = await move(client, 'design_basis', { action: 'start' });
    expect(byClient.status).toBe(403);
    expect(byClient.body.error.message).toBe('Client contacts can view this project but not change it.');
    expect(await state('design_basis')).toBe('not_started');
  });

  it('refuses a move the state does not allow with 409 naming what is allowed', async () => {
    const res = await move(tomas, 'design_basis', { action: 'submit' });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toBe(
      'Design basis is not started, so it cannot be submitted. From not started, the assigned engineer can start it.',
    );
    const approve = await move(principal, 'design_basis', { action: 'approve' });
    expect(approve.status).toBe(409);
    expect((await move(principal, 'design_basis', { action: 'reopen', reason: 'x' })).status).toBe(409);
  });

  it('start, submit (mail to the principal), return (mail to the engineer), submit again, approve (mail), reopen', async () => {
    const started = await move(tomas, 'design_basis', { action: 'start' });
    expect(started.status).toBe(200);
    expect(stageSchema.parse(started.body)).toMatchObject({ state: 'in_progress', allowedActions: ['submit'] });

    const submitted = await move(tomas, 'design_basis', {
      action: 'submit',
      comment: "Loads per the architect's schedule.",
    });
    expect(submitted.body).toMatchObject({
      state: 'under_review',
      allowedActions: [],
      submittedAt: expect.any(String),
    });
    const [toPrincipal] = await mails('stage-submitted');
    expect(toPrincipal.to).toEqual([DEMO.users.principal.email]);
    expect(toPrincipal.subject).toBe('Stage workflow test: Design basis is ready for your review');
    expect(toPrincipal.text).toContain("Loads per the architect's schedule.");

    // The principal sees the review actions; the engineer cannot approve their own work.
    const page = projectPageSchema.parse((await principal.get(`/api/projects/${projectId}/full`)).body);
    expect(page.stages[0].allowedActions).toEqual(['approve', 'return']);
    const selfApprove = await move(tomas, 'design_basis', { action: 'approve' });
    expect(selfApprove.status).toBe(403);
    expect(selfApprove.body.error.message).toBe('Only the principal can approve it.');
    const noComment = await move(principal, 'design_basis', { action: 'return', comment: ' ' });
    expect(noComment.status).toBe(400);
    expect(noComment.body.error.fields).toHaveProperty(['body.comment']);

    const returned = await move(principal, 'design_basis', {
      action: 'return',
      comment: 'Use the assembly load for the hall.',
    });
    expect(returned.body).toMatchObject({ state: 'returned', allowedActions: [] });
    const [toEngineer] = await mails('stage-returned');
    expect(toEngineer.to).toEqual([DEMO.users.engineerA.email]);
    expect(toEngineer.text).toContain('Use the assembly load for the hall.');

    expect((await move(tomas, 'design_basis', { action: 'submit' })).body.state).toBe('under_review');
    const approved = await move(principal, 'design_basis', { action: 'approve' });
    expect(approved.body).toMatchObject({
      state: 'approved',
      approvedAt: expect.any(String),
      allowedActions: ['reopen'],
    });
    expect((await mails('stage-approved'))[0]).toMatchObject({
      to: [DEMO.users.engineerA.email],
      subject: 'Stage workflow test: Design basis is approved',
    });

    const lateStart = await move(tomas, 'design_basis', { action: 'start' });
    expect(lateStart.status).toBe(409);
    expect(lateStart.body.error.message).toBe(
      'Design basis is approved, so it cannot be started. From approved, the principal can reopen it, giving a reason.',
    );
    const engineerReopen = await move(tomas, 'design_basis', { action: 'reopen', reason: 'more work' });
    expect(engineerReopen.status).toBe(403);
    const noReason = await move(principal, 'design_basis', { action: 'reopen' });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.fields).toHaveProperty(['body.reason']);
    const reopened = await move(principal, 'design_basis', {
      action: 'reopen',
      reason: 'The client added a roof plant room.',
    });
    expect(reopened.body).toMatchObject({ state: 'in_progress', approvedAt: null });

    const comments = commentSchema.array().parse((await tomas.get(`${stagePath('design_basis')}/comments`)).body);
    expect(comments.map((c) => [c.action, c.body])).toEqual([
      ['submit', "Loads per the architect's schedule."],
      ['return', 'Use the assembly load for the hall.'],
      ['reopen', 'The client added a roof plant room.'],
    ]);
    const log = activityListSchema.parse(
      (await principal.get(`/api/projects/${projectId}/activity?objectType=stage&stageKey=design_basis`)).body,
    );
    expect(log.items.map((a) => a.action)).toEqual([
      'stage.reopened',
      'stage.approved',
      'stage.submitted',
      'stage.returned',
      'stage.submitted',
      'stage.started',
      'stage.updated',
    ]);
    expect(log.items[2]).toMatchObject({
      actor: { id: DEMO.users.engineerA.id },
      summary: `${DEMO.users.engineerA.name} submitted Design basis for review`,
    });
  });

  it('two approvals at once: the row lock lets one through and the other gets 409', async () => {
    await send(principal, 'patch', stagePath('stairs'), { assigneeId: DEMO.users.engineerA.id });
    await move(tomas, 'stairs', { action: 'start' });
    await move(tomas, 'stairs', { action: 'submit' });
    const [a, b] = await Promise.all([
      move(principal, 'stairs', { action: 'approve' }),
      move(principal, 'stairs', { action: 'return', comment: 'again' }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    expect(
      await t
        .db('activity')
        .where({ project_id: projectId, stage_key: 'stairs' })
        .whereIn('action', ['stage.approved', 'stage.returned']),
    ).toHaveLength(1);
  });

  it('comments: firm staff write and read, clients neither; each comment is logged; the activity log filters by actor', async () => {
    const res = await send(priya, 'post', `${stagePath('beam_framing')}/comments`, {
      body: 'Check the transfer beam at grid 4.',
    });
    expect(res.status).toBe(201);
    expect(commentSchema.parse(res.body)).toMatchObject({
      author: { id: DEMO.users.engineerB.id },
      action: null,
      stageKey: 'beam_framing',
    });
    expect((await send(client, 'post', `${stagePath('beam_framing')}/comments`, { body: 'hello' })).status).toBe(403);
    expect((await client.get(`${stagePath('beam_framing')}/comments`)).status).toBe(403);
    expect(
      (await send(priya, 'post', `${stagePath('beam_framing')}/comments`, { body: '' })).body.error.fields,
    ).toHaveProperty(['body.body']);
    const byPriya = activityListSchema.parse(
      (await principal.get(`/api/projects/${projectId}/activity?actorId=${DEMO.users.engineerB.id}`)).body,
    );
    expect(byPriya.items.map((a) => [a.action, a.objectType, a.objectId])).toEqual([
      ['comment.added', 'comment', res.body.id],
    ]);
  });

  it('a stage due yesterday and not approved is late', async () => {
    const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
    const res = await send(principal, 'patch', stagePath('foundations'), { dueDate: yesterday });
    expect(res.body).toMatchObject({ dueDate: yesterday, late: true });
  });

  it('the seeded demo has an approved, an under-review and a late stage', async () => {
    const page = projectPageSchema.parse((await principal.get(`/api/projects/${DEMO.projects.kestrel.id}/full`)).body);
    expect(page.stages.map((s) => [s.key, s.state, s.late])).toEqual([
      ['design_basis', 'approved', false],
      ['column_layout', 'under_review', true],
      ['beam_framing', 'in_progress', true],
      ['slab_panels', 'not_started', false],
      ['stairs', 'not_started', false],
      ['foundations', 'not_started', false],
    ]);
    const log = activityListSchema.parse(
      (await principal.get(`/api/projects/${DEMO.projects.kestrel.id}/activity`)).body,
    );
    expect(log.total).toBeGreaterThanOrEqual(5);
  });
});
