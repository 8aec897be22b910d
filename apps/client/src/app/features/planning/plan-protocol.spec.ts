import { schemeSchema, type SchemeDocument } from '@trabeate/contracts';
import { analyseScheme, beamLineDiagram, demoScheme, demoSchemeVariant } from '@trabeate/structural';
import { handlePlanRequest, type PlanReply } from './plan-protocol';
import { createPlanWorker } from './plan-worker-factory.in-thread';

const doc = (s: unknown): SchemeDocument => schemeSchema.parse(s);

describe('the engine worker protocol', () => {
  it('answers an analyse request with the result, tagged with the request sequence number', () => {
    const reply = handlePlanRequest({ kind: 'analyse', seq: 7, document: doc(demoSchemeVariant()) });
    expect(reply.kind).toBe('result');
    expect(reply.seq).toBe(7);
    if (reply.kind !== 'result') return;
    // Continuous spans up to 8 m: common practice limit in libs/structural codes.ts (beamSpanContinuousMaxM).
    expect(reply.result.checks).toContainEqual(
      expect.objectContaining({ ruleId: 'beam.span', status: 'fail', limit: 8, sourceKind: 'practice' }),
    );
  });

  it('reports an engine fault as a failed reply instead of throwing out of the worker', () => {
    const broken = { ...doc(demoScheme()), columns: null } as unknown as SchemeDocument;
    const reply = handlePlanRequest({ kind: 'analyse', seq: 3, document: broken });
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
    await new Promise((r) => setTimeout(r, 0));
    expect(replies.map((r) => [r.kind, r.seq])).toEqual([['result', 1]]);
    port.post({ kind: 'analyse', seq: 2, document: doc(demoScheme()) });
    port.terminate();
    await new Promise((r) => setTimeout(r, 0));
    expect(replies).toHaveLength(1);
  });
});

describe('the engine worker protocol, comparing', () => {
  it('answers a compare request with the two schemes side by side', () => {
    const reply = handlePlanRequest({ kind: 'compare', seq: 4, a: doc(demoScheme()), b: doc(demoSchemeVariant()) });
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
    await new Promise((r) => setTimeout(r, 0));
    expect(replies).toHaveLength(1);
    const reply = replies[0];
    expect(reply).toMatchObject({ kind: 'diagram', seq: 9 });
    if (reply.kind !== 'diagram') return;
    // crossed the (stand-in) worker boundary as plain data, equal to a direct call
    expect(reply.diagram).toEqual(JSON.parse(JSON.stringify(beamLineDiagram(demoScheme(), line.lineId, 'floor'))));
    expect(reply.diagram.stations.length).toBeGreaterThan(10);
  });

  it('answers a diagram request for a line the document lacks with a failed reply naming it', () => {
    const reply = handlePlanRequest({
      kind: 'diagram',
      seq: 5,
      document: doc(demoScheme()),
      lineId: 'L-Q',
      level: 'roof',
    });
    expect(reply).toEqual({ kind: 'failed', seq: 5, message: expect.stringContaining('L-Q') });
  });
});
