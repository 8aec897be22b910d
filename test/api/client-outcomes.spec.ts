import type TestAgent from 'supertest/lib/agent';
import { activityListSchema, projectPageSchema, stageSchema } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';

// Each sign-in runs argon2 at the provider; with two workers a file's set-up takes a few seconds.
jest.setTimeout(30_000);

// Clients see outcomes, not work in progress: stage state and dates, never the firm's review
// notes or working files, in any payload.
describe("what a project's client contact sees of the firm's work", () => {
  let t: TestApp;
  let principal: TestAgent;
  let client: TestAgent;
  const kestrel = DEMO.projects.kestrel.id;
  const note = 'Internal: the transfer beam at grid 4 looks shallow, check before issue.';

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    principal = await signedInAs(t, DEMO.users.principal.email);
    client = await signedInAs(t, DEMO.users.fenwickContact.email);
    const posted = await send(principal, 'post', `/api/projects/${kestrel}/stages/beam_framing/comments`, {
      body: note,
    });
    expect(posted.status).toBe(201);
  });
  afterAll(() => t.close());

  it('the project page gives the client each stage with its state and dates, and no counts of notes or files', async () => {
    const res = await client.get(`/api/projects/${kestrel}/full`);
    expect(res.status).toBe(200);
    const page = projectPageSchema.parse(res.body);
    expect(page.abilities.seeInternal).toBe(false);
    expect(page.stages.length).toBe(6);
    for (const s of page.stages) {
      expect(s).toMatchObject({ deliverableCount: null, commentCount: null });
      expect(s.state).toEqual(expect.any(String));
    }
    expect(JSON.stringify(res.body)).not.toContain('transfer beam');

    const staff = projectPageSchema.parse((await principal.get(`/api/projects/${kestrel}/full`)).body);
    expect(staff.abilities.seeInternal).toBe(true);
    expect(staff.stages.find((s) => s.key === 'beam_framing')?.commentCount).toBeGreaterThanOrEqual(1);
  });

  it('the stage list answers the client the same way', async () => {
    const stages = stageSchema.array().parse((await client.get(`/api/projects/${kestrel}/stages`)).body);
    expect(stages.every((s) => s.deliverableCount === null && s.commentCount === null)).toBe(true);
  });

  it("refuses the client the review thread and the file list with a reason, and keeps them for the firm's staff", async () => {
    for (const path of ['stages/beam_framing/comments', 'stages/beam_framing/deliverables']) {
      const res = await client.get(`/api/projects/${kestrel}/${path}`);
      expect(res.status).toBe(403);
      expect(res.body.error.message).toMatch(/stay with the firm/);
      expect((await principal.get(`/api/projects/${kestrel}/${path}`)).status).toBe(200);
    }
  });

  it("leaves comments and uploads out of the client's activity log, stage moves in", async () => {
    const mine = activityListSchema.parse((await client.get(`/api/projects/${kestrel}/activity?pageSize=100`)).body);
    expect(mine.items.some((a) => a.objectType === 'comment' || a.objectType === 'deliverable')).toBe(false);
    expect(mine.items.some((a) => a.objectType === 'stage')).toBe(true);
    expect(mine.total).toBe(mine.items.length);
    const staff = activityListSchema.parse(
      (await principal.get(`/api/projects/${kestrel}/activity?pageSize=100`)).body,
    );
    expect(staff.items.some((a) => a.action === 'comment.added')).toBe(true);
  });
});
