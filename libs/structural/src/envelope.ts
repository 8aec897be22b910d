// Envelope of a continuous beam under factored dead load on every span and imposed load
// patterned over all spans, alternate spans, and adjacent pairs with alternates beyond (the
// arrangements of IS 456 cl. 22.4.1 and ACI 318-19 §6.4.3). One factorisation serves every
// arrangement; each is a fresh right-hand side of the banded system.
import { BeamLoad, BeamModel, groupLoads, memberTerms, nodeReactions, PreparedBeam, prepareBeam, simpleDeflection, simpleMoment, simpleShear, solvePacked, solveTerms } from './beam';
import type { Combination } from './codes';

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
    const v0 = Math.abs(gd * v0D[base] + gl * v0L[base] + dv);
    const v1 = Math.abs(gd * v0D[base + nSeg] + gl * v0L[base + nSeg] + dv);
    const v = v0 > v1 ? v0 : v1;
    if (v > acc[o + 6]) acc[o + 6] = v;
  }
}

/**
 * The imposed-load arrangements of a beam with n members: label, loaded members, and the members
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
  const nm = model.members.length;
  if (!p.ok) return { ok: false, members: [], deadReactionsKN: [], liveReactionsKN: [], maxFactoredReactionsKN: [], patternsTried: 0 };
  const nSeg = opts.samplesPerMember ?? 10;
  const dBy = groupLoads(nm, dead);
  const lBy = groupLoads(nm, live);
  const tD = model.members.map((m, i) => memberTerms(m.lengthM, dBy[i]));
  const tL = model.members.map((m, i) => memberTerms(m.lengthM, lBy[i]));
  const ns = nSeg + 1;
  const m0D = new Float64Array(nm * ns), m0L = new Float64Array(nm * ns);
  const v0D = new Float64Array(nm * ns), v0L = new Float64Array(nm * ns);
  for (let i = 0; i < nm; i++) {
    const L = model.members[i].lengthM;
    for (let k = 0; k < ns; k++) {
      const x = (L * k) / nSeg;
      m0D[i * ns + k] = simpleMoment(L, dBy[i], tD[i].ra, x);
      m0L[i * ns + k] = simpleMoment(L, lBy[i], tL[i].ra, x);
      if (k === 0 || k === nSeg) {
        // just inside the ends
        const xe = k === 0 ? 0 : L * (1 - 1e-12);
        v0D[i * ns + k] = simpleShear(L, dBy[i], tD[i].ra, xe);
        v0L[i * ns + k] = simpleShear(L, lBy[i], tL[i].ra, xe);
      }
    }
  }
  // per member: max moment, its x, its arrangement; min moment, its x, its arrangement; max |shear|
  const acc = new Float64Array(nm * 7);
  for (let i = 0; i < nm; i++) {
    acc[i * 7] = -Infinity;
    acc[i * 7 + 3] = Infinity;
  }
  const lengths = new Float64Array(nm);
  model.members.forEach((m, i) => (lengths[i] = m.lengthM));
  const maxR = model.supports.map((sp) => (sp === 'free' ? 0 : -Infinity));
  const patterns = arrangements(model);
  // arrangement of each scan, as (combination index, arrangement index); labels are made at the end
  const scans: [number, number][] = [];
  // packed terms: dead and imposed apart, and the combination of one arrangement
  const TD = new Float64Array(4 * nm), TL = new Float64Array(4 * nm), T = new Float64Array(4 * nm);
  for (let i = 0; i < nm; i++) {
    TD[4 * i] = tD[i].fa; TD[4 * i + 1] = tD[i].fb; TD[4 * i + 2] = tD[i].ra; TD[4 * i + 3] = tD[i].rb;
    TL[4 * i] = tL[i].fa; TL[4 * i + 1] = tL[i].fb; TL[4 * i + 2] = tL[i].ra; TL[4 * i + 3] = tL[i].rb;
  }
  const rhs = new Float64Array(p.nEq), u = new Float64Array(2 * (nm + 1)), endMoments = new Float64Array(2 * nm);
  const loaded = new Uint8Array(nm);
  for (let ci = 0; ci < combos.length; ci++) {
    const c = combos[ci];
    for (let pi = 0; pi < patterns.length; pi++) {
      const pat = patterns[pi];
      if ((c.live === 0) !== (pat.kind === 'none')) continue;
      const id = scans.length;
      scans.push([ci, pi]);
      for (let i = 0; i < nm; i++) {
        const on = isLoaded(pat, i);
        loaded[i] = on ? 1 : 0;
        const gl = on ? c.live : 0;
        for (let q = 4 * i; q < 4 * i + 4; q++) T[q] = c.dead * TD[q] + gl * TL[q];
      }
      solvePacked(p, T, rhs, u, endMoments);
      // reactions: simply-supported reactions plus the end-moment couple of each member
      for (let n = 0; n <= nm; n++) {
        let r = 0;
        if (n > 0) r += T[4 * (n - 1) + 3] - (endMoments[2 * n - 1] - endMoments[2 * n - 2]) / lengths[n - 1];
        if (n < nm) r += T[4 * n + 2] + (endMoments[2 * n + 1] - endMoments[2 * n]) / lengths[n];
        if (model.supports[n] !== 'free' && r > maxR[n]) maxR[n] = r;
      }
      scanArrangement(pat.kind === 'adjacent' ? pat.node - 1 : 0, pat.kind === 'adjacent' ? pat.node : nm - 1, nSeg, lengths, m0D, m0L, v0D, v0L, endMoments, c.dead, c.live, loaded, id, acc);
    }
  }
  const scanLabel = (id: number) => (scans[id] ? `${combos[scans[id][0]].id}, imposed on ${arrangementLabel(patterns[scans[id][1]])}` : '');
  const env: MemberEnvelope[] = model.members.map((_, i) => ({
    maxMomentKNm: acc[i * 7], maxMomentAtM: acc[i * 7 + 1], maxPattern: scanLabel(acc[i * 7 + 2]),
    minMomentKNm: acc[i * 7 + 3], minMomentAtM: acc[i * 7 + 4], minPattern: scanLabel(acc[i * 7 + 5]),
    maxShearKN: acc[i * 7 + 6], serviceDeflectionMm: 0, serviceDeflectionAtM: 0,
  }));
  const tried = scans.length;
  // service: dead and imposed on all spans
  const sD = solveTerms(p, tD);
  const sL = solveTerms(p, tL);
  const rD = nodeReactions(model, tD, sD.endMoments);
  const rL = nodeReactions(model, tL, sL.endMoments);
  // service deflection: chord between the end deflections, plus each member's own loads and end
  // moments on a simple span (superposition of the dead and imposed solutions)
  for (let i = 0; i < nm; i++) {
    const { lengthM: L, eiKNm2: ei } = model.members[i];
    const ml = sD.endMoments[2 * i] + sL.endMoments[2 * i];
    const mr = sD.endMoments[2 * i + 1] + sL.endMoments[2 * i + 1];
    const v1 = -(sD.u[2 * i] + sL.u[2 * i]);
    const v2 = -(sD.u[2 * i + 2] + sL.u[2 * i + 2]);
    // the largest deflection lies in the middle half of a span, or at a free end
    const ends = model.supports[i] === 'free' || model.supports[i + 1] === 'free';
    for (const xi of ends ? DEFLECTION_POINTS_CANTILEVER : DEFLECTION_POINTS) {
      const x = L * xi;
      const yEnd = ((L * L) / (6 * ei)) * (ml * (2 * xi - 3 * xi * xi + xi * xi * xi) + mr * (xi - xi * xi * xi));
      const y = (v1 * (1 - xi) + v2 * xi + simpleDeflection(L, ei, dBy[i], x) + simpleDeflection(L, ei, lBy[i], x) + yEnd) * 1000;
      if (Math.abs(y) > Math.abs(env[i].serviceDeflectionMm)) {
        env[i].serviceDeflectionMm = y;
        env[i].serviceDeflectionAtM = x;
      }
    }
  }
  return { ok: true, members: env, deadReactionsKN: [...rD], liveReactionsKN: [...rL], maxFactoredReactionsKN: maxR, patternsTried: tried };
}
