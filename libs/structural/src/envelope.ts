// Envelope of a continuous beam under factored dead load on every span and imposed load
// patterned over all spans, alternate spans, and adjacent pairs with alternates beyond (the
// arrangements of IS 456 cl. 22.4.1 and ACI 318-19 §6.4.3). One factorisation serves every
// arrangement; each is a fresh right-hand side of the banded system.
import { BeamLoad, BeamModel, groupLoads, memberTerms, PreparedBeam, prepareBeam, simpleDeflection, simpleMoment, simpleShear, solvePacked } from './beam';
import { CAUTION, Combination } from './codes';

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

export interface BeamEnvelope {
  /** preliminary results only: see CAUTION */
  caution: string;
  ok: boolean;
  members: MemberEnvelope[];
  /** service reactions per node, all spans loaded, kN: dead and imposed apart */
  deadReactionsKN: number[];
  liveReactionsKN: number[];
  /** largest factored reaction per node over all arrangements, kN */
  maxFactoredReactionsKN: number[];
  patternsTried: number;
}

/**
 * Scans one load arrangement over every member's sample points and keeps the extremes in acc
 * (7 numbers per member). Kept apart and allocation-free: it is the innermost loop of a scheme.
 */
function scanArrangement(
  from: number, to: number, nSeg: number, lengths: Float64Array,
  m0D: Float64Array, m0L: Float64Array, v0D: Float64Array, v0L: Float64Array,
  endMoments: Float64Array, gd: number, gLive: number, loaded: Uint8Array, id: number, acc: Float64Array,
): void {
  const ns = nSeg + 1;
  for (let i = from; i <= to; i++) {
    const L = lengths[i];
    const ml = endMoments[2 * i], mr = endMoments[2 * i + 1];
    const gl = loaded[i] ? gLive : 0;
    const base = i * ns;
    const o = i * 7;
    let bestK = 0;
    let bestM = -Infinity;
    let minM = Infinity;
    let minK = 0;
    for (let k = 0; k < ns; k++) {
      const xi = k / nSeg;
      const m = gd * m0D[base + k] + gl * m0L[base + k] + ml + (mr - ml) * xi;
      if (m > bestM) { bestM = m; bestK = k; }
      if (m < minM) { minM = m; minK = k; }
    }
    if (minM < acc[o + 3]) { acc[o + 3] = minM; acc[o + 4] = (minK / nSeg) * L; acc[o + 5] = id; }
    // a parabola through the best sample and its neighbours finds the peak between samples
    // (exact under uniform load)
    let peak = bestM;
    let peakX = (bestK / nSeg) * L;
    if (bestK > 0 && bestK < nSeg) {
      const kl = bestK - 1, kr = bestK + 1;
      const a0 = gd * m0D[base + kl] + gl * m0L[base + kl] + ml + (mr - ml) * (kl / nSeg);
      const a1 = bestM;
      const a2 = gd * m0D[base + kr] + gl * m0L[base + kr] + ml + (mr - ml) * (kr / nSeg);
      const den = a0 - 2 * a1 + a2;
      if (den < 0) {
        const off = (0.5 * (a0 - a2)) / den;
        if (Math.abs(off) <= 1) {
          peak = a1 - 0.25 * (a0 - a2) * off;
          peakX = ((bestK + off) / nSeg) * L;
        }
      }
    }
    if (peak > acc[o]) { acc[o] = peak; acc[o + 1] = peakX; acc[o + 2] = id; }
    // shear peaks just inside the ends for these loads
    const dv = (mr - ml) / L;
    const v0 = Math.abs(gd * v0D[2 * i] + gl * v0L[2 * i] + dv);
    const v1 = Math.abs(gd * v0D[2 * i + 1] + gl * v0L[2 * i + 1] + dv);
    const v = v0 > v1 ? v0 : v1;
    if (v > acc[o + 6]) acc[o + 6] = v;
  }
}

/**
 * The imposed-load arrangements of a beam with n members (no units): label, loaded members, and the members
 * whose moments the arrangement is meant for (null: all). An adjacent-span arrangement serves the
 * moment over its support (IS 456 cl. 22.4.1(c)), so only the two spans beside it are scanned;
 * span moments come from the all-span and alternate-span arrangements (cl. 22.4.1(b)).
 */
export function loadPatterns(model: BeamModel): { label: string; members: boolean[]; scope: [number, number] | null }[] {
  const n = model.members.length;
  return arrangements(model).map((a) => {
    const members: boolean[] = [];
    for (let i = 0; i < n; i++) members.push(isLoaded(a, i));
    return { label: arrangementLabel(a), members, scope: a.kind === 'adjacent' ? [a.node - 1, a.node] : null };
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
  const out: Arrangement[] = [{ kind: 'all', node: 0 }, { kind: 'none', node: 0 }];
  if (n > 1) out.push({ kind: 'odd', node: 0 }, { kind: 'even', node: 0 });
  // spans node-1 and node loaded, then every other span beyond on both sides
  for (let node = 1; node < n; node++) if (model.supports[node] !== 'free') out.push({ kind: 'adjacent', node });
  return out;
}

function isLoaded(a: Arrangement, i: number): boolean {
  switch (a.kind) {
    case 'all': return true;
    case 'none': return false;
    case 'odd': return i % 2 === 0;
    case 'even': return i % 2 === 1;
    default: return i >= a.node ? (i - a.node) % 2 === 0 : (a.node - 1 - i) % 2 === 0;
  }
}

/** isLoaded in arithmetic form, for the arrangement solves (same answers). */
function loadedIn(a: Arrangement, i: number): boolean {
  const k = a.kind;
  if (k === 'all') return true;
  if (k === 'none') return false;
  if (k === 'odd') return (i & 1) === 0;
  if (k === 'even') return (i & 1) === 1;
  // adjacent: spans node-1 and node, then every other span beyond on both sides
  return i >= a.node === (((i - a.node) & 1) === 0);
}

function arrangementLabel(a: Arrangement): string {
  switch (a.kind) {
    case 'all': return 'all spans';
    case 'none': return 'dead only';
    case 'odd': return 'alternate spans (odd)';
    case 'even': return 'alternate spans (even)';
    default: return `adjacent spans at support ${a.node}`;
  }
}

/**
 * One group of loads on a beam, reduced once to what every arrangement needs: packed fixed-end
 * and simple-span terms (fa, fb, ra, rb per member), simple-span moments at the sample points,
 * shears just inside the ends and simple-span deflections at the deflection points. Loads that
 * keep their shape from level to level (a slab's share, per kPa) are reduced once and scaled.
 */
export interface LoadPart {
  terms: Float64Array;
  m0: Float64Array;
  v0: Float64Array;
  defl: Float64Array;
  nSeg: number;
}

function deflectionPoints(model: BeamModel, i: number): number[] {
  return model.supports[i] === 'free' || model.supports[i + 1] === 'free' ? DEFLECTION_POINTS_CANTILEVER : DEFLECTION_POINTS;
}

/** Reduces loads (kN, kN/m, member coordinates in m) on a prepared beam to a LoadPart. */
export function loadPart(p: PreparedBeam, loads: readonly BeamLoad[] | BeamLoad[][], nSeg = 10): LoadPart {
  const model = p.model;
  const nm = model.members.length;
  const by = loads.length > 0 && Array.isArray(loads[0]) ? (loads as BeamLoad[][]) : groupLoads(nm, loads as BeamLoad[]);
  const ns = nSeg + 1;
  const terms = new Float64Array(4 * nm);
  const m0 = new Float64Array(nm * ns);
  const v0 = new Float64Array(2 * nm);
  const defl = new Float64Array(3 * nm);
  for (let i = 0; i < nm; i++) {
    const L = model.members[i].lengthM;
    const li = by[i];
    if (li.length === 0) continue;
    const pts = deflectionPoints(model, i);
    // full-length uniform loads (self-weight, walls) in closed form
    let w = 0;
    let uniformOnly = true;
    for (const l of li) {
      if (l.kind === 'linear' && l.fromM === 0 && l.toM === L && l.startKNPerM === l.endKNPerM) w += l.startKNPerM;
      else uniformOnly = false;
    }
    if (uniformOnly) {
      const ei = model.members[i].eiKNm2;
      terms[4 * i] = terms[4 * i + 1] = (w * L * L) / 12;
      terms[4 * i + 2] = terms[4 * i + 3] = (w * L) / 2;
      for (let k = 0; k < ns; k++) {
        const x = (L * k) / nSeg;
        m0[i * ns + k] = (w * x * (L - x)) / 2;
      }
      v0[2 * i] = (w * L) / 2;
      v0[2 * i + 1] = (-w * L) / 2;
      for (let q = 0; q < 3; q++) {
        const x = L * pts[q];
        defl[3 * i + q] = (w * x * (L * L * L - 2 * L * x * x + x * x * x)) / (24 * ei);
      }
      continue;
    }
    const t = memberTerms(L, li);
    terms[4 * i] = t.fa; terms[4 * i + 1] = t.fb; terms[4 * i + 2] = t.ra; terms[4 * i + 3] = t.rb;
    for (let k = 0; k < ns; k++) m0[i * ns + k] = simpleMoment(L, li, t.ra, (L * k) / nSeg);
    v0[2 * i] = simpleShear(L, li, t.ra, 0);
    v0[2 * i + 1] = simpleShear(L, li, t.ra, L * (1 - 1e-12));
    for (let q = 0; q < 3; q++) defl[3 * i + q] = simpleDeflection(L, model.members[i].eiKNm2, li, L * pts[q]);
  }
  return { terms, m0, v0, defl, nSeg };
}

/** Σ factor × part, into fresh arrays. */
function combineParts(parts: readonly (readonly [LoadPart, number])[], nm: number, nSeg: number): LoadPart {
  const ns = nSeg + 1;
  const out: LoadPart = { terms: new Float64Array(4 * nm), m0: new Float64Array(nm * ns), v0: new Float64Array(2 * nm), defl: new Float64Array(3 * nm), nSeg };
  for (const [part, f] of parts) {
    if (f === 0) continue;
    for (let q = 0; q < out.terms.length; q++) out.terms[q] += f * part.terms[q];
    for (let q = 0; q < out.m0.length; q++) out.m0[q] += f * part.m0[q];
    for (let q = 0; q < out.v0.length; q++) out.v0[q] += f * part.v0[q];
    for (let q = 0; q < out.defl.length; q++) out.defl[q] += f * part.defl[q];
  }
  return out;
}

/**
 * Envelope of moments (kN·m) and shears (kN) for factored combinations of dead and imposed line
 * loads (kN, kN/m), EI in kN·m²; also service reactions and deflections (mm).
 */
export function envelopeBeam(
  model: BeamModel,
  dead: readonly BeamLoad[],
  live: readonly BeamLoad[],
  combos: readonly Combination[],
  opts: { samplesPerMember?: number; prepared?: PreparedBeam } = {},
): BeamEnvelope {
  const p = opts.prepared ?? prepareBeam(model);
  if (!p.ok) return { caution: CAUTION, ok: false, members: [], deadReactionsKN: [], liveReactionsKN: [], maxFactoredReactionsKN: [], patternsTried: 0 };
  const nSeg = opts.samplesPerMember ?? 10;
  return envelopeParts(p, [[loadPart(p, dead, nSeg), 1]], [[loadPart(p, live, nSeg), 1]], combos);
}

/**
 * Solutions per unit factor of one imposed-load part, by arrangement index; shared between levels.
 * Flat arrays, one slot per arrangement: end moments (2 per member) and node reactions (kN).
 */
export interface ArrangementSolutions {
  em: Float64Array;
  r: Float64Array;
  solved: Uint8Array;
}
export type ArrangementCache = Map<LoadPart, ArrangementSolutions>;

/** Vertical reactions (kN) at the nodes from packed terms and end moments, written into r from off; zero at free nodes. */
function reactionsInto(free: Uint8Array, lengths: Float64Array, T: Float64Array, em: Float64Array, emOff: number, r: Float64Array, off: number): void {
  const nm = lengths.length;
  for (let n = 0; n <= nm; n++) {
    if (free[n]) {
      r[off + n] = 0;
      continue;
    }
    let v = 0;
    if (n > 0) v += T[4 * (n - 1) + 3] - (em[emOff + 2 * n - 1] - em[emOff + 2 * n - 2]) / lengths[n - 1];
    if (n < nm) v += T[4 * n + 2] + (em[emOff + 2 * n + 1] - em[emOff + 2 * n]) / lengths[n];
    r[off + n] = v;
  }
}

/** Vertical reactions (kN) at the nodes from packed terms and end moments; zero at free nodes. */
function reactionsOf(free: Uint8Array, lengths: Float64Array, T: Float64Array, em: Float64Array): Float64Array {
  const r = new Float64Array(lengths.length + 1);
  reactionsInto(free, lengths, T, em, 0, r, 0);
  return r;
}

/**
 * The envelope from load parts: dead = Σ factor × part, imposed likewise (parts from loadPart,
 * all with the same number of samples). Units as envelopeBeam.
 */
export function envelopeParts(
  p: PreparedBeam,
  deadParts: readonly (readonly [LoadPart, number])[],
  liveParts: readonly (readonly [LoadPart, number])[],
  combos: readonly Combination[],
  cache?: ArrangementCache,
): BeamEnvelope {
  const model = p.model;
  const nm = model.members.length;
  if (!p.ok) return { caution: CAUTION, ok: false, members: [], deadReactionsKN: [], liveReactionsKN: [], maxFactoredReactionsKN: [], patternsTried: 0 };
  const nSeg = (deadParts[0] ?? liveParts[0])?.[0].nSeg ?? 10;
  const D = combineParts(deadParts, nm, nSeg);
  const Lv = combineParts(liveParts, nm, nSeg);
  const TD = D.terms, TL = Lv.terms, m0D = D.m0, m0L = Lv.m0, v0D = D.v0, v0L = Lv.v0;
  // per member: max moment, its x, its arrangement; min moment, its x, its arrangement; max |shear|
  const acc = new Float64Array(nm * 7);
  for (let i = 0; i < nm; i++) {
    acc[i * 7] = -Infinity;
    acc[i * 7 + 3] = Infinity;
  }
  const lengths = p.len;
  const free = new Uint8Array(nm + 1);
  for (let n = 0; n <= nm; n++) free[n] = model.supports[n] === 'free' ? 1 : 0;
  const maxR = model.supports.map((sp) => (sp === 'free' ? 0 : -Infinity));
  const patterns = arrangements(model);
  const nPat = patterns.length;
  // arrangement of each scan, as (combination index, arrangement index); labels are made at the end
  const scans: number[] = [];
  const rhs = new Float64Array(p.nEq), u = new Float64Array(2 * (nm + 1));
  // service solutions: dead on all spans, imposed on all spans
  const sD = new Float64Array(2 * nm), uD = new Float64Array(2 * (nm + 1));
  const sL = new Float64Array(2 * nm), uL = new Float64Array(2 * (nm + 1));
  solvePacked(p, TD, rhs, uD, sD);
  solvePacked(p, TL, rhs, uL, sL);
  const rD = reactionsOf(free, lengths, TD, sD);
  const rL = reactionsOf(free, lengths, TL, sL);
  // Every arrangement is dead on all spans plus imposed on some: by superposition only the
  // imposed part needs a solve, and that solve serves every combination. When the imposed load
  // is one part times a factor, the solution per unit factor is cached for the next level too.
  const single = liveParts.length === 1 ? liveParts[0] : null;
  const scale = single ? single[1] : 1;
  let sol = single && cache ? cache.get(single[0]) : undefined;
  if (!sol || sol.solved.length !== nPat) {
    sol = { em: new Float64Array(nPat * 2 * nm), r: new Float64Array(nPat * (nm + 1)), solved: new Uint8Array(nPat) };
    if (single && cache) cache.set(single[0], sol);
  }
  const solEm = sol.em, solR = sol.r, solved = sol.solved;
  const basis = single ? single[0].terms : TL;
  const T = new Float64Array(4 * nm);
  const em = new Float64Array(2 * nm);
  const loaded = new Uint8Array(nm);
  for (let ci = 0; ci < combos.length; ci++) {
    const c = combos[ci];
    const cd = c.dead;
    for (let pi = 0; pi < nPat; pi++) {
      const pat = patterns[pi];
      if ((c.live === 0) !== (pat.kind === 'none')) continue;
      const id = scans.length;
      scans.push(ci * nPat + pi);
      const gl = c.live * scale;
      // an adjacent-span arrangement is scanned over the two spans beside its support only
      const from = pat.kind === 'adjacent' ? pat.node - 1 : 0;
      const to = pat.kind === 'adjacent' ? pat.node : nm - 1;
      if (pat.kind === 'none') {
        for (let q = 2 * from; q <= 2 * to + 1; q++) em[q] = cd * sD[q];
        for (let n = 0; n <= nm; n++) if (!free[n] && cd * rD[n] > maxR[n]) maxR[n] = cd * rD[n];
      } else {
        const eo = pi * 2 * nm;
        const ro = pi * (nm + 1);
        if (!solved[pi]) {
          for (let i = 0; i < nm; i++) {
            const on = loadedIn(pat, i);
            T[4 * i] = on ? basis[4 * i] : 0;
            T[4 * i + 1] = on ? basis[4 * i + 1] : 0;
            T[4 * i + 2] = on ? basis[4 * i + 2] : 0;
            T[4 * i + 3] = on ? basis[4 * i + 3] : 0;
          }
          const e = solEm.subarray(eo, eo + 2 * nm);
          solvePacked(p, T, rhs, u, e);
          reactionsInto(free, lengths, T, solEm, eo, solR, ro);
          solved[pi] = 1;
        }
        for (let q = 2 * from; q <= 2 * to + 1; q++) em[q] = cd * sD[q] + gl * solEm[eo + q];
        for (let n = 0; n <= nm; n++) {
          const r = cd * rD[n] + gl * solR[ro + n];
          if (!free[n] && r > maxR[n]) maxR[n] = r;
        }
      }
      for (let i = from; i <= to; i++) loaded[i] = loadedIn(pat, i) ? 1 : 0;
      scanArrangement(from, to, nSeg, lengths, m0D, m0L, v0D, v0L, em, cd, c.live, loaded, id, acc);
    }
  }
  // one label per scan, made only for the scans that hold an extreme
  const labels: (string | undefined)[] = [];
  const scanLabel = (id: number) => {
    if (!(id >= 0 && id < scans.length)) return '';
    let s = labels[id];
    if (s === undefined) {
      const k = scans[id];
      s = `${combos[Math.floor(k / nPat)].id}, imposed on ${arrangementLabel(patterns[k % nPat])}`;
      labels[id] = s;
    }
    return s;
  };
  const env: MemberEnvelope[] = model.members.map((_, i) => ({
    maxMomentKNm: acc[i * 7], maxMomentAtM: acc[i * 7 + 1], maxPattern: scanLabel(acc[i * 7 + 2]),
    minMomentKNm: acc[i * 7 + 3], minMomentAtM: acc[i * 7 + 4], minPattern: scanLabel(acc[i * 7 + 5]),
    maxShearKN: acc[i * 7 + 6], serviceDeflectionMm: 0, serviceDeflectionAtM: 0,
  }));
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
      const y = (v1 * (1 - xi) + v2 * xi + D.defl[3 * i + q] + Lv.defl[3 * i + q] + yEnd) * 1000;
      if (Math.abs(y) > Math.abs(env[i].serviceDeflectionMm)) {
        env[i].serviceDeflectionMm = y;
        env[i].serviceDeflectionAtM = L * xi;
      }
    }
  }
  return { caution: CAUTION, ok: true, members: env, deadReactionsKN: [...rD], liveReactionsKN: [...rL], maxFactoredReactionsKN: maxR, patternsTried: scans.length };
}
