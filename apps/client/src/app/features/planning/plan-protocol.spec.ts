import { schemeSchema, type SchemeDocument } from '@trabeate/contracts';
import { analyseScheme, beamLineDiagram, demoScheme, demoSchemeVariant, EngineMemo } from '@trabeate/structural';
import { EngineWarmUp, handlePlanRequest, type AnalyseRequest, type PlanReply } from './plan-protocol';
import { createPlanWorker } from './plan-worker-factory.in-thread';

const doc = (s: unknown): SchemeDocument => schemeSchema.parse(s);
/** The one reply a request gives (compare, diagram, a fault). */
const only = (replies: PlanReply[]): PlanReply => {
  expect(replies).toHaveLength(1);
  return replies[0];
};
/** A turn of the task queue: the stand-in answers in the next task, as a worker would. */
const nextTask = () => new Promise((r) => setTimeout(r, 0));

describe('the engine worker protocol', () => {
  it('answers an analyse request with its checks first, then the whole result, both tagged with the request sequence number', () => {
    const [first, second, ...more] = handlePlanRequest({ kind: 'analyse', seq: 7, document: doc(demoSchemeVariant()) });
    expect(more).toEqual([]);
    expect([first.kind, first.seq, second.kind, second.seq]).toEqual(['checks', 7, 'result', 7]);
    if (first.kind !== 'checks' || second.kind !== 'result') return;
    // Continuous spans up to 8 m: common practice limit in libs/structural codes.ts (beamSpanContinuousMaxM).
    expect(second.result.checks).toContainEqual(
      expect.objectContaining({ ruleId: 'beam.span', status: 'fail', limit: 8, sourceKind: 'practice' }),
    );
    // the checks sent ahead are the result's own, nothing more
    const { ok, problems, checks, passed } = second.result;
    expect(first.checks).toEqual({ ok, problems, checks, passed });
  });

  it('with a memo kept between edits, gives the same answers as without, reusing the lines an edit did not touch', () => {
    const memo = new EngineMemo();
    const base = doc(demoScheme());
    const moved = JSON.parse(JSON.stringify(base)) as SchemeDocument;
    moved.columns[0] = { ...moved.columns[0], x: moved.columns[0].x + 0.4 };
    for (const d of [base, moved, base]) {
      const kept = handlePlanRequest({ kind: 'analyse', seq: 1, document: d }, memo);
      expect(JSON.stringify(kept)).toBe(JSON.stringify(handlePlanRequest({ kind: 'analyse', seq: 1, document: d })));
    }
    // back to the first document: every line's envelope was kept from the first analysis
    expect(memo.last.computed).toBe(0);
    expect(memo.last.reused).toBeGreaterThan(0);
  });

  it('reports an engine fault as a failed reply instead of throwing out of the worker', () => {
    const broken = { ...doc(demoScheme()), columns: null } as unknown as SchemeDocument;
    const reply = handlePlanRequest({ kind: 'analyse', seq: 3, document: broken }).at(-1) as PlanReply;
    expect(reply.seq).toBe(3);
    // either the engine names the problem, or the fault comes back as a message
    if (reply.kind === 'result') expect(reply.result.ok).toBe(false);
    else expect(reply).toEqual({ kind: 'failed', seq: 3, message: expect.any(String) });
  });

  it('the in-thread stand-in answers later, as a worker does, and not at all once stopped', async () => {
    const port = createPlanWorker();
    const replies: PlanReply[] = [];
    port.onReply = (r) => replies.push(r);
    port.post({ kind: 'analyse', seq: 1, document: doc(demoScheme()) });
    expect(replies).toEqual([]);
    await nextTask();
    expect(replies.map((r) => [r.kind, r.seq])).toEqual([
      ['checks', 1],
      ['result', 1],
    ]);
    port.post({ kind: 'analyse', seq: 2, document: doc(demoScheme()) });
    port.terminate();
    await nextTask();
    expect(replies).toHaveLength(2);
  });
});

describe('the engine worker protocol, comparing', () => {
  it('answers a compare request with the two schemes side by side', () => {
    const reply = only(
      handlePlanRequest({ kind: 'compare', seq: 4, a: doc(demoScheme()), b: doc(demoSchemeVariant()) }),
    );
    expect(reply.kind).toBe('comparison');
    if (reply.kind !== 'comparison') return;
    expect(reply.seq).toBe(4);
    expect(reply.comparison.differences.find((d) => d.item === 'columns')).toMatchObject({ a: 20, b: 19, delta: -1 });
  });
});

describe('the engine worker protocol, beam-line diagrams', () => {
  it("answers a diagram request with the line's sampled envelope, as the engine gives it for that document", async () => {
    const d = doc(demoScheme());
    const line = analyseScheme(demoScheme()).beamLines.find((l) => l.level === 'floor') as { lineId: string };
    const port = createPlanWorker();
    const replies: PlanReply[] = [];
    port.onReply = (r) => replies.push(r);
    port.post({ kind: 'diagram', seq: 9, document: d, lineId: line.lineId, level: 'floor' });
    await nextTask();
    const reply = only(replies);
    expect(reply).toMatchObject({ kind: 'diagram', seq: 9 });
    if (reply.kind !== 'diagram') return;
    // crossed the (stand-in) worker boundary as plain data, equal to a direct call
    expect(reply.diagram).toEqual(JSON.parse(JSON.stringify(beamLineDiagram(demoScheme(), line.lineId, 'floor'))));
    expect(reply.diagram.stations.length).toBeGreaterThan(10);
  });

  it('answers a diagram request for a line the document lacks with a failed reply naming it', () => {
    const reply = only(
      handlePlanRequest({
        kind: 'diagram',
        seq: 5,
        document: doc(demoScheme()),
        lineId: 'L-Q',
        level: 'roof',
      }),
    );
    expect(reply).toEqual({ kind: 'failed', seq: 5, message: expect.stringContaining('L-Q') });
  });
});

describe('EngineWarmUp (the engine run again while idle after the first analysis)', () => {
  const analyse = (seq: number): AnalyseRequest => ({ kind: 'analyse', seq, document: doc(demoScheme()) });
  function setUp(limitMs = 1500) {
    const ran: SchemeDocument[] = [];
    const queue: (() => void)[] = [];
    const warm = new EngineWarmUp(
      3,
      limitMs,
      (d) => ran.push(d),
      (next) => queue.push(next),
    );
    /** runs the tasks the warm-up scheduled, one at a time, as the event loop would */
    const drain = () => {
      while (queue.length) (queue.shift() as () => void)();
    };
    return { warm, ran, queue, drain };
  }

  it('runs the first analysed document three more times, one run per task', () => {
    const { warm, ran, queue, drain } = setUp();
    const first = analyse(1);
    warm.answered(first, 800);
    expect(ran).toHaveLength(0); // nothing in the answering task itself
    expect(queue).toHaveLength(1);
    (queue.shift() as () => void)();
    expect(ran).toHaveLength(1);
    drain();
    expect(ran).toEqual([first.document, first.document, first.document]);
  });

  it('gives way to any request that arrives, and does not start again', () => {
    const { warm, ran, queue, drain } = setUp();
    warm.answered(analyse(1), 800);
    (queue.shift() as () => void)();
    warm.interrupt();
    drain();
    expect(ran).toHaveLength(1);
    warm.answered(analyse(2), 100);
    drain();
    expect(ran).toHaveLength(1);
  });

  it('starts only from an analysis, and not when the first analysis took longer than its limit', () => {
    const slow = setUp(1500);
    slow.warm.answered(analyse(1), 2400);
    slow.drain();
    expect(slow.ran).toHaveLength(0);
    const other = setUp();
    other.warm.answered({ kind: 'compare', seq: 1, a: doc(demoScheme()), b: doc(demoSchemeVariant()) }, 10);
    other.drain();
    expect(other.ran).toHaveLength(0);
    other.warm.answered(analyse(2), 10);
    other.drain();
    expect(other.ran).toHaveLength(3);
  });
});
