// Moment and shear envelope diagrams of one beam line on one level, for drawing. The envelope in
// analyse.ts keeps only each span's exact extremes; a diagram needs the running largest and
// smallest values along the whole line. This rebuilds the line's beam and loads exactly as
// analyseScheme does (schemeLines, lineParts), solves every load arrangement the envelope uses
// under every combination, and samples each span at even points plus the positions that matter
// (the envelope's own extreme positions, load boundaries and the span ends), so the drawn peaks
// are the envelope's numbers.
import { BeamLoad, groupLoads, memberStateAt, PreparedBeam, solvePrepared } from './beam';
import { CAUTION } from './codes';
import { envelopeParts, loadPatterns } from './envelope';
import { StructuralInputError } from './errors';
import { LevelKind, lineParts, schemeLines } from './analyse';
import type { Scheme } from './model';
import { validateScheme } from './validate';

export interface BeamLineDiagram {
  caution: string;
  lineId: string;
  level: LevelKind;
  label: string;
  /**
   * stations along the line, m from its start, ascending; sagging moment positive, kN·m; shear
   * positive upward on the left-hand part, kN. At a support or a point load the position appears
   * twice: the values just left of it, then just right of it (the shear jumps there).
   */
  stations: {
    s: number;
    member: number;
    maxMomentKNm: number;
    minMomentKNm: number;
    maxShearKN: number;
    minShearKN: number;
  }[];
  /** supports with their position and column, and the largest factored reaction there (kN) */
  supports: { s: number; columnId: string | null; maxReactionKN: number }[];
  /** per member: span length and the governing (exact) extremes from the envelope */
  members: {
    id: string;
    startS: number;
    lengthM: number;
    maxMomentKNm: number;
    maxMomentAtM: number;
    minMomentKNm: number;
    minMomentAtM: number;
    maxShearKN: number;
  }[];
  /** the combinations and arrangements the diagram covers, as the envelope counts them */
  patternsTried: number;
}

/** Default even divisions per span (common practice for a smooth drawing; peaks are added exactly). */
const POINTS_PER_SPAN = 24;

const scaled = (loads: readonly BeamLoad[], f: number): BeamLoad[] =>
  loads.map((l) =>
    l.kind === 'point'
      ? { ...l, forceKN: l.forceKN * f }
      : { ...l, startKNPerM: l.startKNPerM * f, endKNPerM: l.endKNPerM * f },
  );

/** Positions (m from the member start) to evaluate on member i: even points, load boundaries, given extras. */
function memberPoints(L: number, n: number, loads: readonly BeamLoad[], extra: number[]): number[] {
  const xs: number[] = [];
  for (let k = 0; k <= n; k++) xs.push((L * k) / n);
  for (const l of loads) {
    if (l.kind === 'point') xs.push(l.atM);
    else xs.push(l.fromM, l.toM);
  }
  for (const x of extra) xs.push(x);
  xs.sort((a, b) => a - b);
  const out: number[] = [];
  const tol = 1e-9 * L;
  for (const x of xs) {
    const c = Math.min(Math.max(x, 0), L);
    if (out.length === 0 || c - out[out.length - 1] > tol) out.push(c);
  }
  return out;
}

/**
 * Moment and shear envelope diagrams of beam line `lineId` on `level` ('floor' for the typical
 * floor, 'roof'). Units: m along the line, kN·m, kN. Throws StructuralInputError for an invalid
 * scheme, an unknown line or level, or a line its columns do not hold up.
 */
export function beamLineDiagram(
  scheme: Scheme,
  lineId: string,
  level: LevelKind,
  opts: { pointsPerSpan?: number } = {},
): BeamLineDiagram {
  const invalid = validateScheme(scheme);
  if (invalid.length) throw new StructuralInputError(invalid);
  const n = opts.pointsPerSpan ?? POINTS_PER_SPAN;
  if (!Number.isInteger(n) || n < 2 || n > 500)
    throw new StructuralInputError([
      { path: 'opts.pointsPerSpan', field: 'pointsPerSpan', message: 'must be a whole number from 2 to 500' },
    ]);
  const setup = schemeLines(scheme);
  if (Array.isArray(setup)) throw new StructuralInputError(setup);
  const line = setup.layout.lines.find((l) => l.id === lineId);
  if (!line)
    throw new StructuralInputError([
      { path: 'lineId', field: 'lineId', message: `no beam line ${lineId} in scheme ${scheme.id}` },
    ]);
  const lv = setup.levels.get(level);
  if (!lv)
    throw new StructuralInputError([
      {
        path: 'level',
        field: 'level',
        message: `level must be ${[...setup.levels.keys()].join(' or ')} for a ${scheme.basis.storeys}-storey scheme`,
      },
    ]);
  const p = setup.prepared.get(line.id) as PreparedBeam;
  const shape = setup.shapePart(line.id);
  if (!p.ok || !shape)
    throw new StructuralInputError([
      {
        path: `lines.${line.id}`,
        elementId: line.id,
        field: 'supports',
        message: 'the columns do not hold this beam line up',
      },
    ]);
  const combos = setup.combos;
  // the envelope exactly as analyseScheme computes it for this line and level
  const parts = lineParts(p, shape, lv, line.id);
  const env = envelopeParts(p, parts.dead, parts.live, combos, undefined, line.members);

  // the same loads as lists, for solving arrangement by arrangement
  const slabShare = setup.shapes.lines.get(line.id) ?? [];
  const dead = [...scaled(slabShare, lv.slabDeadKPa), ...(lv.extraDead.get(line.id) ?? [])];
  const live = scaled(slabShare, lv.liveKPa);
  const nm = line.members.length;
  const deadBy = groupLoads(nm, dead);
  const liveBy = groupLoads(nm, live);
  const deadSol = solvePrepared(p, deadBy);
  // imposed load on the members each arrangement loads ('dead only' carries none)
  const arrangements = loadPatterns(p.model).map((a) => {
    const by = liveBy.map((ls, i) => (a.members[i] ? ls : []));
    return { label: a.label, sol: solvePrepared(p, by) };
  });
  const none = arrangements.findIndex((a) => a.label === 'dead only');

  // a combination without imposed load is dead load alone; otherwise every arrangement with
  // imposed load, as the envelope takes them
  const withLive = arrangements.map((_, k) => k).filter((k) => k !== none);
  const cases = combos.map((c) => ({ c, pick: c.live === 0 ? [none] : withLive }));
  const s0 = line.nodes[0].s;
  const stations: BeamLineDiagram['stations'] = [];
  const members: BeamLineDiagram['members'] = [];
  for (let i = 0; i < nm; i++) {
    const L = line.members[i].lengthM;
    const startS = line.nodes[i].s - s0;
    const e = env.members[i];
    const own = [...deadBy[i], ...liveBy[i]];
    const xs = memberPoints(L, n, own, [e.maxMomentAtM, e.minMomentAtM]);
    const pointAt = new Set<number>();
    for (const l of own) if (l.kind === 'point' && l.atM > 0 && l.atM < L) pointAt.add(l.atM);
    for (const x of xs) {
      // the shear just left of a point load inside the span, then at it (just right of it); at
      // the member ends the state is the one just inside the member
      const sides = pointAt.has(x) ? [x * (1 - 1e-12), x] : [x];
      const dAt = memberStateAt(p, deadSol, i, x);
      const qAt = arrangements.map((a) => memberStateAt(p, a.sol, i, x));
      for (const xe of sides) {
        const left = xe !== x;
        const dv = left ? memberStateAt(p, deadSol, i, xe).v : dAt.v;
        const qv = left ? arrangements.map((a) => memberStateAt(p, a.sol, i, xe).v) : qAt.map((q) => q.v);
        let mMax = -Infinity,
          mMin = Infinity,
          vMax = -Infinity,
          vMin = Infinity;
        for (const { c, pick } of cases) {
          for (const k of pick) {
            const m = c.dead * dAt.m + c.live * qAt[k].m;
            const v = c.dead * dv + c.live * qv[k];
            if (m > mMax) mMax = m;
            if (m < mMin) mMin = m;
            if (v > vMax) vMax = v;
            if (v < vMin) vMin = v;
          }
        }
        stations.push({
          s: startS + x,
          member: i,
          maxMomentKNm: mMax,
          minMomentKNm: mMin,
          maxShearKN: vMax,
          minShearKN: vMin,
        });
      }
    }
    members.push({
      id: line.members[i].id,
      startS,
      lengthM: L,
      maxMomentKNm: e.maxMomentKNm,
      maxMomentAtM: e.maxMomentAtM,
      minMomentKNm: e.minMomentKNm,
      minMomentAtM: e.minMomentAtM,
      maxShearKN: e.maxShearKN,
    });
  }
  return {
    caution: CAUTION,
    lineId: line.id,
    level,
    label: line.label,
    stations,
    supports: line.nodes.map((nd, k) => ({
      s: nd.s - s0,
      columnId: nd.columnId,
      maxReactionKN: env.maxFactoredReactionsKN[k],
    })),
    members,
    patternsTried: env.patternsTried,
  };
}
