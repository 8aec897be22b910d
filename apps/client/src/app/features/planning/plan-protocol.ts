import type { SchemeDocument } from '@trabeate/contracts';
import {
  analyseScheme,
  beamLineDiagram,
  compareSchemes,
  type EngineMemo,
  type BeamLineDiagram,
  type LevelKind,
  type Scheme,
  type SchemeComparison,
  type SchemeResult,
} from '@trabeate/structural';

// The messages between the planning page and the engine's Web Worker. The work itself lives
// here, in a plain module, so it is tested directly; plan.worker.ts only wires it to the worker.

/** Analyse this document; `seq` increases with every edit so late answers can be told apart. */
export interface AnalyseRequest {
  kind: 'analyse';
  seq: number;
  document: SchemeDocument;
}

/** Compare two schemes side by side (a first, b second). */
export interface CompareRequest {
  kind: 'compare';
  seq: number;
  a: SchemeDocument;
  b: SchemeDocument;
}

/**
 * The moment and shear envelope of one beam line on one level, sampled for drawing. Computed here
 * rather than on the page: it rebuilds the scheme's loads, which on a large scheme takes longer
 * than a frame.
 */
export interface DiagramRequest {
  kind: 'diagram';
  seq: number;
  document: SchemeDocument;
  lineId: string;
  level: LevelKind;
}

export type PlanRequest = AnalyseRequest | CompareRequest | DiagramRequest;

/** The part of a result the checks pane shows: sent ahead of the whole result, which is larger. */
export type SchemeChecks = Pick<SchemeResult, 'ok' | 'problems' | 'checks' | 'passed'>;

export type PlanReply =
  | { kind: 'checks'; seq: number; checks: SchemeChecks }
  | { kind: 'result'; seq: number; result: SchemeResult }
  | { kind: 'comparison'; seq: number; comparison: SchemeComparison }
  | { kind: 'diagram'; seq: number; diagram: BeamLineDiagram }
  | { kind: 'failed'; seq: number; message: string };

/**
 * Answers one request, in the order the replies are to be posted. An analysis answers twice: its
 * checks first (a few hundred kB on a large scheme, so they reach the screen without waiting for
 * the rest to be copied across), then the whole result (several MB: loads, every beam line's
 * envelope, the schedules). `memo` keeps beam-line envelopes between analyses of the scheme being
 * edited. Never throws: an engine fault comes back as a `failed` reply.
 */
export function handlePlanRequest(request: PlanRequest, memo?: EngineMemo): PlanReply[] {
  try {
    if (request.kind === 'compare')
      return [
        {
          kind: 'comparison',
          seq: request.seq,
          comparison: compareSchemes(request.a as Scheme, request.b as Scheme),
        },
      ];
    if (request.kind === 'diagram')
      return [
        {
          kind: 'diagram',
          seq: request.seq,
          diagram: beamLineDiagram(request.document as Scheme, request.lineId, request.level),
        },
      ];
    const result = analyseScheme(request.document as Scheme, { memo });
    const { ok, problems, checks, passed } = result;
    return [
      { kind: 'checks', seq: request.seq, checks: { ok, problems, checks, passed } },
      { kind: 'result', seq: request.seq, result },
    ];
  } catch (err) {
    return [
      {
        kind: 'failed',
        seq: request.seq,
        message: err instanceof Error ? err.message : 'The engine stopped on this scheme.',
      },
    ];
  }
}

/** What the page needs of a worker (the real one, or the in-thread stand-in under Jest). */
export interface PlanWorkerPort {
  post(request: PlanRequest): void;
  onReply: ((reply: PlanReply) => void) | null;
  terminate(): void;
}

/**
 * Warms the engine up once a page has its first analysis. V8 turns the engine's hot functions into
 * fast machine code only after they have run a few times, and compiles them on other threads that,
 * on a two-core machine, compete with the worker itself: with bench:editor's 900-column scheme the
 * first drops after opening took 290–380 ms from drop to checks and later ones 130–220 ms. So after
 * answering the page's first analysis, the worker analyses the same document a few more times while
 * idle (the results are thrown away), one run per task, so an edit that arrives waits for one run at
 * most, and any request ends the warm-up. Skipped when that first analysis took longer than
 * `limitMs`: a run that long would hold up the first edit.
 */
export class EngineWarmUp {
  private started = false;
  private left = 0;

  constructor(
    private readonly runs = 5,
    private readonly limitMs = 1500,
    private readonly run: (document: SchemeDocument) => void = (d) => analyseScheme(d as Scheme),
    private readonly schedule: (next: () => void) => void = (next) => setTimeout(next, 0),
  ) {}

  /** A request has arrived: the warm-up gives way to real work, for good. */
  interrupt(): void {
    this.left = 0;
  }

  /** A request was answered in `tookMs`: the page's first analysis starts the warm-up. */
  answered(request: PlanRequest, tookMs: number): void {
    if (this.started || request.kind !== 'analyse') return;
    this.started = true;
    if (tookMs > this.limitMs) return;
    this.left = this.runs;
    const next = () => {
      if (this.left <= 0) return;
      this.left--;
      this.run(request.document);
      this.schedule(next);
    };
    this.schedule(next);
  }
}
