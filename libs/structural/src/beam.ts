// Continuous beams by the stiffness method: two degrees of freedom per node (deflection and
// rotation), member loads turned into fixed-end actions, the reduced stiffness matrix solved by
// banded LDLᵀ. Within a member, results come from the simply-supported solution of its own
// loads plus the straight-line effect of its end moments, which is exact for these loads.
// Sign conventions: loads act downward and are positive; bending moments are positive when
// sagging (tension at the bottom); deflections are reported positive downward.
import { bandAdd, bandMatrix, BandMatrix, factorBand, solveBand } from './banded';
import { CAUTION } from './codes';
import type { Problem } from './model';
import { StructuralInputError } from './errors';

export { StructuralInputError };

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === 'object' && v !== null && !Array.isArray(v);
const finite = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

/** Physically sensible ranges the beam analysis accepts (m, kN·m², kN, kN/m). */
export const BEAM_RANGES = {
  lengthM: [0.05, 200],
  eiKNm2: [1e-3, 1e12],
  forceKN: [-1e6, 1e6],
  intensityKNPerM: [-1e5, 1e5],
  members: 100_000,
} as const;

export type Support = 'pin' | 'fixed' | 'free';

export interface BeamMember {
  /** m */
  lengthM: number;
  /** flexural rigidity, kN·m² */
  eiKNm2: number;
}

/** members[i] runs from node i to node i+1; supports has one entry per node. */
export interface BeamModel {
  members: BeamMember[];
  supports: Support[];
}

export interface PointLoad {
  kind: 'point';
  member: number;
  /** distance from the member's start, m */
  atM: number;
  /** kN, downward positive */
  forceKN: number;
}

/** A load varying linearly from startKNPerM at fromM to endKNPerM at toM (member coordinates, m). */
export interface LinearLoad {
  kind: 'linear';
  member: number;
  fromM: number;
  toM: number;
  startKNPerM: number;
  endKNPerM: number;
}

export type BeamLoad = PointLoad | LinearLoad;

/** A uniform load of w kN/m over the whole member of the given length (m). */
export function uniformLoad(member: number, wKNPerM: number, lengthM: number): LinearLoad {
  return { kind: 'linear', member, fromM: 0, toM: lengthM, startKNPerM: wKNPerM, endKNPerM: wKNPerM };
}

/** A point load P kN at a m from the member's start. */
export function pointLoad(member: number, atM: number, forceKN: number): PointLoad {
  return { kind: 'point', member, atM, forceKN };
}

/**
 * Builds the model of a continuous beam: spans (m) between supports, optional cantilevers (m)
 * beyond the end supports, end supports pinned or fixed, interior supports pinned.
 * EI in kN·m², one value for all members or one per member (cantilevers included, left first).
 * Throws StructuralInputError when a length is not a positive number of metres (a cantilever
 * may be 0 or absent) or an end support is neither 'pin' nor 'fixed'; EI is checked by analyseBeam.
 */
export function continuousBeam(opts: {
  spansM: number[];
  eiKNm2?: number | number[];
  leftEnd?: 'pin' | 'fixed';
  rightEnd?: 'pin' | 'fixed';
  leftCantileverM?: number;
  rightCantileverM?: number;
}): BeamModel {
  const problems: Problem[] = [];
  const [l0, l1] = BEAM_RANGES.lengthM;
  if (!isObj(opts) || !Array.isArray(opts.spansM) || opts.spansM.length === 0)
    throw new StructuralInputError([
      { path: 'spansM', field: 'spansM', message: 'must be a list of at least one span, m' },
    ]);
  if (opts.spansM.length > BEAM_RANGES.members)
    throw new StructuralInputError([
      { path: 'spansM', field: 'spansM', message: `at most ${BEAM_RANGES.members} spans` },
    ]);
  opts.spansM.forEach((l, i) => {
    if (!finite(l) || l < l0 || l > l1)
      problems.push({
        path: `spansM[${i}]`,
        field: 'spansM',
        message: `must be a number of metres from ${l0} to ${l1}`,
      });
  });
  for (const field of ['leftCantileverM', 'rightCantileverM'] as const) {
    const v = opts[field];
    if (v !== undefined && v !== 0 && (!finite(v) || v < l0 || v > l1))
      problems.push({ path: field, field, message: `must be 0 (none) or a number of metres from ${l0} to ${l1}` });
  }
  for (const field of ['leftEnd', 'rightEnd'] as const) {
    const v = opts[field];
    if (v !== undefined && v !== 'pin' && v !== 'fixed')
      problems.push({ path: field, field, message: "must be 'pin' or 'fixed'" });
  }
  if (problems.length) throw new StructuralInputError(problems);
  const lengths: number[] = [];
  const supports: Support[] = [];
  if (opts.leftCantileverM && opts.leftCantileverM > 0) {
    lengths.push(opts.leftCantileverM);
    supports.push('free');
  }
  supports.push(opts.leftEnd ?? 'pin');
  opts.spansM.forEach((l, i) => {
    lengths.push(l);
    supports.push(i === opts.spansM.length - 1 ? (opts.rightEnd ?? 'pin') : 'pin');
  });
  if (opts.rightCantileverM && opts.rightCantileverM > 0) {
    lengths.push(opts.rightCantileverM);
    supports.push('free');
  }
  const ei = opts.eiKNm2 ?? 1;
  return {
    members: lengths.map((lengthM, i) => ({ lengthM, eiKNm2: Array.isArray(ei) ? ei[i] : ei })),
    supports,
  };
}

// ---- member-level statics (exact for point and linearly varying loads) ----

const G = Math.sqrt(3 / 5);
const GW = [5 / 9, 8 / 9, 5 / 9];
const GX = [-G, 0, G];

/** Load intensity of a linear load at t, kN/m. */
function intensity(ld: LinearLoad, t: number): number {
  const h = ld.toM - ld.fromM;
  return h <= 0 ? 0 : ld.startKNPerM + ((ld.endKNPerM - ld.startKNPerM) * (t - ld.fromM)) / h;
}

// The kernels below are written out inline (no closures): these loops run millions of times
// in a full scheme analysis.

/** Fixed-end and simply-supported end actions of a member's loads. */
export interface MemberTerms {
  /** clamped-end hogging moment magnitudes at start and end, kN·m (Σ P·a·b²/L², Σ P·a²·b/L²) */
  fa: number;
  fb: number;
  /** simply-supported reactions at start and end, kN */
  ra: number;
  rb: number;
  total: number;
}

/** Fixed-end moments (kN·m) and simple-span reactions (kN) of a member's loads, span L in m. */
export function memberTerms(L: number, loads: readonly BeamLoad[]): MemberTerms {
  let fa = 0;
  let fb = 0;
  let rb = 0;
  let total = 0;
  const L2 = L * L;
  for (const ld of loads) {
    if (ld.kind === 'point') {
      const a = ld.atM;
      const b = L - a;
      fa += (ld.forceKN * a * b * b) / L2;
      fb += (ld.forceKN * a * a * b) / L2;
      rb += (ld.forceKN * a) / L;
      total += ld.forceKN;
    } else {
      const h = (ld.toM - ld.fromM) / 2;
      if (h <= 0) continue;
      const m = (ld.fromM + ld.toM) / 2;
      // 3-point Gauss: exact for the degree-4 integrands w(t)·t·(L − t)² and w(t)·t²·(L − t)
      for (let g = 0; g < 3; g++) {
        const t = m + GX[g] * h;
        const w = GW[g] * h * intensity(ld, t);
        const b = L - t;
        fa += (w * t * b * b) / L2;
        fb += (w * t * t * b) / L2;
        rb += (w * t) / L;
        total += w;
      }
    }
  }
  return { fa, fb, ra: total - rb, rb, total };
}

/** Simply-supported bending moment at x (kN·m) of a member's loads, with start reaction ra (kN). */
export function simpleMoment(L: number, loads: readonly BeamLoad[], ra: number, x: number): number {
  let m = ra * x;
  for (const ld of loads) {
    if (ld.kind === 'point') {
      if (ld.atM < x) m -= ld.forceKN * (x - ld.atM);
    } else if (ld.fromM < x) {
      const e = ld.toM < x ? ld.toM : x;
      const h = e - ld.fromM;
      const wa = ld.startKNPerM;
      const wb = intensity(ld, e);
      const d = x - ld.fromM;
      m -= wa * h * (d - h / 2) + (wb - wa) * ((d * h) / 2 - (h * h) / 3);
    }
  }
  return m;
}

/** Simply-supported shear at x (kN, just to the right of any point load at x). */
export function simpleShear(L: number, loads: readonly BeamLoad[], ra: number, x: number): number {
  let v = ra;
  for (const ld of loads) {
    if (ld.kind === 'point') {
      if (ld.atM < x || (ld.atM === x && x >= L)) v -= ld.forceKN;
    } else if (ld.fromM < x) {
      const e = ld.toM < x ? ld.toM : x;
      v -= ((ld.startKNPerM + intensity(ld, e)) / 2) * (e - ld.fromM);
    }
  }
  return v;
}

/** Simply-supported moment (kN·m) and shear (kN) at x of a member's loads. */
export function simpleMomentShear(L: number, loads: readonly BeamLoad[], ra: number, x: number): [number, number] {
  return [simpleMoment(L, loads, ra, x), simpleShear(L, loads, ra, x)];
}

/** Deflection at x of a unit load at t on a simple span L, times EI (m³). */
function unitDeflection(L: number, x: number, t: number): number {
  if (t <= x) {
    const r = L - x;
    return (t * r * (L * L - t * t - r * r)) / (6 * L);
  }
  const b = L - t;
  return (b * x * (L * L - b * b - x * x)) / (6 * L);
}

/** Simply-supported deflection (m, downward) at x of a member's loads, EI in kN·m². */
export function simpleDeflection(L: number, ei: number, loads: readonly BeamLoad[], x: number): number {
  let y = 0;
  for (const ld of loads) {
    if (ld.kind === 'point') {
      y += ld.forceKN * unitDeflection(L, x, ld.atM);
      continue;
    }
    // split at x, where the kernel has a kink; each piece is then integrated exactly
    for (let piece = 0; piece < 2; piece++) {
      const a = piece === 0 ? ld.fromM : Math.max(ld.fromM, x);
      const b = piece === 0 ? Math.min(ld.toM, x) : ld.toM;
      if (b <= a) continue;
      const m = (a + b) / 2;
      const h = (b - a) / 2;
      for (let g = 0; g < 3; g++) {
        const t = m + GX[g] * h;
        y += GW[g] * h * intensity(ld, t) * unitDeflection(L, x, t);
      }
    }
  }
  return y / ei;
}

// ---- the stiffness system ----

export interface PreparedBeam {
  model: BeamModel;
  /** equation number of each node DOF (2 per node: deflection, rotation), -1 where restrained */
  dof: Int32Array;
  nEq: number;
  band: BandMatrix;
  /** node positions from the first node, m */
  xs: number[];
  /** per member: length (m) and EI/L² (kN) for recovering end moments */
  len: Float64Array;
  eiOverL2: Float64Array;
  ok: boolean;
}

/** Element stiffness (v up, θ anticlockwise): returns the 4×4 matrix row-major. */
function elementK(L: number, ei: number): number[] {
  const c = ei / (L * L * L);
  const L2 = L * L;
  return [
    12 * c,
    6 * L * c,
    -12 * c,
    6 * L * c,
    6 * L * c,
    4 * L2 * c,
    -6 * L * c,
    2 * L2 * c,
    -12 * c,
    -6 * L * c,
    12 * c,
    -6 * L * c,
    6 * L * c,
    2 * L2 * c,
    -6 * L * c,
    4 * L2 * c,
  ];
}

export function numberDofs(model: BeamModel): { dof: Int32Array; nEq: number } {
  const nNodes = model.supports.length;
  const dof = new Int32Array(2 * nNodes);
  let nEq = 0;
  for (let n = 0; n < nNodes; n++) {
    const s = model.supports[n];
    dof[2 * n] = s === 'free' ? nEq++ : -1;
    dof[2 * n + 1] = s === 'fixed' ? -1 : nEq++;
  }
  return { dof, nEq };
}

/** Assembles and factorises the reduced stiffness matrix (banded, half-bandwidth 3). */
export function prepareBeam(model: BeamModel): PreparedBeam {
  const { dof, nEq } = numberDofs(model);
  const band = bandMatrix(nEq, 3);
  const xs = [0];
  model.members.forEach((mb, i) => {
    xs.push(xs[i] + mb.lengthM);
    const k = elementK(mb.lengthM, mb.eiKNm2);
    const map = [dof[2 * i], dof[2 * i + 1], dof[2 * i + 2], dof[2 * i + 3]];
    for (let r = 0; r < 4; r++) {
      if (map[r] < 0) continue;
      for (let c = 0; c <= r; c++) {
        if (map[c] < 0) continue;
        // equation numbers rise with the local index, so each lower-triangle pair is stored once
        bandAdd(band, map[r], map[c], k[r * 4 + c]);
      }
    }
  });
  const ok = nEq === 0 ? true : factorBand(band);
  const len = new Float64Array(model.members.length);
  const eiOverL2 = new Float64Array(model.members.length);
  model.members.forEach((mb, i) => {
    len[i] = mb.lengthM;
    eiOverL2[i] = mb.eiKNm2 / (mb.lengthM * mb.lengthM);
  });
  return { model, dof, nEq, band, xs, len, eiOverL2, ok };
}

/** Nodal solution and member end actions of one load case. */
export interface BeamSolution {
  /** per node: deflection (m, up positive) and rotation (rad, anticlockwise) */
  u: Float64Array;
  /** per member: [start moment, end moment] internal, kN·m, sagging positive */
  endMoments: Float64Array;
  terms: MemberTerms[];
  loadsByMember: BeamLoad[][];
}

export function groupLoads(nMembers: number, loads: readonly BeamLoad[]): BeamLoad[][] {
  const by: BeamLoad[][] = Array.from({ length: nMembers }, () => []);
  for (const ld of loads) by[ld.member].push(ld);
  return by;
}

/**
 * Solves the prepared system for member load terms: nodal displacements (m, rad) and internal
 * end moments (kN·m, sagging positive), two per member.
 */
export function solveTerms(
  p: PreparedBeam,
  t: readonly MemberTerms[],
  buf?: { rhs: Float64Array; u: Float64Array; endMoments: Float64Array },
): { u: Float64Array; endMoments: Float64Array } {
  const { model, dof } = p;
  const nm = model.members.length;
  const rhs = buf ? buf.rhs.fill(0) : new Float64Array(p.nEq);
  for (let i = 0; i < nm; i++) {
    const L = model.members[i].lengthM;
    const { fa, fb, ra, rb } = t[i];
    const d0 = dof[2 * i],
      d1 = dof[2 * i + 1],
      d2 = dof[2 * i + 2],
      d3 = dof[2 * i + 3];
    if (d0 >= 0) rhs[d0] -= ra + (fa - fb) / L;
    if (d1 >= 0) rhs[d1] -= fa;
    if (d2 >= 0) rhs[d2] -= rb - (fa - fb) / L;
    if (d3 >= 0) rhs[d3] += fb;
  }
  if (p.nEq > 0) solveBand(p.band, rhs);
  const u = buf ? buf.u : new Float64Array(dof.length);
  for (let k = 0; k < dof.length; k++) u[k] = dof[k] >= 0 ? rhs[dof[k]] : 0;
  const endMoments = buf ? buf.endMoments : new Float64Array(2 * nm);
  for (let i = 0; i < nm; i++) {
    const { lengthM: L, eiKNm2: ei } = model.members[i];
    const c = ei / (L * L);
    const v1 = u[2 * i],
      th1 = u[2 * i + 1],
      v2 = u[2 * i + 2],
      th2 = u[2 * i + 3];
    const m1 = c * (6 * v1 + 4 * L * th1 - 6 * v2 + 2 * L * th2) + t[i].fa;
    const m2 = c * (6 * v1 + 2 * L * th1 - 6 * v2 + 4 * L * th2) - t[i].fb;
    endMoments[2 * i] = -m1;
    endMoments[2 * i + 1] = m2;
  }
  return { u, endMoments };
}

/**
 * The same solve as solveTerms on packed terms (fa, fb, ra, rb per member in one array), writing
 * into caller-owned buffers: the form the envelope uses for its many arrangements.
 */
export function solvePacked(
  p: PreparedBeam,
  T: Float64Array,
  rhs: Float64Array,
  u: Float64Array,
  endMoments: Float64Array,
): void {
  const { dof, len, eiOverL2 } = p;
  const nm = len.length;
  rhs.fill(0);
  for (let i = 0; i < nm; i++) {
    const L = len[i];
    const fa = T[4 * i],
      fb = T[4 * i + 1],
      ra = T[4 * i + 2],
      rb = T[4 * i + 3];
    const d0 = dof[2 * i],
      d1 = dof[2 * i + 1],
      d2 = dof[2 * i + 2],
      d3 = dof[2 * i + 3];
    const sh = (fa - fb) / L;
    if (d0 >= 0) rhs[d0] -= ra + sh;
    if (d1 >= 0) rhs[d1] -= fa;
    if (d2 >= 0) rhs[d2] -= rb - sh;
    if (d3 >= 0) rhs[d3] += fb;
  }
  if (p.nEq > 0) solveBand(p.band, rhs);
  for (let k = 0; k < dof.length; k++) u[k] = dof[k] >= 0 ? rhs[dof[k]] : 0;
  for (let i = 0; i < nm; i++) {
    const L = len[i];
    const c = eiOverL2[i];
    const v1 = u[2 * i],
      th1 = u[2 * i + 1],
      v2 = u[2 * i + 2],
      th2 = u[2 * i + 3];
    endMoments[2 * i] = -(c * (6 * v1 + 4 * L * th1 - 6 * v2 + 2 * L * th2) + T[4 * i]);
    endMoments[2 * i + 1] = c * (6 * v1 + 2 * L * th1 - 6 * v2 + 4 * L * th2) - T[4 * i + 1];
  }
}

/** Solves one load case on a prepared beam. */
export function solvePrepared(p: PreparedBeam, loadsByMember: BeamLoad[][], terms?: MemberTerms[]): BeamSolution {
  const t = terms ?? p.model.members.map((mb, i) => memberTerms(mb.lengthM, loadsByMember[i]));
  const { u, endMoments } = solveTerms(p, t);
  return { u, endMoments, terms: t, loadsByMember };
}

/** Vertical reactions (kN, upward) at every node from member terms and end moments; zero at free nodes. */
export function nodeReactions(
  model: BeamModel,
  t: readonly MemberTerms[],
  endMoments: Float64Array,
  into?: Float64Array,
): Float64Array {
  const nm = model.members.length;
  const r = into ? into.fill(0) : new Float64Array(nm + 1);
  for (let i = 0; i < nm; i++) {
    const L = model.members[i].lengthM;
    const d = (endMoments[2 * i + 1] - endMoments[2 * i]) / L;
    r[i] += t[i].ra + d;
    r[i + 1] += t[i].rb - d;
  }
  for (let n = 0; n <= nm; n++) if (model.supports[n] === 'free') r[n] = 0;
  return r;
}

// ---- results of a single analysis ----

export interface MemberResult {
  index: number;
  lengthM: number;
  /** internal moments at the member ends, kN·m, sagging positive */
  startMomentKNm: number;
  endMomentKNm: number;
  /** shear just inside each end, kN (positive: upward force on the left-hand part) */
  startShearKN: number;
  endShearKN: number;
  /** largest sagging and hogging moments and where they act (m from the member start) */
  maxMoment: { atM: number; valueKNm: number };
  minMoment: { atM: number; valueKNm: number };
  /** largest downward deflection within the member, mm */
  maxDeflection: { atM: number; valueMm: number };
}

export interface BeamResult {
  /** preliminary results only: see CAUTION */
  caution: string;
  problems: Problem[];
  /** one per node: vertical reaction (kN, upward) and moment reaction (kN·m, anticlockwise); zero at free nodes */
  reactions: { node: number; xM: number; forceKN: number; momentKNm: number }[];
  members: MemberResult[];
  /** per node: deflection (mm, downward) and rotation (rad, anticlockwise) */
  nodes: { node: number; xM: number; deflectionMm: number; rotationRad: number }[];
  totalLoadKN: number;
}

/** Internal moment (kN·m), shear (kN) and downward deflection (m) at x in member i of a solution. */
export function memberStateAt(
  p: PreparedBeam,
  s: BeamSolution,
  i: number,
  x: number,
): { m: number; v: number; y: number } {
  const { lengthM: L, eiKNm2: ei } = p.model.members[i];
  const loads = s.loadsByMember[i];
  const ml = s.endMoments[2 * i];
  const mr = s.endMoments[2 * i + 1];
  const [m0, v0] = simpleMomentShear(L, loads, s.terms[i].ra, x);
  const xi = x / L;
  const m = m0 + ml * (1 - xi) + mr * xi;
  const v = v0 + (mr - ml) / L;
  // chord between the end deflections, plus the simply-supported deflection of loads and end moments
  const v1 = -s.u[2 * i];
  const v2 = -s.u[2 * i + 2];
  const yEnd = ((L * L) / (6 * ei)) * (ml * (2 * xi - 3 * xi * xi + xi * xi * xi) + mr * (xi - xi * xi * xi));
  const y = v1 * (1 - xi) + v2 * xi + simpleDeflection(L, ei, loads, x) + yEnd;
  return { m, v, y };
}

/**
 * Problems with a beam model given as any value: members with lengths (m) and EI (kN·m²) in
 * range, one support per node, each 'pin', 'fixed' or 'free'. Never throws.
 */
export function validateBeamModel(model: unknown): Problem[] {
  const out: Problem[] = [];
  if (!isObj(model))
    return [{ path: 'model', field: 'model', message: 'a beam model must be an object { members, supports }' }];
  const members = model['members'];
  const supports = model['supports'];
  if (!Array.isArray(members))
    out.push({ path: 'members', field: 'members', message: 'must be a list of { lengthM, eiKNm2 }' });
  if (!Array.isArray(supports))
    out.push({
      path: 'supports',
      field: 'supports',
      message: "must be a list of 'pin', 'fixed' or 'free', one per node",
    });
  if (out.length) return out;
  const ms = members as unknown[];
  const ss = supports as unknown[];
  const nm = ms.length;
  if (nm === 0) out.push({ path: 'members', field: 'members', message: 'a beam needs at least one member' });
  if (nm > BEAM_RANGES.members)
    return [{ path: 'members', field: 'members', message: `at most ${BEAM_RANGES.members} members` }];
  if (ss.length !== nm + 1)
    out.push({
      path: 'supports',
      field: 'supports',
      message: `expected ${nm + 1} supports (one per node), got ${ss.length}`,
    });
  ms.forEach((mb, i) => {
    if (!isObj(mb)) {
      out.push({ path: `members[${i}]`, field: 'members', message: 'must be an object { lengthM, eiKNm2 }' });
      return;
    }
    const [l0, l1] = BEAM_RANGES.lengthM;
    const [e0, e1] = BEAM_RANGES.eiKNm2;
    if (!finite(mb['lengthM']) || mb['lengthM'] < l0 || mb['lengthM'] > l1)
      out.push({
        path: `members[${i}].lengthM`,
        field: 'lengthM',
        message: `length must be a number of metres from ${l0} to ${l1}`,
      });
    if (!finite(mb['eiKNm2']) || mb['eiKNm2'] < e0 || mb['eiKNm2'] > e1)
      out.push({
        path: `members[${i}].eiKNm2`,
        field: 'eiKNm2',
        message: `EI must be a number of kN·m² from ${e0} to ${e1}`,
      });
  });
  ss.forEach((sp, n) => {
    if (sp !== 'pin' && sp !== 'fixed' && sp !== 'free')
      out.push({ path: `supports[${n}]`, field: 'supports', message: "must be 'pin', 'fixed' or 'free'" });
  });
  return out;
}

// paths are written only when something is wrong: a long line carries tens of thousands of loads
const at = (name: string, k: number) => `${name}[${k}]`;

/**
 * Problems with loads (any value) on a valid model: a list of point loads (kN, at m from the
 * member start) and linear loads (kN/m, fromM ≤ toM), each on an existing member and within its
 * length. `name` prefixes the paths (e.g. "loads", "dead"). Never throws.
 */
export function validateLoads(model: BeamModel, loads: unknown, name = 'loads'): Problem[] {
  if (!Array.isArray(loads)) return [{ path: name, field: name, message: 'must be a list of loads' }];
  const out: Problem[] = [];
  const nm = model.members.length;
  const [f0, f1] = BEAM_RANGES.forceKN;
  const [w0, w1] = BEAM_RANGES.intensityKNPerM;
  for (let k = 0; k < loads.length; k++) {
    const ld: unknown = loads[k];
    if (!isObj(ld)) {
      out.push({ path: at(name, k), field: name, message: "must be a load { kind: 'point' | 'linear', member, … }" });
      continue;
    }
    const m = ld['member'];
    if (typeof m !== 'number' || !Number.isInteger(m) || m < 0 || m >= nm) {
      out.push({
        path: `${at(name, k)}.member`,
        field: 'member',
        message: `no member ${String(m)} (members are 0..${nm - 1})`,
      });
      continue;
    }
    const L = model.members[m].lengthM;
    const tol = 1e-9 * L;
    if (ld['kind'] === 'point') {
      const a = ld['atM'];
      if (!finite(a) || a < 0 || a > L + tol)
        out.push({ path: `${at(name, k)}.atM`, field: 'atM', message: `must lie within 0..${L} m of member ${m}` });
      const f = ld['forceKN'];
      if (!finite(f) || f < f0 || f > f1)
        out.push({
          path: `${at(name, k)}.forceKN`,
          field: 'forceKN',
          message: `must be a number of kN from ${f0} to ${f1}`,
        });
    } else if (ld['kind'] === 'linear') {
      const a = ld['fromM'],
        b = ld['toM'];
      if (!finite(a) || !finite(b) || a < 0 || b > L + tol || a > b)
        out.push({
          path: `${at(name, k)}.fromM`,
          field: 'fromM',
          message: `load must lie within 0..${L} m of member ${m} with fromM <= toM`,
        });
      for (const field of ['startKNPerM', 'endKNPerM'] as const) {
        const w = ld[field];
        if (!finite(w) || w < w0 || w > w1)
          out.push({ path: `${at(name, k)}.${field}`, field, message: `must be a number of kN/m from ${w0} to ${w1}` });
      }
    } else out.push({ path: `${at(name, k)}.kind`, field: 'kind', message: "must be 'point' or 'linear'" });
  }
  return out;
}

/**
 * Analyses one continuous beam under one set of loads.
 * Input: lengths m, EI kN·m², point loads kN, line loads kN/m.
 * Output: reactions kN and kN·m, moments kN·m (sagging +), shears kN, deflections mm (down +).
 * Invalid input (any value) or an unstable support arrangement gives problems, not an exception.
 */
export function analyseBeam(
  model: BeamModel,
  loads: readonly BeamLoad[],
  options: { samplesPerMember?: number } = {},
): BeamResult {
  const empty = (problems: Problem[]): BeamResult => ({
    caution: CAUTION,
    problems,
    reactions: [],
    members: [],
    nodes: [],
    totalLoadKN: 0,
  });
  const mp = validateBeamModel(model);
  if (mp.length) return empty(mp);
  const problems = validateLoads(model, loads);
  const ns = options?.samplesPerMember;
  if (ns !== undefined && !(Number.isInteger(ns) && ns >= 1 && ns <= 1000))
    problems.push({
      path: 'options.samplesPerMember',
      field: 'samplesPerMember',
      message: 'must be a whole number from 1 to 1000',
    });
  if (problems.length) return empty(problems);
  const p = prepareBeam(model);
  if (!p.ok)
    return empty([
      { path: 'supports', field: 'supports', message: 'the supports do not hold the beam up (it is a mechanism)' },
    ]);
  const s = solvePrepared(p, groupLoads(model.members.length, loads));
  const nm = model.members.length;
  const nSeg = options.samplesPerMember ?? 40;

  const reactions = model.supports.map((sup, n) => {
    let f = 0;
    let mo = 0;
    if (n > 0) {
      const L = model.members[n - 1].lengthM;
      const mr = s.endMoments[2 * (n - 1) + 1];
      const ml = s.endMoments[2 * (n - 1)];
      f += s.terms[n - 1].rb - (mr - ml) / L; // upward force from the member's end
      mo += mr;
    }
    if (n < nm) {
      const L = model.members[n].lengthM;
      const ml = s.endMoments[2 * n];
      const mr = s.endMoments[2 * n + 1];
      f += s.terms[n].ra + (mr - ml) / L;
      mo -= ml;
    }
    return { node: n, xM: p.xs[n], forceKN: sup === 'free' ? 0 : f, momentKNm: sup === 'fixed' ? mo : 0 };
  });

  const members: MemberResult[] = model.members.map((mb, i) => {
    const L = mb.lengthM;
    const xsSet = new Set<number>();
    for (let k = 0; k <= nSeg; k++) xsSet.add((L * k) / nSeg);
    for (const ld of s.loadsByMember[i]) {
      if (ld.kind === 'point') xsSet.add(ld.atM);
      else {
        xsSet.add(ld.fromM);
        xsSet.add(ld.toM);
      }
    }
    const xsArr = [...xsSet].sort((a, b) => a - b);
    // zero-shear points give the exact extreme moments between samples
    const extra: number[] = [];
    for (let k = 0; k + 1 < xsArr.length; k++) {
      let a = xsArr[k] + 1e-12;
      let b = xsArr[k + 1] - 1e-12;
      let va = memberStateAt(p, s, i, a).v;
      const vb = memberStateAt(p, s, i, b).v;
      if (va * vb < 0) {
        for (let it = 0; it < 60; it++) {
          const c = (a + b) / 2;
          const vc = memberStateAt(p, s, i, c).v;
          if (vc * va > 0) {
            a = c;
            va = vc;
          } else b = c;
        }
        extra.push((a + b) / 2);
      }
    }
    let maxM = { atM: 0, valueKNm: -Infinity };
    let minM = { atM: 0, valueKNm: Infinity };
    let maxY = { atM: 0, valueMm: -Infinity };
    for (const x of [...xsArr, ...extra]) {
      const st = memberStateAt(p, s, i, x);
      if (st.m > maxM.valueKNm) maxM = { atM: x, valueKNm: st.m };
      if (st.m < minM.valueKNm) minM = { atM: x, valueKNm: st.m };
      if (st.y * 1000 > maxY.valueMm) maxY = { atM: x, valueMm: st.y * 1000 };
    }
    const ml = s.endMoments[2 * i];
    const mr = s.endMoments[2 * i + 1];
    return {
      index: i,
      lengthM: L,
      startMomentKNm: ml,
      endMomentKNm: mr,
      startShearKN: s.terms[i].ra + (mr - ml) / L,
      endShearKN: s.terms[i].ra + (mr - ml) / L - s.terms[i].total,
      maxMoment: maxM,
      minMoment: minM,
      maxDeflection: maxY,
    };
  });

  const nodes = model.supports.map((_, n) => ({
    node: n,
    xM: p.xs[n],
    deflectionMm: -s.u[2 * n] * 1000,
    rotationRad: s.u[2 * n + 1],
  }));
  const totalLoadKN = s.terms.reduce((a, t) => a + t.total, 0);
  return { caution: CAUTION, problems: [], reactions, members, nodes, totalLoadKN };
}

/**
 * The same reduced stiffness system as prepareBeam/solveTerms, assembled as a full dense matrix
 * (row-major n×n) with its right-hand side; for the benchmark and as an independent check.
 */
export function assembleDense(
  model: BeamModel,
  t: readonly MemberTerms[],
): { n: number; a: Float64Array; rhs: Float64Array } {
  const { dof, nEq: n } = numberDofs(model);
  const a = new Float64Array(n * n);
  const rhs = new Float64Array(n);
  model.members.forEach((mb, i) => {
    const k = elementK(mb.lengthM, mb.eiKNm2);
    const map = [dof[2 * i], dof[2 * i + 1], dof[2 * i + 2], dof[2 * i + 3]];
    for (let r = 0; r < 4; r++) {
      if (map[r] < 0) continue;
      for (let c = 0; c < 4; c++) if (map[c] >= 0) a[map[r] * n + map[c]] += k[r * 4 + c];
    }
    const L = mb.lengthM;
    const { fa, fb, ra, rb } = t[i];
    const eq = [-(ra + (fa - fb) / L), -fa, -(rb - (fa - fb) / L), fb];
    for (let r = 0; r < 4; r++) if (map[r] >= 0) rhs[map[r]] += eq[r];
  });
  return { n, a, rhs };
}
