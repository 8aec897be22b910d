import type TestAgent from 'supertest/lib/agent';
import { drawingListSchema, drawingSchema, revisionSchema, type DrawingListItem } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { migrations } from '../../migrations';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';
import { tinyPdf } from '../support/fakes';
import { approvedRevision, drawingBody, revisionBody, uploadRevisionFile } from '../support/drawings';

jest.setTimeout(90_000);

const kestrel = DEMO.projects.kestrel.id;
const OUT = ['issued', 'superseded'];

interface RevisionFact {
  id: string;
  drawing_id: string;
  seq: number;
  state: string;
}

// Each drawing's current_revision_id / out_revision_id is kept by triggers. These tests recompute
// both from the revisions themselves, here in TypeScript (newest seq; newest seq that went out),
// and compare with what the database holds and what the register answers.
describe('each drawing points at its current revision through the whole lifecycle', () => {
  let t: TestApp;
  let principal: TestAgent;
  let tomas: TestAgent;
  let priya: TestAgent;
  let fenwick: TestAgent;

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    // Priya joins Kestrel Yard so that a second engineer can check Tomas's drawings.
    await t
      .db('project_members')
      .insert({ project_id: kestrel, user_id: DEMO.users.engineerB.id })
      .onConflict(['project_id', 'user_id'])
      .ignore();
    principal = await signedInAs(t, DEMO.users.principal.email);
    tomas = await signedInAs(t, DEMO.users.engineerA.email);
    priya = await signedInAs(t, DEMO.users.engineerB.email);
    fenwick = await signedInAs(t, DEMO.users.fenwickContact.email);
  });
  afterAll(() => t.close());

  /** Every drawing's pointers as stored, and as recomputed from its revisions. */
  async function pointers() {
    const drawings: Array<{ id: string; current_revision_id: string | null; out_revision_id: string | null }> = await t
      .db('drawings')
      .select('id', 'current_revision_id', 'out_revision_id');
    const revisions: RevisionFact[] = await t.db('drawing_revisions').select('id', 'drawing_id', 'seq', 'state');
    const newest = (rs: RevisionFact[]) =>
      rs.reduce<RevisionFact | null>((a, r) => (!a || r.seq > a.seq ? r : a), null);
    const stored = new Map(drawings.map((d) => [d.id, [d.current_revision_id, d.out_revision_id]]));
    const expected = new Map(
      drawings.map((d) => {
        const mine = revisions.filter((r) => r.drawing_id === d.id);
        return [d.id, [newest(mine)?.id ?? null, newest(mine.filter((r) => OUT.includes(r.state)))?.id ?? null]];
      }),
    );
    return { stored, expected };
  }

  async function expectPointersRight() {
    const { stored, expected } = await pointers();
    expect(stored.size).toBeGreaterThan(0);
    expect(stored).toEqual(expected);
  }

  async function registerRow(api: TestAgent, number: string): Promise<DrawingListItem | undefined> {
    const res = await api.get(`/api/projects/${kestrel}/drawings?q=${encodeURIComponent(number)}&pageSize=100`);
    expect(res.status).toBe(200);
    return drawingListSchema.parse(res.body).items.find((i) => i.number === number);
  }

  const transition = (api: TestAgent, revisionId: string, action: 'check' | 'approve') =>
    send(api, 'post', `/api/projects/${kestrel}/revisions/${revisionId}/transitions`, { action });

  const issue = (revisionIds: string[]) =>
    send(principal, 'post', `/api/projects/${kestrel}/transmittals`, {
      purpose: 'information',
      revisionIds,
      contactIds: [DEMO.users.fenwickContact.id],
    });

  it('has the demo register’s pointers set as the seed registered its revisions', async () => {
    const demo = await t.db('drawings').whereNotNull('out_revision_id').count<{ n: string }[]>('* as n');
    expect(Number(demo[0].n)).toBeGreaterThan(0);
    await expectPointersRight();
  });

  it('follows a drawing from draft to checked, approved, issued, and a new revision issued over it', async () => {
    const d = drawingSchema.parse(
      (await send(tomas, 'post', `/api/projects/${kestrel}/drawings`, drawingBody({ number: 'S-701' }))).body,
    );
    expect((await registerRow(tomas, 'S-701'))?.current).toBeNull();
    expect(await registerRow(fenwick, 'S-701')).toBeUndefined();

    const p01 = revisionSchema.parse(
      (await send(tomas, 'post', `/api/projects/${kestrel}/drawings/${d.id}/revisions`, revisionBody())).body,
    );
    expect((await registerRow(tomas, 'S-701'))?.current).toMatchObject({ id: p01.id, code: 'P01', state: 'draft' });
    await expectPointersRight();

    expect((await uploadRevisionFile(tomas, kestrel, p01.id, tinyPdf('S-701 P01'), 'S-701.pdf')).status).toBe(201);
    // The drawer may not check; the second engineer does.
    expect((await transition(tomas, p01.id, 'check')).status).toBe(409);
    expect((await transition(priya, p01.id, 'check')).status).toBe(200);
    expect((await registerRow(tomas, 'S-701'))?.current).toMatchObject({ code: 'P01', state: 'checked' });
    expect((await transition(principal, p01.id, 'approve')).status).toBe(200);
    expect((await registerRow(tomas, 'S-701'))?.current).toMatchObject({ code: 'P01', state: 'approved' });
    expect(await registerRow(fenwick, 'S-701')).toBeUndefined();
    await expectPointersRight();

    expect((await issue([p01.id])).status).toBe(201);
    expect((await registerRow(tomas, 'S-701'))?.current).toMatchObject({ code: 'P01', state: 'issued' });
    expect(await registerRow(fenwick, 'S-701')).toMatchObject({
      current: { id: p01.id, code: 'P01', state: 'issued' },
      revisionCount: 1,
    });
    await expectPointersRight();

    // P02 in draft: the firm sees it as current, the client still P01.
    const p02 = revisionSchema.parse(
      (await send(tomas, 'post', `/api/projects/${kestrel}/drawings/${d.id}/revisions`, revisionBody())).body,
    );
    expect(p02.code).toBe('P02');
    expect(await registerRow(tomas, 'S-701')).toMatchObject({
      current: { id: p02.id, code: 'P02', state: 'draft' },
      revisionCount: 2,
    });
    expect(await registerRow(fenwick, 'S-701')).toMatchObject({
      current: { id: p01.id, code: 'P01', state: 'issued' },
      revisionCount: 1,
    });
    await expectPointersRight();

    expect((await uploadRevisionFile(tomas, kestrel, p02.id, tinyPdf('S-701 P02'), 'S-701 P02.pdf')).status).toBe(201);
    expect((await transition(priya, p02.id, 'check')).status).toBe(200);
    expect((await transition(principal, p02.id, 'approve')).status).toBe(200);
    expect((await issue([p02.id])).status).toBe(201);
    const states = await t.db('drawing_revisions').where({ drawing_id: d.id }).orderBy('seq').pluck('state');
    expect(states).toEqual(['superseded', 'issued']);
    expect((await registerRow(tomas, 'S-701'))?.current).toMatchObject({ id: p02.id, code: 'P02', state: 'issued' });
    expect(await registerRow(fenwick, 'S-701')).toMatchObject({
      current: { id: p02.id, code: 'P02', state: 'issued' },
      revisionCount: 2,
    });
    const issuedFilter = drawingListSchema.parse(
      (await fenwick.get(`/api/projects/${kestrel}/drawings?q=S-701&state=superseded`)).body,
    );
    expect(issuedFilter.items).toEqual([]);
    await expectPointersRight();
  });

  it('keeps every pointer right when revisions are registered and issued in parallel', async () => {
    const numbers = ['S-801', 'S-802', 'S-803', 'S-804', 'S-805', 'S-806'];
    const drawings = await Promise.all(
      numbers.map(
        async (number) =>
          drawingSchema.parse(
            (await send(tomas, 'post', `/api/projects/${kestrel}/drawings`, drawingBody({ number }))).body,
          ).id,
      ),
    );
    // One revision of each drawing at once, and four more racing for the first drawing.
    const results = await Promise.all([
      ...drawings.map((id) => send(tomas, 'post', `/api/projects/${kestrel}/drawings/${id}/revisions`, revisionBody())),
      ...[priya, principal, tomas, priya].map((api) =>
        send(api, 'post', `/api/projects/${kestrel}/drawings/${drawings[0]}/revisions`, revisionBody()),
      ),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual([...Array(6).fill(201), ...Array(4).fill(409)]);
    await expectPointersRight();

    // Four approved drawings issued by two transmittals at the same moment.
    const approved = [];
    for (const number of ['S-811', 'S-812', 'S-813', 'S-814'])
      approved.push(await approvedRevision({ drawer: tomas, checker: priya, principal }, kestrel, number));
    const issues = await Promise.all([
      issue([approved[0].revision.id, approved[1].revision.id]),
      issue([approved[2].revision.id, approved[3].revision.id]),
    ]);
    for (const r of issues) expect([201, 409]).toContain(r.status);
    const issuedIds = new Set(
      await t
        .db('drawing_revisions')
        .whereIn(
          'id',
          approved.map((a) => a.revision.id),
        )
        .where({ state: 'issued' })
        .pluck('id'),
    );
    expect(issuedIds.size).toBe(issues.filter((r) => r.status === 201).length * 2);
    for (const a of approved) {
      const row = await registerRow(fenwick, a.drawing.number);
      if (issuedIds.has(a.revision.id)) expect(row?.current?.id).toBe(a.revision.id);
      else expect(row).toBeUndefined();
    }
    await expectPointersRight();
  });

  it('lists, filters and sorts the register exactly as its revisions say', async () => {
    const drawings: Array<{ id: string; stage_key: string }> = await t
      .db('drawings')
      .where({ project_id: kestrel })
      .select('id', 'stage_key');
    const revisions: Array<RevisionFact & { suitability: string; revision_date: string }> = await t
      .db('drawing_revisions')
      .where({ project_id: kestrel })
      .select(
        'id',
        'drawing_id',
        'seq',
        'state',
        'suitability',
        t.db.raw(`to_char(revision_date, 'YYYY-MM-DD') as revision_date`),
      );
    const current = (drawingId: string, outOnly: boolean) =>
      revisions
        .filter((r) => r.drawing_id === drawingId && (!outOnly || OUT.includes(r.state)))
        .sort((a, b) => b.seq - a.seq)[0];
    const cases: Array<[TestAgent, boolean, string, (d: { id: string; stage_key: string }) => boolean]> = [
      [tomas, false, 'state=issued', (d) => current(d.id, false)?.state === 'issued'],
      [
        tomas,
        false,
        'state=draft&stageKey=column_layout',
        (d) => d.stage_key === 'column_layout' && current(d.id, false)?.state === 'draft',
      ],
      [tomas, false, 'suitability=s2', (d) => current(d.id, false)?.suitability === 'S2'],
      [fenwick, true, 'state=issued', (d) => current(d.id, true)?.state === 'issued'],
      [fenwick, true, '', (d) => current(d.id, true) !== undefined],
    ];
    for (const [api, outOnly, query, keep] of cases) {
      const res = drawingListSchema.parse(
        (await api.get(`/api/projects/${kestrel}/drawings?sort=date&direction=desc&pageSize=100&${query}`)).body,
      );
      const want = drawings.filter(keep);
      expect(want.length).toBeGreaterThan(0);
      expect(res.total).toBe(want.length);
      expect(res.items.map((i) => i.id).sort()).toEqual(want.map((d) => d.id).sort());
      for (const item of res.items) expect(item.current?.id).toBe(current(item.id, outOnly)!.id);
      const dates = res.items.map((i) => i.current!.date);
      expect(dates).toEqual([...dates].sort().reverse());
    }
  });

  it('fills the pointers in again from the revisions when the migration runs on an existing register', async () => {
    const migration = migrations['20261224000001_drawing_current_revision'];
    await migration.down!(t.db);
    await migration.up(t.db);
    const filled = await t.db('drawings').whereNotNull('current_revision_id').count<{ n: string }[]>('* as n');
    expect(Number(filled[0].n)).toBeGreaterThan(10);
    await expectPointersRight();
  });
});
