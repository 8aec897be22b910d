import { activitySchema } from '@trabeate/contracts';
import { z } from 'zod';
import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { signedInAs } from '../support/agents';

jest.setTimeout(30_000);

const pageSchema = z.object({
  items: z.array(activitySchema),
  total: z.number().int(),
  page: z.number().int(),
  pageSize: z.number().int(),
});

describe("a project's activity log, page by page", () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
  });
  afterAll(() => t.close());

  it('gives each page newest first with the total of the filter, and the total past the last page', async () => {
    const project = DEMO.projects.kestrel.id;
    const comments = Array.from({ length: 7 }, (_, i) => ({
      firm_id: DEMO.firm.id,
      project_id: project,
      actor_id: DEMO.users.engineerA.id,
      action: 'comment.added',
      object_type: 'comment',
      object_id: `note-${i}`,
      summary: `Paging note ${i}`,
      at: t.db.raw(`now() + make_interval(secs => ?)`, [i + 1]),
    }));
    await t.db('activity').insert(comments);
    const principal = await signedInAs(t, DEMO.users.principal.email);
    const get = async (query: string) => {
      const res = await principal.get(`/api/projects/${project}/activity?objectType=comment&pageSize=3&${query}`);
      expect(res.status).toBe(200);
      return pageSchema.parse(res.body);
    };
    const total = Number(
      (await t.db('activity').where({ project_id: project, object_type: 'comment' }).count({ n: '*' }))[0].n,
    );
    expect(total).toBeGreaterThanOrEqual(7);

    const first = await get('page=1');
    expect(first.total).toBe(total);
    expect(first.items.map((a) => a.summary)).toEqual(['Paging note 6', 'Paging note 5', 'Paging note 4']);
    const third = await get('page=3');
    expect(third.items).toHaveLength(Math.min(3, total - 6));
    const beyond = await get('page=50');
    expect(beyond).toMatchObject({ items: [], total, page: 50 });
    const none = await principal.get(`/api/projects/${project}/activity?actorId=${DEMO.users.harbourlightContact.id}`);
    expect(pageSchema.parse(none.body)).toMatchObject({ items: [], total: 0 });
  });
});
