// Envelope of a continuous beam under factored dead load on every span and imposed load
// patterned over all spans, alternate spans, and adjacent pairs with alternates beyond.
//
// What the clauses ask: IS 456:2000 cl. 22.4.1 (a) imposed load on two adjacent spans, (b) on
// alternate spans; ACI 318-19 §6.4.2 (a) on the span and alternate spans for the largest positive
// moment, (b) on adjacent spans only for the largest negative moment at a support. The engine
// also loads all spans, and loads every other span beyond an adjacent pair: those further spans
// add to the hogging at the pair's support, so it gives at least the clause's support moment.
// These are more arrangements and heavier ones than the clauses ask for (conservative), not the
// clauses' own list.
//
// Every
// arrangement is evaluated over every span, and extremes are taken exactly: within a span the
// moment is a piecewise cubic between load discontinuities, so its extremes lie at the ends, at
// the breakpoints and where the shear crosses zero.
//
// Why it stays close to linear in the number of spans: an adjacent-span arrangement at support k
// equals an alternate-span arrangement on one side of k plus a correction load on the other
// side. On a continuous beam the effect of a load on one side of a support reaches the spans
// beyond it as one fixed shape (the unloaded part's homogeneous solution) times a scalar. For a
// given span, all arrangements of one parity on one side therefore differ only by that scalar;
// the largest and smallest moments over the span are convex and concave in it, and shears and
// reactions are linear in it, so only the arrangements with the largest and smallest scalar can
// govern. A running maximum and minimum per side and parity finds them in one sweep.
import {
  BeamLoad,
  BeamModel,
  groupLoads,
  memberTerms,
  PreparedBeam,
  prepareBeam,
  simpleDeflection,
  simpleShear,
  solvePacked,
  validateBeamModel,
  validateLoads,
} from './beam';
import { CAUTION, Combination } from './codes';
import { StructuralInputError } from './errors';
import type { SpanKind } from './layout';
import type { Problem } from './model';

// three points per member: the largest deflection lies near mid-span, or at a free end
const DEFLECTION_POINTS = [0.4, 0.5, 0.6];
const DEFLECTION_POINTS_CANTILEVER = [0, 0.5, 1];

export interface MemberEnvelope {
  /** largest sagging moment, kN·m, where (m from the member start) and under which arrangement */
  maxMomentKNm: number;
  maxMomentAtM: number;
  maxPattern: string;
  /** most negative (hogging) moment, kN·m */
  minMomentKNm: number;
  minMomentAtM: number;
  minPattern: string;
  /** largest shear magnitude, kN */
  maxShearKN: number;
  /** service (D + L, all spans) deflection, mm downward, and where */
  serviceDeflectionMm: number;
  serviceDeflectionAtM: number;
}

/** What a scheme's beam line knows of a member, carried into its envelope (m). */
export interface MemberMeta {
  id: string;
  lengthM: number;
  kind: SpanKind;
}

export interface BeamEnvelope {
  /** preliminary results only: see CAUTION */
  caution: string;
  ok: boolean;
  /** what is wrong with the input when ok is false (element and field named) */
  problems: Problem[];
  members: MemberEnvelope[];
  /** service reactions per node, all spans loaded, kN: dead and imposed apart */
  deadReactionsKN: number[];
  liveReactionsKN: number[];
  /** largest factored reaction per node over all arrangements, kN */
  maxFactoredReactionsKN: number[];
  /** (combination, arrangement) pairs covered */
  patternsTried: number;
}

/**
 * The imposed-load arrangements of a beam with n members (no units): label, loaded members, and
 * scope. Every arrangement is now evaluated over every member, so scope is always null (kept for
 * callers of the earlier form, where adjacent-span arrangements were scanned beside their support only).
 * Throws StructuralInputError for an invalid model.
 */
export function loadPatterns(
  model: BeamModel,
): { label: string; members: boolean[]; scope: [number, number] | null }[] {
  const problems = validateBeamModel(model);
  if (problems.length) throw new StructuralInputError(problems);
  const n = model.members.length;
  return arrangements(model).map((a) => {
    const members: boolean[] = [];
    for (let i = 0; i < n; i++) members.push(loadedIn(a, i));
    return { label: arrangementLabel(a), members, scope: null };
  });
}

/** An arrangement in compact form: which spans carry imposed load is computed, not stored. */
interface Arrangement {
  kind: 'all' | 'none' | 'odd' | 'even' | 'adjacent';
  /** the support an adjacent-span arrangement serves */
  node: number;
}

function arrangements(model: BeamModel): Arrangement[] {
  const n = model.members.length;
  const out: Arrangement[] = [
    { kind: 'all', node: 0 },
    { kind: 'none', node: 0 },
  ];
  if (n > 1) out.push({ kind: 'odd', node: 0 }, { kind: 'even', node: 0 });
  // spans node-1 and node loaded, then every other span beyond on both sides
  for (let node = 1; node < n; node++) if (model.supports[node] !== 'free') out.push({ kind: 'adjacent', node });
  return out;
}

function loadedIn(a: Arrangement, i: number): boolean {
  const k = a.kind;
  if (k === 'all') return true;
  if (k === 'none') return false;
  if (k === 'odd') return (i & 1) === 0;
  if (k === 'even') return (i & 1) === 1;
  return adjacentLoads(a.node, i);
}

/** Whether member i carries imposed load in the adjacent-span arrangement at support k. */
function adjacentLoads(k: number, i: number): boolean {
  return i >= k ? ((i - k) & 1) === 0 : ((k - 1 - i) & 1) === 0;
}

function arrangementLabel(a: Arrangement): string {
  switch (a.kind) {
    case 'all':
      return 'all spans';
    case 'none':
      return 'dead only';
    case 'odd':
      return 'alternate spans (odd)';
    case 'even':
      return 'alternate spans (even)';
    default:
      return `adjacent spans at support ${a.node}`;
  }
}

// ---- load parts: terms, end shears, deflections and the exact piecewise-cubic moment ----

/**
 * One group of loads on a beam, reduced once to what every arrangement needs: packed fixed-end
 * and simple-span terms (fa, fb, ra, rb per member, kN·m and kN), simple-span shears just inside
 * the ends (kN), simple-span deflections at the deflection points (m), and the simple-span moment
 * as a cubic per piece between load discontinuities (kN·m; local coordinate from the piece start,
 * m). Loads that keep their shape from level to level (a slab's share, per kPa) are reduced once
 * and scaled.
 */
export interface LoadPart {
  terms: Float64Array;
  v0: Float64Array;
  defl: Float64Array;
  /** breakpoints of member i are bp[off[i]] … bp[off[i + 1] − 1] (first 0, last L), m */
  off: Int32Array;
  bp: Float64Array;
  /** c0..c3 per piece; piece j of member i at 4 × (off[i] − i + j) */
  coef: Float64Array;
}

function deflectionPoints(model: BeamModel, i: number): number[] {
  return model.supports[i] === 'free' || model.supports[i + 1] === 'free'
    ? DEFLECTION_POINTS_CANTILEVER
    : DEFLECTION_POINTS;
}

/**
 * Cubic of the simple-span moment on the piece [x0, x0 + h] (no load boundary inside), written
 * into out at o: M0(x0 + t) = c0 + c1 t + c2 t² + c3 t³. Start reaction ra in kN.
 */
function pieceCubic(loads: readonly BeamLoad[], ra: number, x0: number, h: number, out: Float64Array, o: number): void {
  const xm = x0 + h / 2;
  let c0 = ra * x0;
  let c1 = ra;
  let c2 = 0;
  let c3 = 0;
  for (const ld of loads) {
    if (ld.kind === 'point') {
      if (ld.atM < xm) {
        c0 -= ld.forceKN * (x0 - ld.atM);
        c1 -= ld.forceKN;
      }
      continue;
    }
    const u0 = ld.fromM;
    const u1 = ld.toM;
    const len = u1 - u0;
    if (!(len > 0) || xm <= u0) continue;
    const s = ld.startKNPerM;
    if (xm >= u1) {
      // whole load to the left: its resultant W acting at its centroid
      const W = ((s + ld.endKNPerM) / 2) * len;
      const first = (s * len * len) / 2 + ((ld.endKNPerM - s) * len * len) / 3; // first moment about u0
      c0 -= W * (x0 - u0) - first;
      c1 -= W;
    } else {
      // inside the load: −(s d²/2 + g d³/6) with d = x − u0
      const g = (ld.endKNPerM - s) / len;
      const d = x0 - u0;
      c0 -= (s * d * d) / 2 + (g * d * d * d) / 6;
      c1 -= s * d + (g * d * d) / 2;
      c2 -= s / 2 + (g * d) / 2;
      c3 -= g / 6;
    }
  }
  out[o] = c0;
  out[o + 1] = c1;
  out[o + 2] = c2;
  out[o + 3] = c3;
}

/**
 * Sorts the first n numbers of a ascending, in place: insertion sort, stable, so the order is the
 * one a comparator sort (a − b) gives. A member has a handful of breakpoints, and this runs for
 * every member of every line on every level, where a comparator sort costs a call per comparison.
 */
function sortSmall(a: number[] | Float64Array, n: number): void {
  for (let i = 1; i < n; i++) {
    const v = a[i];
    let j = i - 1;
    while (j >= 0 && a[j] > v) {
      a[j + 1] = a[j];
      j--;
    }
    a[j + 1] = v;
  }
}

/** Reduces loads (kN, kN/m, member coordinates in m) on a prepared beam to a LoadPart. */
export function loadPart(p: PreparedBeam, loads: readonly BeamLoad[] | BeamLoad[][]): LoadPart {
  const model = p.model;
  const nm = model.members.length;
  const by =
    loads.length > 0 && Array.isArray(loads[0]) ? (loads as BeamLoad[][]) : groupLoads(nm, loads as BeamLoad[]);
  const terms = new Float64Array(4 * nm);
  const v0 = new Float64Array(2 * nm);
  const defl = new Float64Array(3 * nm);
  const off = new Int32Array(nm + 1);
  const bps: (number[] | null)[] = [];
  let total = 0;
  for (let i = 0; i < nm; i++) {
    const L = model.members[i].lengthM;
    const li = by[i];
    let plain = true;
    for (const l of li) if (!(l.kind === 'linear' && l.fromM === 0 && l.toM === L)) plain = false;
    if (plain) {
      bps.push(null);
      off[i] = total;
      total += 2;
      continue;
    }
    const xs = [0, L];
    for (const l of li) {
      if (l.kind === 'point') xs.push(l.atM);
      else xs.push(l.fromM, l.toM);
    }
    sortSmall(xs, xs.length);
    const u: number[] = [];
    const tol = 1e-12 * L;
    for (const x of xs) if (x >= 0 && x <= L && (u.length === 0 || x - u[u.length - 1] > tol)) u.push(x);
    if (u[u.length - 1] !== L) u[u.length - 1] = L;
    bps.push(u);
    off[i] = total;
    total += u.length;
  }
  off[nm] = total;
  const bp = new Float64Array(total);
  const coef = new Float64Array(4 * (total - nm));
  for (let i = 0; i < nm; i++) {
    const L = model.members[i].lengthM;
    const li = by[i];
    const u = bps[i];
    if (u) bp.set(u, off[i]);
    else bp[off[i] + 1] = L;
    if (li.length === 0) continue;
    const pts = deflectionPoints(model, i);
    // full-length uniform loads (self-weight, walls) in closed form
    let w = 0;
    let uniformOnly = true;
    for (const l of li) {
      if (l.kind === 'linear' && l.fromM === 0 && l.toM === L && l.startKNPerM === l.endKNPerM) w += l.startKNPerM;
      else uniformOnly = false;
    }
    const cb = 4 * (off[i] - i);
    if (uniformOnly) {
      const ei = model.members[i].eiKNm2;
      terms[4 * i] = terms[4 * i + 1] = (w * L * L) / 12;
      terms[4 * i + 2] = terms[4 * i + 3] = (w * L) / 2;
      coef[cb + 1] = (w * L) / 2;
      coef[cb + 2] = -w / 2;
      v0[2 * i] = (w * L) / 2;
      v0[2 * i + 1] = (-w * L) / 2;
      for (let q = 0; q < 3; q++) {
        const x = L * pts[q];
        defl[3 * i + q] = (w * x * (L * L * L - 2 * L * x * x + x * x * x)) / (24 * ei);
      }
      continue;
    }
    const t = memberTerms(L, li);
    terms[4 * i] = t.fa;
    terms[4 * i + 1] = t.fb;
    terms[4 * i + 2] = t.ra;
    terms[4 * i + 3] = t.rb;
    const n = off[i + 1] - off[i];
    for (let j = 0; j + 1 < n; j++)
      pieceCubic(li, t.ra, bp[off[i] + j], bp[off[i] + j + 1] - bp[off[i] + j], coef, cb + 4 * j);
    v0[2 * i] = simpleShear(L, li, t.ra, 0);
    v0[2 * i + 1] = simpleShear(L, li, t.ra, L * (1 - 1e-12));
    for (let q = 0; q < 3; q++) defl[3 * i + q] = simpleDeflection(L, model.members[i].eiKNm2, li, L * pts[q]);
  }
  return { terms, v0, defl, off, bp, coef };
}

/** Dead and imposed parts summed (Σ factor × part) on one common set of breakpoints per member. */
interface Combined {
  TD: Float64Array;
  TL: Float64Array;
  v0D: Float64Array;
  v0L: Float64Array;
  deflD: Float64Array;
  deflL: Float64Array;
  off: Int32Array;
  bp: Float64Array;
  cD: Float64Array;
  cL: Float64Array;
}

type Parts = readonly (readonly [LoadPart, number])[];

function combineParts(deadParts: Parts, liveParts: Parts, lengths: Float64Array): Combined {
  const nm = lengths.length;
  const nd = deadParts.length;
  const nAll = nd + liveParts.length;
  const partAt = (k: number) => (k < nd ? deadParts[k][0] : liveParts[k - nd][0]);
  const sum = (parts: Parts, field: 'terms' | 'v0' | 'defl', n: number) => {
    const out = new Float64Array(n);
    for (const [part, f] of parts) {
      if (f === 0) continue;
      const a = part[field];
      for (let q = 0; q < n; q++) out[q] += f * a[q];
    }
    return out;
  };
  // common breakpoints: the union of every part's, per member (at most the sum of their counts)
  let cap = 2 * nm;
  for (let k = 0; k < nAll; k++) cap += partAt(k).off[nm];
  const off = new Int32Array(nm + 1);
  const bp = new Float64Array(cap);
  const xs = new Float64Array(cap);
  let nb = 0;
  for (let i = 0; i < nm; i++) {
    off[i] = nb;
    const L = lengths[i];
    const tol = 1e-12 * L;
    let plain = true;
    for (let k = 0; k < nAll; k++) {
      const pt = partAt(k);
      if (pt.off[i + 1] - pt.off[i] !== 2) plain = false;
    }
    if (plain) {
      bp[nb++] = 0;
      bp[nb++] = L;
      continue;
    }
    let nx = 0;
    for (let k = 0; k < nAll; k++) {
      const pt = partAt(k);
      for (let q = pt.off[i]; q < pt.off[i + 1]; q++) xs[nx++] = pt.bp[q];
    }
    sortSmall(xs, nx);
    const start = nb;
    for (let q = 0; q < nx; q++) {
      const x = xs[q];
      if (nb === start || x - bp[nb - 1] > tol) bp[nb++] = x;
    }
    bp[nb - 1] = L;
  }
  off[nm] = nb;
  const nPieces = nb - nm;
  const onGrid = (parts: Parts) => {
    const out = new Float64Array(4 * nPieces);
    for (const [part, f] of parts) {
      if (f === 0) continue;
      for (let i = 0; i < nm; i++) {
        const pb = part.off[i];
        const pe = part.off[i + 1];
        let j = pb; // piece of the part that holds the current grid piece
        for (let g = off[i]; g + 1 < off[i + 1]; g++) {
          const x = bp[g];
          // find the part's piece by the grid piece's midpoint, not its start: a part breakpoint
          // merged into a grid breakpoint within the tolerance may lie just after that start, and
          // the piece before it would carry its cubic across the load that starts there
          const xm = (x + bp[g + 1]) / 2;
          while (j + 2 < pe && part.bp[j + 1] <= xm) j++;
          const src = 4 * (j - i);
          const c0 = part.coef[src],
            c1 = part.coef[src + 1],
            c2 = part.coef[src + 2],
            c3 = part.coef[src + 3];
          const d = x - part.bp[j];
          // the same cubic about the new origin (Taylor shift)
          const o = 4 * (g - i);
          out[o] += f * (c0 + d * (c1 + d * (c2 + d * c3)));
          out[o + 1] += f * (c1 + d * (2 * c2 + 3 * c3 * d));
          out[o + 2] += f * (c2 + 3 * c3 * d);
          out[o + 3] += f * c3;
        }
      }
    }
    return out;
  };
  return {
    TD: sum(deadParts, 'terms', 4 * nm),
    TL: sum(liveParts, 'terms', 4 * nm),
    v0D: sum(deadParts, 'v0', 2 * nm),
    v0L: sum(liveParts, 'v0', 2 * nm),
    deflD: sum(deadParts, 'defl', 3 * nm),
    deflL: sum(liveParts, 'defl', 3 * nm),
    off,
    bp,
    cD: onGrid(deadParts),
    cL: onGrid(liveParts),
  };
}

// ---- exact extremes within one member ----

// Inputs and results of memberExtremes in typed arrays, to keep the innermost loop
// allocation-free: a double stored in a module variable, or passed to a function V8 does not
// inline, is boxed (a heap number per store or call), and these run hundreds of thousands of
// times for a large scheme. In: L, fd, fl, ml, mr. Out: max, its x, min, its x.
const EXI = new Float64Array(5);
const EX = new Float64Array(4);

/**
 * Largest and smallest of M(x) = fd·M0D(x) + fl·M0L(x) + ml + (mr − ml)·x/L over member i, kN·m:
 * at the breakpoints and where the derivative (the shear) of each piece's cubic vanishes.
 */
function memberExtremes(c: Combined, i: number): void {
  const L = EXI[0],
    fd = EXI[1],
    fl = EXI[2],
    ml = EXI[3],
    mr = EXI[4];
  const { bp, cD, cL } = c;
  const s = (mr - ml) / L;
  const g0 = c.off[i];
  const g1 = c.off[i + 1];
  let mx = -Infinity,
    mxAt = 0,
    mn = Infinity,
    mnAt = 0;
  for (let g = g0; g + 1 < g1; g++) {
    const x0 = bp[g];
    const h = bp[g + 1] - x0;
    const o = 4 * (g - i);
    const a0 = fd * cD[o] + fl * cL[o] + ml + s * x0;
    const a1 = fd * cD[o + 1] + fl * cL[o + 1] + s;
    const a2 = fd * cD[o + 2] + fl * cL[o + 2];
    const a3 = fd * cD[o + 3] + fl * cL[o + 3];
    if (a0 > mx) {
      mx = a0;
      mxAt = x0;
    }
    if (a0 < mn) {
      mn = a0;
      mnAt = x0;
    }
    const end = a0 + h * (a1 + h * (a2 + h * a3));
    if (end > mx) {
      mx = end;
      mxAt = x0 + h;
    }
    if (end < mn) {
      mn = end;
      mnAt = x0 + h;
    }
    // roots of a1 + 2 a2 t + 3 a3 t² in (0, h), in the form that keeps its precision
    const A = 3 * a3,
      B = 2 * a2,
      C = a1;
    let r1 = -1,
      r2 = -1;
    if (A === 0) {
      if (B !== 0) r1 = -C / B;
    } else {
      const disc = B * B - 4 * A * C;
      if (disc >= 0) {
        const q = -0.5 * (B + (B >= 0 ? 1 : -1) * Math.sqrt(disc));
        r1 = q / A;
        if (q !== 0) r2 = C / q;
      }
    }
    if (r1 > 0 && r1 < h) {
      const m = a0 + r1 * (a1 + r1 * (a2 + r1 * a3));
      if (m > mx) {
        mx = m;
        mxAt = x0 + r1;
      }
      if (m < mn) {
        mn = m;
        mnAt = x0 + r1;
      }
    }
    if (r2 > 0 && r2 < h) {
      const m = a0 + r2 * (a1 + r2 * (a2 + r2 * a3));
      if (m > mx) {
        mx = m;
        mxAt = x0 + r2;
      }
      if (m < mn) {
        mn = m;
        mnAt = x0 + r2;
      }
    }
  }
  EX[0] = mx;
  EX[1] = mxAt;
  EX[2] = mn;
  EX[3] = mnAt;
}

// ---- the arrangement corrections (three-moment form) ----

/**
 * For one side of every support: the correction an adjacent-span arrangement adds to the
 * alternate-span arrangement it equals beyond its support, and how it carries over span to span.
 * Built for beams whose supports are pins inside, pins or fixed at the two ends, with optional
 * cantilevers beyond the ends (every beam a scheme makes); other beams take the direct path.
 */
interface Sweep {
  /** ratio of the correction at node i + 1 to that at node i through member i (0 on cantilevers) */
  rho: Float64Array;
  /** correction moment at the support of each adjacent arrangement, kN·m per unit imposed factor */
  c: Float64Array;
  /**
   * per node j and parity class p (slot 2j + p): over the arrangements at supports k ≤ j of that
   * class, the largest and smallest correction at node j and the support k giving each (−1: none)
   */
  maxV: Float64Array;
  minV: Float64Array;
  maxK: Int32Array;
  minK: Int32Array;
}

interface Shape {
  nm: number;
  /** flexibility L/EI per member, m/(kN·m²)… as a ratio only */
  f: Float64Array;
  lengths: Float64Array;
  /** imposed-load terms per unit factor, all members loaded: fa, fb, ra, rb */
  T: Float64Array;
  a: number;
  b: number;
  fixedA: boolean;
  fixedB: boolean;
  leftCantilever: boolean;
  rightCantilever: boolean;
  /** node k has an adjacent-span arrangement */
  isK: Uint8Array;
}

function shapeOf(model: BeamModel, lengths: Float64Array, T: Float64Array): Shape | null {
  const nm = lengths.length;
  const s = model.supports;
  const lc = s[0] === 'free';
  const rc = s[nm] === 'free';
  const a = lc ? 1 : 0;
  const b = rc ? nm - 1 : nm;
  if (b <= a) return null;
  if (s[a] === 'free' || s[b] === 'free') return null;
  for (let j = a + 1; j < b; j++) if (s[j] !== 'pin') return null;
  const f = new Float64Array(nm);
  for (let i = 0; i < nm; i++) f[i] = lengths[i] / model.members[i].eiKNm2;
  const isK = new Uint8Array(nm + 1);
  for (let k = 1; k < nm; k++) isK[k] = s[k] !== 'free' ? 1 : 0;
  return {
    nm,
    f,
    lengths,
    T,
    a,
    b,
    fixedA: s[a] === 'fixed',
    fixedB: s[b] === 'fixed',
    leftCantilever: lc,
    rightCantilever: rc,
    isK,
  };
}

function mirrorShape(sh: Shape): Shape {
  const { nm } = sh;
  const f = new Float64Array(nm);
  const lengths = new Float64Array(nm);
  const T = new Float64Array(4 * nm);
  for (let i = 0; i < nm; i++) {
    const j = nm - 1 - i;
    f[i] = sh.f[j];
    lengths[i] = sh.lengths[j];
    T[4 * i] = sh.T[4 * j + 1];
    T[4 * i + 1] = sh.T[4 * j];
    T[4 * i + 2] = sh.T[4 * j + 3];
    T[4 * i + 3] = sh.T[4 * j + 2];
  }
  const isK = new Uint8Array(nm + 1);
  for (let k = 0; k <= nm; k++) isK[k] = sh.isK[nm - k];
  return {
    nm,
    f,
    lengths,
    T,
    a: nm - sh.b,
    b: nm - sh.a,
    fixedA: sh.fixedB,
    fixedB: sh.fixedA,
    leftCantilever: sh.rightCantilever,
    rightCantilever: sh.leftCantilever,
    isK,
  };
}

/**
 * The corrections of the arrangements at supports k for the members to the right of k. Support
 * moments M (sagging positive) obey, at an interior support j,
 *   f(j−1)·M(j−1) + 2(f(j−1) + f(j))·M(j) + f(j)·M(j+1) = −(τb(j−1) + τa(j)),
 * with f = L/EI and τa = f(2Fa + Fb), τb = f(Fa + 2Fb) from the fixed-end moments Fa, Fb; a fixed
 * end gives 2M(a) + M(a+1) = −τa/f, a pinned end M = the cantilever's moment beyond it.
 */
function sweep(sh: Shape): Sweep {
  const { nm, f, T, a, b, fixedA, fixedB, lengths, isK } = sh;
  const tauA = (i: number, q: number) => ((i & 1) === q ? f[i] * (2 * T[4 * i] + T[4 * i + 1]) : 0);
  const tauB = (i: number, q: number) => ((i & 1) === q ? f[i] * (T[4 * i] + 2 * T[4 * i + 1]) : 0);
  const rho = new Float64Array(nm);
  // the unloaded part to the right of a support answers a moment there with a fixed shape
  rho[b - 1] = fixedB ? -0.5 : 0;
  for (let j = b - 2; j >= a; j--) rho[j] = -f[j] / (2 * (f[j] + f[j + 1]) + f[j + 1] * rho[j + 1]);
  const c = new Float64Array(nm + 1);
  // forward elimination of the three-moment rows, once per parity of the loaded spans
  let d: number, e: number;
  const g = [0, 0];
  const cantLeft = (q: number) => (sh.leftCantilever && q === 0 ? -T[2] * lengths[0] : 0);
  if (fixedA) {
    d = 2 * f[a];
    e = f[a];
    g[0] = -tauA(a, 0);
    g[1] = -tauA(a, 1);
    c[a] = 0;
  } else {
    d = 1;
    e = 0;
    g[0] = cantLeft(0);
    g[1] = cantLeft(1);
    // prefix = the left cantilever alone: the support moment is its own
    c[a] = cantLeft((a - 1) & 1) - cantLeft(a & 1);
  }
  const m = [0, 0];
  for (let k = a + 1; k <= b; k++) {
    const fl = f[k - 1];
    if (k === b) {
      if (fixedB) {
        const dd = 2 * fl - (fl * e) / d;
        for (let q = 0; q < 2; q++) m[q] = (-tauB(k - 1, q) - (fl * g[q]) / d) / dd;
      } else m[0] = m[1] = 0; // a pinned end: its moment is the right cantilever's, unloaded in a prefix
    } else {
      const fr = f[k];
      const dd = 2 * (fl + fr) + fr * rho[k] - (fl * e) / d;
      for (let q = 0; q < 2; q++) m[q] = (-tauB(k - 1, q) - (fl * g[q]) / d) / dd;
    }
    c[k] = m[(k - 1) & 1] - m[k & 1];
    if (k < b) {
      const fr = f[k];
      const nd = 2 * (fl + fr) - (fl * e) / d;
      for (let q = 0; q < 2; q++) g[q] = -(tauB(k - 1, q) + tauA(k, q)) - (fl * g[q]) / d;
      d = nd;
      e = fr;
    }
  }
  const maxV = new Float64Array(2 * (nm + 1));
  const minV = new Float64Array(2 * (nm + 1));
  const maxK = new Int32Array(2 * (nm + 1)).fill(-1);
  const minK = new Int32Array(2 * (nm + 1)).fill(-1);
  const cur = { mx: [0, 0], mn: [0, 0], kx: [-1, -1], kn: [-1, -1] };
  for (let j = 0; j <= nm; j++) {
    if (isK[j]) {
      const p = j & 1;
      const v = c[j];
      if (cur.kx[p] < 0 || v > cur.mx[p]) {
        cur.mx[p] = v;
        cur.kx[p] = j;
      }
      if (cur.kn[p] < 0 || v < cur.mn[p]) {
        cur.mn[p] = v;
        cur.kn[p] = j;
      }
    }
    for (let p = 0; p < 2; p++) {
      maxV[2 * j + p] = cur.mx[p];
      minV[2 * j + p] = cur.mn[p];
      maxK[2 * j + p] = cur.kx[p];
      minK[2 * j + p] = cur.kn[p];
    }
    if (j < nm) {
      const r = j >= a && j < b ? rho[j] : 0;
      for (let p = 0; p < 2; p++) {
        if (r >= 0) {
          cur.mx[p] *= r;
          cur.mn[p] *= r;
        } else {
          const t = cur.mx[p],
            tk = cur.kx[p];
          cur.mx[p] = cur.mn[p] * r;
          cur.kx[p] = cur.kn[p];
          cur.mn[p] = t * r;
          cur.kn[p] = tk;
        }
      }
    }
  }
  for (let i = 0; i < nm; i++) if (i < a || i >= b) rho[i] = 0;
  return { rho, c, maxV, minV, maxK, minK };
}

/** Solutions per unit factor of one imposed-load part, shared between levels. */
export interface ArrangementSolutions {
  /** end moments (2 per member) of imposed load on all spans, on odd and on even spans */
  emAll: Float64Array;
  emAlt: [Float64Array, Float64Array];
  /** sweeps for the members right of each support and (mirrored) left of it; null: direct path */
  right: Sweep | null;
  left: Sweep | null;
}
export type ArrangementCache = Map<LoadPart, ArrangementSolutions>;

/** Vertical reactions (kN) at the nodes from packed terms and end moments; zero at free nodes. */
function reactionsOf(free: Uint8Array, lengths: Float64Array, T: Float64Array, em: Float64Array): Float64Array {
  const nm = lengths.length;
  const r = new Float64Array(nm + 1);
  for (let n = 0; n <= nm; n++) {
    if (free[n]) continue;
    let v = 0;
    if (n > 0) v += T[4 * (n - 1) + 3] - (em[2 * n - 1] - em[2 * n - 2]) / lengths[n - 1];
    if (n < nm) v += T[4 * n + 2] + (em[2 * n + 1] - em[2 * n]) / lengths[n];
    r[n] = v;
  }
  return r;
}

function emptyEnvelope(problems: Problem[]): BeamEnvelope {
  return {
    caution: CAUTION,
    ok: false,
    problems,
    members: [],
    deadReactionsKN: [],
    liveReactionsKN: [],
    maxFactoredReactionsKN: [],
    patternsTried: 0,
  };
}

/** Problems with load combinations: at least one, factors finite and not negative. */
export function validateCombinations(combos: unknown): Problem[] {
  if (!Array.isArray(combos) || combos.length === 0)
    return [{ path: 'combos', field: 'combos', message: 'at least one load combination is needed' }];
  const out: Problem[] = [];
  combos.forEach((c, k) => {
    const o = (typeof c === 'object' && c !== null ? c : {}) as Record<string, unknown>;
    const id = typeof o['id'] === 'string' ? o['id'] : undefined;
    for (const field of ['dead', 'live'] as const) {
      const v = o[field];
      if (typeof v !== 'number' || !Number.isFinite(v) || v < 0 || v > 10)
        out.push({
          path: `combos[${k}].${field}`,
          ...(id ? { elementId: id } : {}),
          field,
          message: 'must be a load factor from 0 to 10',
        });
    }
    if (id === undefined) out.push({ path: `combos[${k}].id`, field: 'id', message: 'must be a text' });
  });
  return out;
}

/**
 * Envelope of moments (kN·m) and shears (kN) for factored combinations of dead and imposed line
 * loads (kN, kN/m, member coordinates m), EI in kN·m²; also service reactions (kN) and
 * deflections (mm). Invalid input gives ok = false and problems naming the element and field; it
 * does not throw. opts.samplesPerMember is accepted for older callers and ignored: extremes are exact.
 */
export function envelopeBeam(
  model: BeamModel,
  dead: readonly BeamLoad[],
  live: readonly BeamLoad[],
  combos: readonly Combination[],
  opts: { samplesPerMember?: number; prepared?: PreparedBeam } = {},
): BeamEnvelope {
  const problems = [
    ...validateBeamInput(model, dead, 'dead'),
    ...validateLoadsOnly(model, live, 'live'),
    ...validateCombinations(combos),
  ];
  if (problems.length) return emptyEnvelope(problems);
  const p = opts.prepared ?? prepareBeam(model);
  if (!p.ok)
    return emptyEnvelope([
      { path: 'supports', field: 'supports', message: 'the supports do not hold the beam up (it is a mechanism)' },
    ]);
  return envelopeParts(p, [[loadPart(p, dead), 1]], [[loadPart(p, live), 1]], combos);
}

/**
 * The envelope from load parts: dead = Σ factor × part, imposed likewise (parts from loadPart).
 * Units as envelopeBeam. The caller has validated the loads. With meta, each member's envelope
 * also carries its id, length and kind (meta[i] for member i), in that order before the results.
 */
export function envelopeParts(
  p: PreparedBeam,
  deadParts: Parts,
  liveParts: Parts,
  combos: readonly Combination[],
  cache?: ArrangementCache,
  meta?: readonly MemberMeta[],
): BeamEnvelope {
  const model = p.model;
  const nm = model.members.length;
  if (!p.ok)
    return emptyEnvelope([
      { path: 'supports', field: 'supports', message: 'the supports do not hold the beam up (it is a mechanism)' },
    ]);
  const lengths = p.len;
  const C = combineParts(deadParts, liveParts, lengths);
  const { TD, v0D, v0L } = C;
  const free = new Uint8Array(nm + 1);
  for (let n = 0; n <= nm; n++) free[n] = model.supports[n] === 'free' ? 1 : 0;
  const rhs = new Float64Array(p.nEq);
  // service solutions: dead on all spans, imposed on all spans
  const sD = new Float64Array(2 * nm),
    uD = new Float64Array(2 * (nm + 1));
  const sL = new Float64Array(2 * nm),
    uL = new Float64Array(2 * (nm + 1));
  solvePacked(p, TD, rhs, uD, sD);
  solvePacked(p, C.TL, rhs, uL, sL);
  const rD = reactionsOf(free, lengths, TD, sD);
  const rL = reactionsOf(free, lengths, C.TL, sL);

  // Every arrangement is dead on all spans plus imposed on some: by superposition only the
  // imposed part needs solving, per unit factor, and that serves every combination. When the
  // imposed load is one part times a factor, the unit solutions are cached for the next level.
  const single = liveParts.length === 1 ? liveParts[0] : null;
  const scale = single ? single[1] : 1;
  const unitT = single ? single[0].terms : C.TL;
  let sol = single && cache ? cache.get(single[0]) : undefined;
  if (!sol || sol.emAll.length !== 2 * nm) {
    sol = unitSolutions(p, unitT);
    if (single && cache) cache.set(single[0], sol);
  }
  const patterns = arrangements(model);
  const nPat = patterns.length;
  const patIndexAt = new Int32Array(nm + 1).fill(-1);
  patterns.forEach((a, i) => {
    if (a.kind === 'adjacent') patIndexAt[a.node] = i;
  });
  const PAT_ALL = 0,
    PAT_NONE = 1,
    PAT_ODD = 2,
    PAT_EVEN = 3;

  // per member: max moment, its x, its scan; min moment, its x, its scan; max |shear|
  const acc = new Float64Array(nm * 7);
  for (let i = 0; i < nm; i++) {
    acc[i * 7] = -Infinity;
    acc[i * 7 + 3] = Infinity;
  }
  const maxR = new Float64Array(nm + 1).fill(-Infinity);
  const uT = unitT;

  // The numbers member and reaction take, in a typed array for the reason given at EXI:
  // combination factors cd (dead) and gc (imposed) in MA[0], MA[1]; imposed-load end moments per
  // unit of the cached solutions (scaled by gc × scale) in MA[2], MA[3] for a member, and in
  // MA[2]…MA[5] for the members left and right of a node.
  const MA = new Float64Array(6);
  // member i with imposed load on it or not: extremes into acc, tagged with its combination and arrangement
  const member = (i: number, on: boolean, id: number) => {
    const cd = MA[0],
      gc = MA[1],
      eml = MA[2],
      emr = MA[3];
    const L = lengths[i];
    const gu = gc * scale;
    const ml = cd * sD[2 * i] + gu * eml;
    const mr = cd * sD[2 * i + 1] + gu * emr;
    const gl = on ? gc : 0;
    EXI[0] = L;
    EXI[1] = cd;
    EXI[2] = gl;
    EXI[3] = ml;
    EXI[4] = mr;
    memberExtremes(C, i);
    const o = i * 7;
    if (EX[0] > acc[o]) {
      acc[o] = EX[0];
      acc[o + 1] = EX[1];
      acc[o + 2] = id;
    }
    if (EX[2] < acc[o + 3]) {
      acc[o + 3] = EX[2];
      acc[o + 4] = EX[3];
      acc[o + 5] = id;
    }
    const dv = (mr - ml) / L;
    const va = Math.abs(cd * v0D[2 * i] + gl * v0L[2 * i] + dv);
    const vb = Math.abs(cd * v0D[2 * i + 1] + gl * v0L[2 * i + 1] + dv);
    const v = va > vb ? va : vb;
    if (v > acc[o + 6]) acc[o + 6] = v;
  };
  // reaction at node n from the two members beside it (imposed end moments per unit, as above)
  const reaction = (n: number, onL: boolean, onR: boolean) => {
    if (free[n]) return;
    const cd = MA[0],
      gc = MA[1],
      lml = MA[2],
      lmr = MA[3],
      rml = MA[4],
      rmr = MA[5];
    const gu = gc * scale;
    let r = 0;
    if (n > 0) {
      const i = n - 1;
      const ml = cd * sD[2 * i] + gu * lml,
        mr = cd * sD[2 * i + 1] + gu * lmr;
      r += cd * TD[4 * i + 3] + (onL ? gu * uT[4 * i + 3] : 0) - (mr - ml) / lengths[i];
    }
    if (n < nm) {
      const i = n;
      const ml = cd * sD[2 * i] + gu * rml,
        mr = cd * sD[2 * i + 1] + gu * rmr;
      r += cd * TD[4 * i + 2] + (onR ? gu * uT[4 * i + 2] : 0) + (mr - ml) / lengths[i];
    }
    if (r > maxR[n]) maxR[n] = r;
  };

  let patternsTried = 0;
  for (let ci = 0; ci < combos.length; ci++) {
    const cmb = combos[ci];
    const cd = cmb.dead;
    if (cmb.live === 0) {
      // dead load alone
      const id = ci * nPat + PAT_NONE;
      patternsTried++;
      MA[0] = cd;
      MA[1] = 0;
      MA[2] = MA[3] = 0;
      for (let i = 0; i < nm; i++) member(i, false, id);
      for (let n = 0; n <= nm; n++) if (!free[n] && cd * rD[n] > maxR[n]) maxR[n] = cd * rD[n];
      continue;
    }
    patternsTried += nPat - 1;
    const gl = cmb.live;
    MA[0] = cd;
    MA[1] = gl;
    const base = (pat: number, em: Float64Array) => {
      const id = ci * nPat + pat;
      const arr = patterns[pat];
      for (let i = 0; i < nm; i++) {
        MA[2] = em[2 * i];
        MA[3] = em[2 * i + 1];
        member(i, loadedIn(arr, i), id);
      }
      for (let n = 0; n <= nm; n++) {
        const onL = n > 0 && loadedIn(arr, n - 1),
          onR = n < nm && loadedIn(arr, n);
        MA[2] = n > 0 ? em[2 * n - 2] : 0;
        MA[3] = n > 0 ? em[2 * n - 1] : 0;
        MA[4] = n < nm ? em[2 * n] : 0;
        MA[5] = n < nm ? em[2 * n + 1] : 0;
        reaction(n, onL, onR);
      }
    };
    base(PAT_ALL, sol.emAll);
    if (nm > 1) {
      base(PAT_ODD, sol.emAlt[0]);
      base(PAT_EVEN, sol.emAlt[1]);
    }
    if (sol.right && sol.left) adjacentByExtremes(ci, sol, sol.right, sol.left);
    else adjacentDirect(ci);
  }

  // The adjacent-span arrangements through the running extremes (see the note at the top).
  // Slot 2j + p of a sweep holds, for node j and support parity p, the extreme corrections; the
  // mirrored (left-side) sweep is indexed by nm − j and names its supports as nm − k.
  function adjacentByExtremes(ci: number, s: ArrangementSolutions, R: Sweep, Lf: Sweep): void {
    const sup = model.supports;
    const idOf = (k: number) => ci * nPat + patIndexAt[k];
    const span = (i: number) => sup[i] !== 'free' && sup[i + 1] !== 'free';
    const lam = Lf.rho; // lam[nm − 1 − i]: ratio of the left-side correction at node i to that at node i + 1
    for (let i = 0; i < nm; i++) {
      if (!span(i)) continue;
      const li = lam[nm - 1 - i];
      for (let p = 0; p < 2; p++) {
        // arrangements at supports k ≤ i: alternate spans of k's parity beyond k, correction from the left
        const slot = 2 * i + p;
        for (let e = 0; e < 2; e++) {
          const k = e === 0 ? R.maxK[slot] : R.minK[slot];
          if (k < 0 || (e === 1 && k === R.maxK[slot])) continue;
          const v = e === 0 ? R.maxV[slot] : R.minV[slot];
          const em = s.emAlt[k & 1];
          MA[2] = em[2 * i] + v;
          MA[3] = em[2 * i + 1] + v * R.rho[i];
          member(i, adjacentLoads(k, i), idOf(k));
        }
        // arrangements at supports k ≥ i + 1, from the mirrored sweep at node i + 1
        const ms = 2 * (nm - (i + 1)) + p;
        for (let e = 0; e < 2; e++) {
          const km = e === 0 ? Lf.maxK[ms] : Lf.minK[ms];
          if (km < 0 || (e === 1 && km === Lf.maxK[ms])) continue;
          const v = e === 0 ? Lf.maxV[ms] : Lf.minV[ms];
          const k = nm - km;
          const em = s.emAlt[(k - 1) & 1];
          MA[2] = em[2 * i] + v * li;
          MA[3] = em[2 * i + 1] + v;
          member(i, adjacentLoads(k, i), idOf(k));
        }
      }
    }
    // reactions: at each support, the arrangement centred there and the extremes on each side
    for (let n = 0; n <= nm; n++) {
      if (free[n]) continue;
      const sL = n > 0 && span(n - 1);
      const sR = n < nm && span(n);
      const lamL = n > 0 ? lam[nm - n] : 0; // member n − 1
      const lamR = n < nm ? lam[nm - 1 - n] : 0; // member n
      if (patIndexAt[n] >= 0) {
        // the arrangement at n itself: members n − 1 and n both loaded
        const k = n;
        const eL = s.emAlt[(k - 1) & 1],
          eR = s.emAlt[k & 1];
        const cR = sR ? R.c[k] : 0;
        const cL = sL ? Lf.c[nm - k] : 0;
        MA[2] = n > 0 ? eL[2 * n - 2] + cL * lamL : 0;
        MA[3] = n > 0 ? eL[2 * n - 1] + cL : 0;
        MA[4] = n < nm ? eR[2 * n] + cR : 0;
        MA[5] = n < nm ? eR[2 * n + 1] + cR * R.rho[n] : 0;
        reaction(n, n > 0, n < nm);
      }
      for (let p = 0; p < 2; p++) {
        for (let e = 0; e < 2; e++) {
          // supports k ≤ n − 1: values at node n − 1
          if (n > 0) {
            const slot = 2 * (n - 1) + p;
            const k = e === 0 ? R.maxK[slot] : R.minK[slot];
            if (k >= 0) {
              const v = e === 0 ? R.maxV[slot] : R.minV[slot];
              const em = s.emAlt[k & 1];
              const atN = sL ? v * R.rho[n - 1] : 0;
              MA[2] = em[2 * n - 2] + (sL ? v : 0);
              MA[3] = em[2 * n - 1] + atN;
              MA[4] = n < nm ? em[2 * n] + (sR ? atN : 0) : 0;
              MA[5] = n < nm ? em[2 * n + 1] + (sR ? atN * R.rho[n] : 0) : 0;
              reaction(n, adjacentLoads(k, n - 1), n < nm && adjacentLoads(k, n));
            }
          }
          // supports k ≥ n + 1: values at node n + 1
          if (n < nm) {
            const ms = 2 * (nm - (n + 1)) + p;
            const km = e === 0 ? Lf.maxK[ms] : Lf.minK[ms];
            if (km >= 0) {
              const v = e === 0 ? Lf.maxV[ms] : Lf.minV[ms];
              const k = nm - km;
              const em = s.emAlt[(k - 1) & 1];
              const atN = sR ? v * lamR : 0;
              MA[2] = n > 0 ? em[2 * n - 2] + (sL ? atN * lamL : 0) : 0;
              MA[3] = n > 0 ? em[2 * n - 1] + (sL ? atN : 0) : 0;
              MA[4] = em[2 * n] + atN;
              MA[5] = em[2 * n + 1] + (sR ? v : 0);
              reaction(n, n > 0 && adjacentLoads(k, n - 1), adjacentLoads(k, n));
            }
          }
        }
      }
    }
  }

  // Beams of other shapes (free nodes inside, fixed supports inside): every adjacent arrangement
  // solved and evaluated over every member; exact, but the cost grows with the square of spans.
  function adjacentDirect(ci: number): void {
    const T = new Float64Array(4 * nm);
    const u = new Float64Array(2 * (nm + 1));
    const em = new Float64Array(2 * nm);
    for (let pi = 0; pi < nPat; pi++) {
      const arr = patterns[pi];
      if (arr.kind !== 'adjacent') continue;
      for (let i = 0; i < nm; i++) {
        const on = loadedIn(arr, i);
        for (let q = 0; q < 4; q++) T[4 * i + q] = on ? uT[4 * i + q] : 0;
      }
      solvePacked(p, T, rhs, u, em);
      const id = ci * nPat + pi;
      for (let i = 0; i < nm; i++) {
        MA[2] = em[2 * i];
        MA[3] = em[2 * i + 1];
        member(i, loadedIn(arr, i), id);
      }
      for (let n = 0; n <= nm; n++) {
        const onL = n > 0 && loadedIn(arr, n - 1),
          onR = n < nm && loadedIn(arr, n);
        MA[2] = n > 0 ? em[2 * n - 2] : 0;
        MA[3] = n > 0 ? em[2 * n - 1] : 0;
        MA[4] = n < nm ? em[2 * n] : 0;
        MA[5] = n < nm ? em[2 * n + 1] : 0;
        reaction(n, onL, onR);
      }
    }
  }

  for (let n = 0; n <= nm; n++) if (free[n]) maxR[n] = 0;
  // extremes are tagged combination × nPat + arrangement; labels are made only for those
  const labels = new Map<number, string>();
  const scanLabel = (tag: number) => {
    if (!(tag >= 0 && tag < combos.length * nPat)) return '';
    let s = labels.get(tag);
    if (s === undefined) {
      s = `${combos[Math.floor(tag / nPat)].id}, imposed on ${arrangementLabel(patterns[tag % nPat])}`;
      labels.set(tag, s);
    }
    return s;
  };
  const env: MemberEnvelope[] = [];
  for (let i = 0; i < nm; i++) {
    const o = i * 7;
    const maxPattern = scanLabel(acc[o + 2]);
    const minPattern = scanLabel(acc[o + 5]);
    const m = meta ? meta[i] : undefined;
    // a scheme's line names its members here, so that its results need no second copy of each
    if (m) {
      const named: MemberEnvelope & MemberMeta = {
        id: m.id,
        lengthM: m.lengthM,
        kind: m.kind,
        maxMomentKNm: acc[o],
        maxMomentAtM: acc[o + 1],
        maxPattern,
        minMomentKNm: acc[o + 3],
        minMomentAtM: acc[o + 4],
        minPattern,
        maxShearKN: acc[o + 6],
        serviceDeflectionMm: 0,
        serviceDeflectionAtM: 0,
      };
      env.push(named);
    } else
      env.push({
        maxMomentKNm: acc[o],
        maxMomentAtM: acc[o + 1],
        maxPattern,
        minMomentKNm: acc[o + 3],
        minMomentAtM: acc[o + 4],
        minPattern,
        maxShearKN: acc[o + 6],
        serviceDeflectionMm: 0,
        serviceDeflectionAtM: 0,
      });
  }
  // service deflection: chord between the end deflections, plus each member's own loads and end
  // moments on a simple span
  for (let i = 0; i < nm; i++) {
    const { lengthM: L, eiKNm2: ei } = model.members[i];
    const ml = sD[2 * i] + sL[2 * i];
    const mr = sD[2 * i + 1] + sL[2 * i + 1];
    const v1 = -(uD[2 * i] + uL[2 * i]);
    const v2 = -(uD[2 * i + 2] + uL[2 * i + 2]);
    const pts = deflectionPoints(model, i);
    for (let q = 0; q < 3; q++) {
      const xi = pts[q];
      const yEnd = ((L * L) / (6 * ei)) * (ml * (2 * xi - 3 * xi * xi + xi * xi * xi) + mr * (xi - xi * xi * xi));
      const y = (v1 * (1 - xi) + v2 * xi + C.deflD[3 * i + q] + C.deflL[3 * i + q] + yEnd) * 1000;
      if (Math.abs(y) > Math.abs(env[i].serviceDeflectionMm)) {
        env[i].serviceDeflectionMm = y;
        env[i].serviceDeflectionAtM = L * xi;
      }
    }
  }
  return {
    caution: CAUTION,
    ok: true,
    problems: [],
    members: env,
    deadReactionsKN: [...rD],
    liveReactionsKN: [...rL],
    maxFactoredReactionsKN: [...maxR],
    patternsTried,
  };
}

/** Unit-factor solutions of the imposed part on all, odd and even spans, and the sweeps. */
function unitSolutions(p: PreparedBeam, T: Float64Array): ArrangementSolutions {
  const nm = p.len.length;
  const rhs = new Float64Array(p.nEq);
  const u = new Float64Array(2 * (nm + 1));
  const solve = (pick: (i: number) => boolean) => {
    const t = new Float64Array(4 * nm);
    for (let i = 0; i < nm; i++) if (pick(i)) for (let q = 0; q < 4; q++) t[4 * i + q] = T[4 * i + q];
    const em = new Float64Array(2 * nm);
    solvePacked(p, t, rhs, u, em);
    return em;
  };
  const emAll = solve(() => true);
  const emAlt: [Float64Array, Float64Array] = [solve((i) => (i & 1) === 0), solve((i) => (i & 1) === 1)];
  const sh = shapeOf(p.model, p.len, T);
  return { emAll, emAlt, right: sh ? sweep(sh) : null, left: sh ? sweep(mirrorShape(sh)) : null };
}

// ---- input checks shared with analyseBeam ----

function validateBeamInput(model: BeamModel, loads: readonly BeamLoad[], name: string): Problem[] {
  const m = validateBeamModel(model);
  return m.length ? m : validateLoads(model, loads, name);
}

function validateLoadsOnly(model: BeamModel, loads: readonly BeamLoad[], name: string): Problem[] {
  return validateBeamModel(model).length ? [] : validateLoads(model, loads, name);
}
