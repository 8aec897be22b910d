// Envelope of a continuous beam under factored dead load on every span and imposed load
// patterned over all spans, alternate spans, and adjacent pairs with alternates beyond (the
// arrangements of IS 456 cl. 22.4.1 and ACI 318-19 §6.4.3). One factorisation serves every
// arrangement; each is a fresh right-hand side of the banded system.
import { BeamLoad, BeamModel, groupLoads, memberStateAt, memberTerms, MemberTerms, nodeReactions, PreparedBeam, prepareBeam, simpleMomentShear, solvePrepared, solveTerms } from './beam';
import type { Combination } from './codes';

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

/** The imposed-load arrangements of a beam with n members: label and member set. */
export function loadPatterns(model: BeamModel): { label: string; members: boolean[] }[] {
  const n = model.members.length;
  const mk = (f: (i: number) => boolean) => Array.from({ length: n }, (_, i) => f(i));
  const out = [
    { label: 'all spans', members: mk(() => true) },
    { label: 'dead only', members: mk(() => false) },
  ];
  if (n > 1) {
    out.push({ label: 'alternate spans (odd)', members: mk((i) => i % 2 === 0) });
    out.push({ label: 'alternate spans (even)', members: mk((i) => i % 2 === 1) });
  }
  for (let node = 1; node < n; node++) {
    if (model.supports[node] === 'free') continue;
    // spans node-1 and node loaded, then every other span beyond on both sides
    out.push({
      label: `adjacent spans at support ${node}`,
      members: mk((i) => (i >= node ? (i - node) % 2 === 0 : (node - 1 - i) % 2 === 0)),
    });
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
      const [md, vd] = simpleMomentShear(L, dBy[i], tD[i].ra, x);
      const [ml, vl] = simpleMomentShear(L, lBy[i], tL[i].ra, x);
      m0D[i * ns + k] = md; v0D[i * ns + k] = vd;
      m0L[i * ns + k] = ml; v0L[i * ns + k] = vl;
    }
  }
  const env: MemberEnvelope[] = model.members.map(() => ({
    maxMomentKNm: -Infinity, maxMomentAtM: 0, maxPattern: '',
    minMomentKNm: Infinity, minMomentAtM: 0, minPattern: '',
    maxShearKN: 0, serviceDeflectionMm: 0, serviceDeflectionAtM: 0,
  }));
  const maxR = new Array<number>(nm + 1).fill(-Infinity);
  const patterns = loadPatterns(model);
  const terms: MemberTerms[] = model.members.map(() => ({ fa: 0, fb: 0, ra: 0, rb: 0, total: 0 }));
  let tried = 0;
  for (const c of combos) {
    for (const pat of patterns) {
      if (c.live === 0 && pat.label !== 'dead only') continue;
      if (c.live !== 0 && pat.label === 'dead only') continue;
      tried++;
      for (let i = 0; i < nm; i++) {
        const gl = pat.members[i] ? c.live : 0;
        const d = tD[i], l = tL[i], t = terms[i];
        t.fa = c.dead * d.fa + gl * l.fa;
        t.fb = c.dead * d.fb + gl * l.fb;
        t.ra = c.dead * d.ra + gl * l.ra;
        t.rb = c.dead * d.rb + gl * l.rb;
        t.total = c.dead * d.total + gl * l.total;
      }
      const { endMoments } = solveTerms(p, terms);
      const r = nodeReactions(model, terms, endMoments);
      for (let n = 0; n <= nm; n++) if (r[n] > maxR[n]) maxR[n] = r[n];
      const label = `${c.id}, imposed on ${pat.label}`;
      for (let i = 0; i < nm; i++) {
        const L = model.members[i].lengthM;
        const ml = endMoments[2 * i], mr = endMoments[2 * i + 1];
        const gl = pat.members[i] ? c.live : 0;
        const dv = (mr - ml) / L;
        const e = env[i];
        let bestK = -1;
        let bestM = -Infinity;
        let prev2 = 0, prev1 = 0, atBest: [number, number, number] = [0, 0, 0];
        for (let k = 0; k < ns; k++) {
          const xi = k / nSeg;
          const idx = i * ns + k;
          const m = c.dead * m0D[idx] + gl * m0L[idx] + ml * (1 - xi) + mr * xi;
          if (k >= 2 && bestK === k - 1) atBest = [prev2, prev1, m];
          if (m > bestM) { bestM = m; bestK = k; }
          if (m < e.minMomentKNm) { e.minMomentKNm = m; e.minMomentAtM = xi * L; e.minPattern = label; }
          // shear just inside the ends is where it peaks for these loads
          if (k === 0 || k === nSeg) {
            const v = Math.abs(c.dead * v0D[idx] + gl * v0L[idx] + dv);
            if (v > e.maxShearKN) e.maxShearKN = v;
          }
          prev2 = prev1;
          prev1 = m;
        }
        // a parabola through the best sample and its neighbours finds the peak between samples
        // (exact under uniform load)
        let peak = bestM;
        let peakX = (bestK / nSeg) * L;
        if (bestK > 0 && bestK < nSeg) {
          const [a0, a1, a2] = atBest;
          const den = a0 - 2 * a1 + a2;
          if (den < 0) {
            const off = (0.5 * (a0 - a2)) / den;
            if (Math.abs(off) <= 1) {
              peak = a1 - 0.25 * (a0 - a2) * off;
              peakX = ((bestK + off) / nSeg) * L;
            }
          }
        }
        if (peak > e.maxMomentKNm) { e.maxMomentKNm = peak; e.maxMomentAtM = peakX; e.maxPattern = label; }
      }
    }
  }
  // service: dead and imposed on all spans
  const sD = solveTerms(p, tD);
  const sL = solveTerms(p, tL);
  const rD = nodeReactions(model, tD, sD.endMoments);
  const rL = nodeReactions(model, tL, sL.endMoments);
  const all = groupLoads(nm, [...dead, ...live]);
  const sol = solvePrepared(p, all);
  for (let i = 0; i < nm; i++) {
    const L = model.members[i].lengthM;
    for (let k = 0; k <= nSeg; k++) {
      const x = (L * k) / nSeg;
      const y = memberStateAt(p, sol, i, x).y * 1000;
      if (Math.abs(y) > Math.abs(env[i].serviceDeflectionMm)) {
        env[i].serviceDeflectionMm = y;
        env[i].serviceDeflectionAtM = x;
      }
    }
  }
  return { ok: true, members: env, deadReactionsKN: [...rD], liveReactionsKN: [...rL], maxFactoredReactionsKN: maxR, patternsTried: tried };
}
