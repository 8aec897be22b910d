// Planning checks. Each has a stable rule id, a severity, the elements it concerns, the value,
// the limit and where the limit comes from. Passing checks are kept too, so that a report can
// show what was checked.
import type { Limit, Limits, SourceKind } from './codes';
import type { BeamLine, Layout } from './layout';
import { columnPlan } from './layout';
import { StructuralInputError } from './errors';
import type { Scheme } from './model';

export type Severity = 'error' | 'warning' | 'info';

export interface Check {
  ruleId: string;
  severity: Severity;
  status: 'pass' | 'fail';
  elements: string[];
  message: string;
  value: number;
  limit: number;
  unit: string;
  /** the value must be at most ('max') or at least ('min') the limit */
  sense: 'max' | 'min';
  source: string;
  sourceKind: SourceKind;
}

export const RULES = {
  beamSpan: 'beam.span',
  beamDepth: 'beam.depth',
  beamHeadroom: 'beam.headroom',
  columnSpacing: 'column.spacing',
  columnMerge: 'column.merge',
  columnWall: 'column.wider-than-wall',
  columnCapacity: 'column.capacity',
  columnUplift: 'column.uplift',
  columnSteel: 'column.steel-ratio',
  columnOffGrid: 'column.off-grid',
  pointLoad: 'beam.point-load-on-long-span',
  secondaryUnsupported: 'secondary.unsupported',
  slabThickness: 'slab.thickness',
  stairRiser: 'stair.riser',
  stairTread: 'stair.tread',
  stair2RT: 'stair.2r-plus-t',
  stairRisers: 'stair.risers-per-flight',
  footingLine: 'footing.crosses-property-line',
  footingOverlap: 'footing.overlap',
} as const;

/** A check whose message is written only if a person will see it (a failure, or the tightest pass). */
export type CheckDraft = Omit<Check, 'message'> & { message: string | (() => string) };

const written = (d: CheckDraft): Check =>
  typeof d.message === 'string' ? (d as Check) : { ...d, message: d.message() };

/** The checks of one rule that passed: how many, and the one nearest its limit in full. */
export interface PassedRule {
  ruleId: string;
  count: number;
  tightest: Check;
}

/**
 * Collects checks as they are made: failures are kept in full, passes are folded at once into a
 * per-rule summary (count and the pass nearest its limit), so that thousands of passing checks on
 * a large scheme do not stay in memory.
 */
export class CheckList {
  private readonly failed: CheckDraft[] = [];
  private readonly passed = new Map<string, { ruleId: string; count: number; tightest: CheckDraft }>();
  push(c: CheckDraft): void {
    if (c.status === 'fail') {
      this.failed.push(c);
      return;
    }
    const p = this.passed.get(c.ruleId);
    if (!p) this.passed.set(c.ruleId, { ruleId: c.ruleId, count: 1, tightest: c });
    else {
      p.count++;
      if (margin(c) < margin(p.tightest)) p.tightest = c;
    }
  }
  /** Failures (errors first, then warnings, then information) and the summary of passes. */
  result(): { failed: Check[]; passed: PassedRule[] } {
    const rank: Record<Severity, number> = { error: 0, warning: 1, info: 2 };
    return {
      failed: this.failed.map(written).sort((a, b) => rank[a.severity] - rank[b.severity]),
      passed: [...this.passed.values()].map((p) => ({
        ruleId: p.ruleId,
        count: p.count,
        tightest: written(p.tightest),
      })),
    };
  }
}

/** How far a check is inside its limit, relative to the limit. */
function margin(c: CheckDraft): number {
  return (c.sense === 'max' ? c.limit - c.value : c.value - c.limit) / (Math.abs(c.limit) || 1);
}

/** Splits a list of checks into failures and a per-rule summary of passes (see CheckList); throws StructuralInputError for anything else. No units. */
export function splitChecks(all: readonly CheckDraft[]): { failed: Check[]; passed: PassedRule[] } {
  const bad = !Array.isArray(all)
    ? 0
    : all.findIndex(
        (c) =>
          typeof c !== 'object' ||
          c === null ||
          typeof c.ruleId !== 'string' ||
          (c.status !== 'pass' && c.status !== 'fail') ||
          !Number.isFinite(c.value) ||
          !Number.isFinite(c.limit) ||
          (c.sense !== 'max' && c.sense !== 'min') ||
          !['error', 'warning', 'info'].includes(c.severity) ||
          (typeof c.message !== 'string' && typeof c.message !== 'function'),
      );
  if (bad !== -1)
    throw new StructuralInputError([
      {
        path: Array.isArray(all) ? `checks[${bad}]` : 'checks',
        field: 'checks',
        message: 'must be a list of checks { ruleId, severity, status, message, value, limit, sense, … }',
      },
    ]);
  const list = new CheckList();
  for (const c of all) list.push(c);
  return list.result();
}

/** Builds a check against a limit; the message gets the verdict appended. */
export function check(
  ruleId: string,
  severity: Severity,
  elements: string[],
  message: string | (() => string),
  value: number,
  limit: Limit,
  sense: 'max' | 'min',
  limitValue = limit.value,
): CheckDraft {
  const ok = sense === 'max' ? value <= limitValue + 1e-9 : value >= limitValue - 1e-9;
  return {
    ruleId,
    severity,
    status: ok ? 'pass' : 'fail',
    elements,
    message,
    value,
    limit: limitValue,
    unit: limit.unit,
    sense,
    source: limit.source,
    sourceKind: limit.kind,
  };
}

const r2 = (v: number) => Math.round(v * 100) / 100;

/** Beam spans against the span limit for their support condition; spans in m. */
export function spanChecks(layout: Layout, limits: Limits): CheckDraft[] {
  const out: CheckDraft[] = [];
  for (const l of layout.lines) {
    for (const m of l.members) {
      const lim =
        m.kind === 'cantilever'
          ? limits.beamSpanCantileverMaxM
          : m.kind === 'simple'
            ? limits.beamSpanSimpleMaxM
            : limits.beamSpanContinuousMaxM;
      const cond = m.kind === 'cantilever' ? 'cantilever' : m.kind === 'simple' ? 'simply supported' : 'continuous';
      out.push(
        check(
          RULES.beamSpan,
          'warning',
          [m.id],
          () => `${m.id}: ${cond} span ${r2(m.lengthM)} m (limit ${lim.value} m)`,
          m.lengthM,
          lim,
          'max',
        ),
      );
    }
  }
  return out;
}

/** Spacing of neighbouring columns along each beam line, and columns close enough to merge; m. */
export function columnSpacingChecks(scheme: Scheme, layout: Layout, limits: Limits): CheckDraft[] {
  const out: CheckDraft[] = [];
  for (const l of layout.lines) {
    const cols = l.nodes.filter((n) => n.columnId !== null);
    for (let i = 0; i + 1 < cols.length; i++) {
      const d = cols[i + 1].s - cols[i].s;
      const ids = [cols[i].columnId as string, cols[i + 1].columnId as string];
      if (d < limits.columnMergeDistanceM.value) continue; // reported by the merge rule
      out.push(
        check(
          RULES.columnSpacing,
          'warning',
          ids,
          () =>
            `columns ${ids.join(' and ')} on line ${l.label} are ${r2(d)} m apart (economical at most ${limits.columnSpacingMaxM.value} m)`,
          d,
          limits.columnSpacingMaxM,
          'max',
        ),
      );
      if (d < limits.columnSpacingMinM.value)
        out.push(
          check(
            RULES.columnSpacing,
            'info',
            ids,
            () =>
              `columns ${ids.join(' and ')} on line ${l.label} are ${r2(d)} m apart (economical at least ${limits.columnSpacingMinM.value} m)`,
            d,
            limits.columnSpacingMinM,
            'min',
          ),
        );
    }
  }
  // any two columns closer than the merge distance, on a line or not (sorted sweep on x)
  const cs = [...scheme.columns].sort((a, b) => a.x - b.x);
  const lim = limits.columnMergeDistanceM;
  for (let i = 0; i < cs.length; i++) {
    for (let j = i + 1; j < cs.length && cs[j].x - cs[i].x < lim.value; j++) {
      const dx = cs[j].x - cs[i].x;
      const dy = cs[j].y - cs[i].y;
      const d = Math.sqrt(dx * dx + dy * dy);
      if (d < lim.value)
        out.push(
          check(
            RULES.columnMerge,
            'warning',
            [cs[i].id, cs[j].id],
            () =>
              `columns ${cs[i].id} and ${cs[j].id} are ${r2(d)} m apart: one column at (${r2((cs[i].x + cs[j].x) / 2)}, ${r2((cs[i].y + cs[j].y) / 2)}) could serve both`,
            d,
            lim,
            'min',
          ),
        );
    }
  }
  for (const id of layout.looseColumns)
    out.push({
      ruleId: RULES.columnOffGrid,
      severity: 'warning',
      status: 'fail',
      elements: [id],
      message: `column ${id} stands on no beam line`,
      value: 0,
      limit: 1,
      unit: 'beam lines',
      sense: 'min',
      source: 'common practice',
      sourceKind: 'practice',
    });
  return out;
}

/** Columns wider across a wall than the wall itself; mm. */
export function columnWallChecks(scheme: Scheme, layout: Layout): CheckDraft[] {
  const out: CheckDraft[] = [];
  const byId = new Map(scheme.columns.map((c) => [c.id, c]));
  for (const l of layout.lines) {
    if (l.wallThicknessMm <= 0) continue;
    for (const n of l.nodes) {
      if (!n.columnId) continue;
      const c = byId.get(n.columnId)!;
      const plan = columnPlan(c);
      const across = (l.runs === 'x' ? plan.by : plan.bx) * 1000;
      const lim: Limit = {
        value: l.wallThicknessMm,
        unit: 'mm',
        source: `wall thickness on line ${l.label} (scheme)`,
        kind: 'project',
      };
      out.push(
        check(
          RULES.columnWall,
          'warning',
          [c.id, l.gridLineId],
          () =>
            `column ${c.id} is ${across} mm across the ${l.wallThicknessMm} mm wall on line ${l.label}; turning it or reshaping it keeps it inside the wall`,
          across,
          lim,
          'max',
        ),
      );
    }
  }
  return out;
}

/** A secondary beam landing on a long primary span away from its supports suggests a column there. */
export function pointLoadChecks(layout: Layout, limits: Limits): CheckDraft[] {
  const out: CheckDraft[] = [];
  for (const s of layout.secondaries) {
    if (s.supports.length < 2) {
      out.push({
        ruleId: RULES.secondaryUnsupported,
        severity: 'error',
        status: 'fail',
        elements: [s.beam.id],
        message: `secondary beam ${s.beam.id} does not land on beam lines at both ends; its load is not carried`,
        value: s.supports.length,
        limit: 2,
        unit: 'supports',
        sense: 'min',
        source: 'statics',
        sourceKind: 'derived',
      });
      continue;
    }
    for (const sup of s.supports) {
      const line = layout.lineById.get(sup.lineId) as BeamLine;
      const m = line.members.find((mm) => sup.s > mm.startS + 1e-6 && sup.s < mm.endS - 1e-6);
      if (!m || m.kind === 'cantilever') continue;
      const a = sup.s - m.startS;
      const frac = Math.min(a, m.lengthM - a) / m.lengthM;
      if (frac < limits.pointLoadEndZone.value) continue;
      out.push(
        check(
          RULES.pointLoad,
          'info',
          [s.beam.id, m.id],
          () =>
            `${s.beam.id} lands ${r2(a)} m into the ${r2(m.lengthM)} m span ${m.id}; a column there would give spans of ${r2(a)} m and ${r2(m.lengthM - a)} m`,
          m.lengthM,
          limits.pointLoadLongSpanM,
          'max',
        ),
      );
    }
  }
  return out;
}

/** Stair riser, tread, 2R + T and risers per flight; mm. */
export function stairChecks(scheme: Scheme, limits: Limits): CheckDraft[] {
  const out: CheckDraft[] = [];
  for (const f of scheme.stairs) {
    // a code family's residential limits apply to dwellings; other buildings get the stricter values where known
    const other = f.use === 'other';
    const riserMax =
      scheme.basis.codeFamily === 'IS456' && other
        ? {
            ...limits.stairRiserMaxMm,
            value: 150,
            source: 'National Building Code of India, other buildings (as quoted)',
          }
        : scheme.basis.codeFamily === 'ACI318' && !other
          ? { ...limits.stairRiserMaxMm, value: 197, source: 'IBC 2015 §1011.5.2 exception, dwelling units' }
          : limits.stairRiserMaxMm;
    const treadMin =
      scheme.basis.codeFamily === 'IS456' && other
        ? {
            ...limits.stairTreadMinMm,
            value: 300,
            source: 'National Building Code of India, other buildings (as quoted)',
          }
        : scheme.basis.codeFamily === 'ACI318' && !other
          ? { ...limits.stairTreadMinMm, value: 254, source: 'IBC 2015 §1011.5.2 exception, dwelling units' }
          : limits.stairTreadMinMm;
    out.push(
      check(
        RULES.stairRiser,
        'error',
        [f.id],
        () => `${f.id}: riser ${f.riserMm} mm (at most ${riserMax.value} mm)`,
        f.riserMm,
        riserMax,
        'max',
      ),
    );
    out.push(
      check(
        RULES.stairRiser,
        'error',
        [f.id],
        () => `${f.id}: riser ${f.riserMm} mm (at least ${limits.stairRiserMinMm.value} mm)`,
        f.riserMm,
        limits.stairRiserMinMm,
        'min',
      ),
    );
    out.push(
      check(
        RULES.stairTread,
        'error',
        [f.id],
        () => `${f.id}: tread ${f.treadMm} mm (at least ${treadMin.value} mm)`,
        f.treadMm,
        treadMin,
        'min',
      ),
    );
    const rt = 2 * f.riserMm + f.treadMm;
    out.push(
      check(
        RULES.stair2RT,
        'warning',
        [f.id],
        () => `${f.id}: 2R + T = ${rt} mm (comfortable ${limits.stair2RTMinMm.value}–${limits.stair2RTMaxMm.value} mm)`,
        rt,
        limits.stair2RTMinMm,
        'min',
      ),
    );
    out.push(
      check(
        RULES.stair2RT,
        'warning',
        [f.id],
        () => `${f.id}: 2R + T = ${rt} mm (comfortable ${limits.stair2RTMinMm.value}–${limits.stair2RTMaxMm.value} mm)`,
        rt,
        limits.stair2RTMaxMm,
        'max',
      ),
    );
    out.push(
      check(
        RULES.stairRisers,
        'error',
        [f.id],
        () => `${f.id}: ${f.risers} risers in one flight (at most ${limits.stairRisersPerFlightMax.value})`,
        f.risers,
        limits.stairRisersPerFlightMax,
        'max',
      ),
    );
  }
  return out;
}
