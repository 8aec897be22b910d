// Gravity loads of one floor level: slab panels shared to their beams by the 45° rule
// (IS 456 cl. 24.5), beam self-weight, walls, and the reactions of secondary beams landing on
// primary beams as point loads. Dead and imposed loads are kept apart so that combinations and
// patterns can be formed later.
import type { BeamLoad, LinearLoad } from './beam';
import { memberTerms } from './beam';
import { StructuralInputError } from './errors';
import type { BeamLine, Layout, Panel } from './layout';

/**
 * Equivalent uniform loads on the beams around a two-way panel (kN/m) for a slab load w (kPa),
 * short span lx and long span ly (m): for mid-span moment, short-span beam w·lx/3 and long-span
 * beam (w·lx/2)(1 − 1/(3β²)); for end shear w·lx/4 and (w·lx/2)(1 − 1/(2β)), β = ly/lx.
 * Source: the usual textbook equivalents of the 45° distribution (IS 456 cl. 24.5), as quoted.
 * Throws StructuralInputError outside the accepted ranges.
 */
export function twoWayEquivalentLoads(wKPa: number, lxM: number, lyM: number) {
  const bad = (v: number, lo: number, hi: number) =>
    !(typeof v === 'number' && Number.isFinite(v) && v >= lo && v <= hi);
  const problems = [];
  if (bad(wKPa, 0, 1000))
    problems.push({ path: 'wKPa', field: 'wKPa', message: 'must be a number of kPa from 0 to 1000' });
  if (bad(lxM, 0.1, 100))
    problems.push({ path: 'lxM', field: 'lxM', message: 'must be a number of metres from 0.1 to 100' });
  if (bad(lyM, 0.1, 100) || lyM < lxM)
    problems.push({
      path: 'lyM',
      field: 'lyM',
      message: 'must be a number of metres from lxM (the short span) to 100',
    });
  if (problems.length) throw new StructuralInputError(problems);
  const beta = lyM / lxM;
  return {
    shortBeamMomentKNPerM: (wKPa * lxM) / 3,
    longBeamMomentKNPerM: ((wKPa * lxM) / 2) * (1 - 1 / (3 * beta * beta)),
    shortBeamShearKNPerM: (wKPa * lxM) / 4,
    longBeamShearKNPerM: ((wKPa * lxM) / 2) * (1 - 1 / (2 * beta)),
  };
}

export interface PanelLoad {
  id: string;
  lxM: number;
  lyM: number;
  aspect: number;
  spanning: 'one-way' | 'two-way';
  deadKPa: number;
  liveKPa: number;
  /** equivalent uniform loads on the supporting beams under the factored-free service load D + L, kN/m */
  equivalent: ReturnType<typeof twoWayEquivalentLoads> | { longBeamKNPerM: number };
}

export interface SecondaryLoad {
  id: string;
  lengthM: number;
  /** reactions at start and end, kN (service) */
  deadReactions: [number, number];
  liveReactions: [number, number];
}

export interface LevelLoads {
  kind: 'floor' | 'roof';
  slabDeadKPa: number;
  liveKPa: number;
  /** per line: dead load other than the slab (self-weight, walls, secondary beams' own weight) */
  extraDead: Map<string, BeamLoad[]>;
  secondaries: SecondaryLoad[];
  panels: PanelLoad[];
}

/**
 * Slab load shapes, the same on every level: per beam line, the load of 1 kPa on the slabs
 * (kN/m per kPa, and kN per kPa where a secondary beam lands), and per secondary beam its own
 * share and reactions per kPa.
 */
export interface SlabShapes {
  lines: Map<string, BeamLoad[]>;
  secondaries: Map<string, { shape: BeamLoad[]; reactions: [number, number] }>;
  panels: { panel: Panel; twoWay: boolean }[];
}

/** A load shape along an edge: breakpoints (position m, intensity per kPa of slab load, kN/m per kPa). */
type Profile = [number, number][];

export function panelEdgeProfiles(p: Panel, oneWayAspect: number): { twoWay: boolean; profiles: Profile[] } {
  const twoWay = p.ly / p.lx <= oneWayAspect;
  const h = p.lx / 2;
  const profiles = p.edges.map((e): Profile => {
    const len = e.to - e.from;
    const edgeIsShort = p.lx < p.ly - 1e-9 && Math.abs(len - p.lx) < 1e-9;
    if (!twoWay) {
      // one-way: the two long edges carry half the short span each
      return edgeIsShort
        ? []
        : [
            [e.from, h],
            [e.to, h],
          ];
    }
    // two-way, 45° lines from the corners: trapezoids on the long edges, triangles on the short
    if (len > p.lx + 1e-9)
      return [
        [e.from, 0],
        [e.from + h, h],
        [e.to - h, h],
        [e.to, 0],
      ];
    return [
      [e.from, 0],
      [e.from + len / 2, len / 2],
      [e.to, 0],
    ];
  });
  return { twoWay, profiles };
}

/**
 * Linear load pieces in flat form, five numbers each: member, fromM, toM, startKNPerM, endKNPerM.
 * A slab spreads thousands of pieces over a scheme's beams before they are merged; numbers in one
 * array cost far less to make and to collect than an object each.
 */
type Pieces = number[];

/** Spreads a piecewise-linear profile (scaled by k) over the members of a beam line, into out. */
function addProfileToLine(line: BeamLine, profile: Profile, k: number, out: Pieces): void {
  for (let i = 0; i + 1 < profile.length; i++) {
    const [s0, w0] = profile[i];
    const [s1, w1] = profile[i + 1];
    if (s1 - s0 <= 1e-12) continue;
    // first member that ends after s0 (members are in order along the line)
    let lo = 0;
    let hi = line.members.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (line.members[mid].endS <= s0 + 1e-9) lo = mid + 1;
      else hi = mid;
    }
    for (let mi = lo; mi < line.members.length; mi++) {
      const m = line.members[mi];
      if (m.startS >= s1 - 1e-9) break;
      const a = Math.max(s0, m.startS);
      const b = Math.min(s1, m.endS);
      if (b - a <= 1e-9) continue;
      const wa = w0 + ((w1 - w0) * (a - s0)) / (s1 - s0);
      const wb = w0 + ((w1 - w0) * (b - s0)) / (s1 - s0);
      out.push(m.index, a - m.startS, Math.min(b - m.startS, m.lengthM), wa * k, wb * k);
    }
  }
}

/** Flat pieces (see Pieces) as load objects, in order. */
function piecesToLoads(pc: Pieces): LinearLoad[] {
  const out: LinearLoad[] = [];
  for (let q = 0; q < pc.length; q += 5)
    out.push({
      kind: 'linear',
      member: pc[q],
      fromM: pc[q + 1],
      toM: pc[q + 2],
      startKNPerM: pc[q + 3],
      endKNPerM: pc[q + 4],
    });
  return out;
}

function pointOnLine(line: BeamLine, s: number, p: number, out: BeamLoad[]): void {
  const m = line.members.find((mm) => s >= mm.startS - 1e-9 && s <= mm.endS + 1e-9);
  if (!m) return;
  out.push({ kind: 'point', member: m.index, atM: Math.min(Math.max(s - m.startS, 0), m.lengthM), forceKN: p });
}

/**
 * Sums the linear loads on each member into one piecewise-linear load over the union of their
 * breakpoints (exact: a sum of piecewise-linear functions is piecewise linear). Panels on both
 * sides of a beam then cost one set of pieces instead of two. Point loads pass through.
 */
export function mergeLinearLoads(loads: readonly BeamLoad[]): BeamLoad[] {
  const points: BeamLoad[] = [];
  const pc: Pieces = [];
  for (const l of loads) {
    if (l.kind === 'point') points.push(l);
    else pc.push(l.member, l.fromM, l.toM, l.startKNPerM, l.endKNPerM);
  }
  return mergePieces(pc, points);
}

/** mergeLinearLoads on flat pieces: the point loads first, then each member's merged pieces. */
function mergePieces(pc: Pieces, points: readonly BeamLoad[]): BeamLoad[] {
  const out: BeamLoad[] = points.slice();
  const n = pc.length / 5;
  // each member's pieces as a chain in input order; members in order of first appearance
  const slotOf = new Map<number, number>();
  const head: number[] = [];
  const tail: number[] = [];
  const next = new Int32Array(n).fill(-1);
  for (let q = 0; q < n; q++) {
    const m = pc[5 * q];
    const slot = slotOf.get(m);
    if (slot === undefined) {
      slotOf.set(m, head.length);
      head.push(q);
      tail.push(q);
    } else {
      next[tail[slot]] = q;
      tail[slot] = q;
    }
  }
  const cuts: number[] = [];
  for (const [member, slot] of slotOf) {
    cuts.length = 0;
    for (let q = head[slot]; q >= 0; q = next[q]) cuts.push(pc[5 * q + 1], pc[5 * q + 2]);
    // insertion sort: a member carries a handful of pieces, and this runs for every member of a scheme
    for (let i = 1; i < cuts.length; i++) {
      const v = cuts[i];
      let j = i - 1;
      while (j >= 0 && cuts[j] > v) {
        cuts[j + 1] = cuts[j];
        j--;
      }
      cuts[j + 1] = v;
    }
    let prev = -Infinity;
    for (const b of cuts) {
      if (b - prev <= 1e-12) continue;
      if (prev !== -Infinity) {
        const a = prev;
        // sum of the loads covering [a, b], at each end
        let wa = 0;
        let wb = 0;
        for (let q = head[slot]; q >= 0; q = next[q]) {
          const o = 5 * q;
          const fromM = pc[o + 1],
            toM = pc[o + 2],
            start = pc[o + 3],
            end = pc[o + 4];
          if (fromM > a + 1e-12 || toM < b - 1e-12) continue;
          const h = toM - fromM;
          const slope = (end - start) / h;
          wa += start + slope * (a - fromM);
          wb += start + slope * (b - fromM);
        }
        if (wa !== 0 || wb !== 0)
          out.push({ kind: 'linear', member, fromM: a, toM: b, startKNPerM: wa, endKNPerM: wb });
      }
      prev = b;
    }
  }
  return out;
}

/** Slab shapes of a layout (see SlabShapes); one-way beyond oneWayAspect (long/short). */
export function slabShapes(layout: Layout, oneWayAspect: number): SlabShapes {
  // per line: the slab's pieces (flat) and, later, the secondary beams' reactions
  const linePieces = new Map<string, Pieces>();
  const linePoints = new Map<string, BeamLoad[]>();
  for (const l of layout.lines) {
    linePieces.set(l.id, []);
    linePoints.set(l.id, []);
  }
  const secById = new Map(layout.secondaries.map((s) => [s.beam.id, s]));
  const secShape = new Map<string, Pieces>();
  for (const s of layout.secondaries) secShape.set(s.beam.id, []);
  const panels: SlabShapes['panels'] = [];
  for (const p of layout.panels) {
    const { twoWay, profiles } = panelEdgeProfiles(p, oneWayAspect);
    panels.push({ panel: p, twoWay });
    p.edges.forEach((e, k) => {
      const prof = profiles[k];
      if (prof.length === 0) return;
      if (e.carrier.type === 'line') {
        const line = layout.lineById.get(e.carrier.lineId);
        const out = linePieces.get(e.carrier.lineId);
        if (line && out) addProfileToLine(line, prof, 1, out);
      } else {
        const sec = secById.get(e.carrier.id);
        const out = secShape.get(e.carrier.id);
        if (!sec || !out) return;
        const pseudo: BeamLine = {
          id: sec.beam.id,
          gridLineId: '',
          label: sec.beam.id,
          runs: sec.runs,
          at: sec.at,
          nodes: [],
          widthMm: 0,
          specifiedDepthMm: null,
          wallThicknessMm: 0,
          members: [
            { index: 0, id: sec.beam.id, startS: sec.from, endS: sec.to, lengthM: sec.lengthM, kind: 'simple' },
          ],
        };
        addProfileToLine(pseudo, prof, 1, out);
      }
    });
  }
  const secondaries = new Map<string, { shape: BeamLoad[]; reactions: [number, number] }>();
  for (const s of layout.secondaries) {
    const shape = piecesToLoads(secShape.get(s.beam.id) as Pieces);
    const t = memberTerms(s.lengthM, shape);
    secondaries.set(s.beam.id, { shape, reactions: [t.ra, t.rb] });
    if (s.supports.length === 2) {
      s.supports.forEach((sup, k) => {
        const line = layout.lineById.get(sup.lineId);
        const out = linePoints.get(sup.lineId);
        if (line && out) pointOnLine(line, sup.s, k === 0 ? t.ra : t.rb, out);
      });
    }
  }
  const lines = new Map<string, BeamLoad[]>();
  for (const [id, pc] of linePieces) lines.set(id, mergePieces(pc, linePoints.get(id) as BeamLoad[]));
  return { lines, secondaries, panels };
}

export interface LevelInput {
  kind: 'floor' | 'roof';
  slabThicknessMm: number;
  superimposedDeadKPa: number;
  liveKPa: number;
  wallLoadKNPerM: number;
  unitWeightKNm3: number;
  /** depth assumed for self-weight per line id, mm */
  lineDepthMm: Map<string, number>;
  secondaryDepthMm: Map<string, number>;
  secondaryWidthMm: Map<string, number>;
}

/** Loads of one level: slab intensities (kPa) for the shapes, and the other dead loads (kN, kN/m) per line. */
export function levelLoads(layout: Layout, shapes: SlabShapes, inp: LevelInput): LevelLoads {
  const t = inp.slabThicknessMm / 1000;
  const slabDead = t * inp.unitWeightKNm3 + inp.superimposedDeadKPa;
  const live = inp.liveKPa;
  const extraDead = new Map<string, BeamLoad[]>();
  for (const l of layout.lines) {
    const dead: BeamLoad[] = [];
    const depth = inp.lineDepthMm.get(l.id) ?? 450;
    const sw = (l.widthMm / 1000) * Math.max(depth / 1000 - t, 0) * inp.unitWeightKNm3;
    const wall = inp.kind === 'floor' && l.wallThicknessMm > 0 ? inp.wallLoadKNPerM : 0;
    for (const m of l.members) {
      const w = sw + (m.kind === 'cantilever' ? 0 : wall);
      if (w > 0) dead.push({ kind: 'linear', member: m.index, fromM: 0, toM: m.lengthM, startKNPerM: w, endKNPerM: w });
    }
    extraDead.set(l.id, dead);
  }
  const panels: PanelLoad[] = shapes.panels.map(({ panel: p, twoWay }) => {
    const w = slabDead + live;
    return {
      id: p.id,
      lxM: p.lx,
      lyM: p.ly,
      aspect: p.ly / p.lx,
      spanning: twoWay ? 'two-way' : 'one-way',
      deadKPa: slabDead,
      liveKPa: live,
      equivalent: twoWay ? twoWayEquivalentLoads(w, p.lx, p.ly) : { longBeamKNPerM: (w * p.lx) / 2 },
    };
  });
  const secondaries: SecondaryLoad[] = [];
  for (const s of layout.secondaries) {
    const sh = shapes.secondaries.get(s.beam.id) as { shape: BeamLoad[]; reactions: [number, number] };
    const b = (s.beam.widthMm ?? inp.secondaryWidthMm.get(s.beam.id) ?? 230) / 1000;
    const d = (s.beam.depthMm ?? inp.secondaryDepthMm.get(s.beam.id) ?? 400) / 1000;
    const own =
      b * Math.max(d - t, 0) * inp.unitWeightKNm3 +
      (inp.kind === 'floor' && s.beam.carriesWall ? inp.wallLoadKNPerM : 0);
    const ownR = (own * s.lengthM) / 2;
    const deadReactions: [number, number] = [slabDead * sh.reactions[0] + ownR, slabDead * sh.reactions[1] + ownR];
    const liveReactions: [number, number] = [live * sh.reactions[0], live * sh.reactions[1]];
    secondaries.push({ id: s.beam.id, lengthM: s.lengthM, deadReactions, liveReactions });
    if (s.supports.length === 2 && ownR > 0) {
      s.supports.forEach((sup) => {
        const line = layout.lineById.get(sup.lineId);
        const out = extraDead.get(sup.lineId);
        if (line && out) pointOnLine(line, sup.s, ownR, out);
      });
    }
  }
  return { kind: inp.kind, slabDeadKPa: slabDead, liveKPa: live, extraDead, secondaries, panels };
}
