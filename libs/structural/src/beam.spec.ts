import { analyseBeam, continuousBeam, pointLoad, uniformLoad, BeamModel, BeamLoad } from './beam';

// Handbook sources:
//  [T3-23] AISC Steel Construction Manual, Table 3-23 "Shears, Moments and Deflections" (cited by case title)
//  [Hicks] T. Hicks, Civil Engineering Formulas, Table 2.1 (continuous beams of equal spans, uniform load)
const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-9);
const within = (a: number, b: number, tol = 0.005) => expect(rel(a, b)).toBeLessThanOrEqual(tol);

const EI = 20000; // kN·m²
const w = 10; // kN/m
const L = 4; // m
const P = 50; // kN

describe('single spans against handbook cases', () => {
  it('simple span, uniform load [T3-23 "Simple beam – uniformly distributed load"]', () => {
    const r = analyseBeam(continuousBeam({ spansM: [L], eiKNm2: EI }), [uniformLoad(0, w, L)]);
    expect(r.problems).toEqual([]);
    expect(r.caution).toMatch(/licensed structural engineer/);
    within(r.reactions[0].forceKN, (w * L) / 2);
    within(r.members[0].maxMoment.valueKNm, (w * L * L) / 8);
    within(r.members[0].maxMoment.atM, L / 2);
    within(r.members[0].maxDeflection.valueMm / 1000, (5 * w * L ** 4) / (384 * EI));
  });

  it('simple span, central point load [T3-23 "Simple beam – concentrated load at center"]', () => {
    const r = analyseBeam(continuousBeam({ spansM: [L], eiKNm2: EI }), [pointLoad(0, L / 2, P)]);
    within(r.reactions[1].forceKN, P / 2);
    within(r.members[0].maxMoment.valueKNm, (P * L) / 4);
    within(r.members[0].maxDeflection.valueMm / 1000, (P * L ** 3) / (48 * EI));
  });

  it('simple span, point load at any point [T3-23 "Simple beam – concentrated load at any point"]', () => {
    const a = 1.2;
    const b = L - a;
    const r = analyseBeam(continuousBeam({ spansM: [L], eiKNm2: EI }), [pointLoad(0, a, P)]);
    within(r.reactions[0].forceKN, (P * b) / L);
    within(r.members[0].maxMoment.valueKNm, (P * a * b) / L);
    within(r.members[0].maxMoment.atM, a);
  });

  it('fixed both ends, uniform load [T3-23 "Beam fixed at both ends – uniformly distributed load"]', () => {
    const r = analyseBeam(continuousBeam({ spansM: [L], eiKNm2: EI, leftEnd: 'fixed', rightEnd: 'fixed' }), [
      uniformLoad(0, w, L),
    ]);
    within(r.members[0].startMomentKNm, (-w * L * L) / 12);
    within(r.members[0].endMomentKNm, (-w * L * L) / 12);
    within(r.members[0].maxMoment.valueKNm, (w * L * L) / 24);
    within(r.members[0].maxDeflection.valueMm / 1000, (w * L ** 4) / (384 * EI));
    within(r.reactions[0].momentKNm, (w * L * L) / 12);
  });

  it('fixed both ends, central point load [T3-23 "Beam fixed at both ends – concentrated load at center"]', () => {
    const r = analyseBeam(continuousBeam({ spansM: [L], eiKNm2: EI, leftEnd: 'fixed', rightEnd: 'fixed' }), [
      pointLoad(0, L / 2, P),
    ]);
    within(r.members[0].startMomentKNm, (-P * L) / 8);
    within(r.members[0].maxMoment.valueKNm, (P * L) / 8);
    within(r.members[0].maxDeflection.valueMm / 1000, (P * L ** 3) / (192 * EI));
  });

  it('fixed both ends, point load at any point [T3-23 "Beam fixed at both ends – concentrated load at any point"]', () => {
    const a = 1.5;
    const b = L - a;
    const r = analyseBeam(continuousBeam({ spansM: [L], eiKNm2: EI, leftEnd: 'fixed', rightEnd: 'fixed' }), [
      pointLoad(0, a, P),
    ]);
    within(-r.members[0].startMomentKNm, (P * a * b * b) / (L * L));
    within(-r.members[0].endMomentKNm, (P * a * a * b) / (L * L));
  });

  it('propped cantilever, uniform load [T3-23 "Beam fixed at one end, supported at other – uniformly distributed load"]', () => {
    const r = analyseBeam(continuousBeam({ spansM: [L], eiKNm2: EI, leftEnd: 'fixed', rightEnd: 'pin' }), [
      uniformLoad(0, w, L),
    ]);
    within(r.reactions[1].forceKN, (3 * w * L) / 8);
    within(r.reactions[0].forceKN, (5 * w * L) / 8);
    within(-r.members[0].startMomentKNm, (w * L * L) / 8);
    within(r.members[0].maxMoment.valueKNm, (9 * w * L * L) / 128);
    within(L - r.members[0].maxMoment.atM, (3 * L) / 8); // 3L/8 from the pin
  });

  it('propped cantilever, central point load [T3-23 "Beam fixed at one end, supported at other – concentrated load at center"]', () => {
    const r = analyseBeam(continuousBeam({ spansM: [L], eiKNm2: EI, leftEnd: 'fixed' }), [pointLoad(0, L / 2, P)]);
    within(r.reactions[1].forceKN, (5 * P) / 16);
    within(r.reactions[0].forceKN, (11 * P) / 16);
    within(-r.members[0].startMomentKNm, (3 * P * L) / 16);
    within(r.members[0].maxMoment.valueKNm, (5 * P * L) / 32);
  });

  it('cantilever, uniform load and tip load [T3-23 "Cantilever beam – uniformly distributed load" and "– concentrated load at free end"]', () => {
    const m: BeamModel = { members: [{ lengthM: L, eiKNm2: EI }], supports: ['fixed', 'free'] };
    const u = analyseBeam(m, [uniformLoad(0, w, L)]);
    within(-u.members[0].startMomentKNm, (w * L * L) / 2);
    within(u.nodes[1].deflectionMm / 1000, (w * L ** 4) / (8 * EI));
    const t = analyseBeam(m, [pointLoad(0, L, P)]);
    within(-t.members[0].startMomentKNm, P * L);
    within(t.nodes[1].deflectionMm / 1000, (P * L ** 3) / (3 * EI));
    expect(Math.abs(t.members[0].endMomentKNm)).toBeLessThan(1e-9);
  });
});

describe('continuous beams against handbook coefficients', () => {
  it('two equal spans, uniform on both [T3-23 "Continuous beam – two equal spans – uniform load"]: R 15, 50, 15 kN; M −20 kN·m', () => {
    const r = analyseBeam(continuousBeam({ spansM: [L, L], eiKNm2: EI }), [uniformLoad(0, w, L), uniformLoad(1, w, L)]);
    [15, 50, 15].forEach((v, i) => within(r.reactions[i].forceKN, v));
    within(r.members[0].endMomentKNm, -20);
    within(r.members[0].maxMoment.valueKNm, 0.0703 * w * L * L);
    within(r.members[0].maxMoment.atM, 0.375 * L);
  });

  it('two equal spans, uniform on one span (derived by three-moment equation): R 0.4375, 0.625, −0.0625 wL; M −wL²/16', () => {
    const r = analyseBeam(continuousBeam({ spansM: [L, L], eiKNm2: EI }), [uniformLoad(0, w, L)]);
    [0.4375, 0.625, -0.0625].forEach((c, i) => within(r.reactions[i].forceKN, c * w * L));
    within(r.members[0].endMomentKNm, (-w * L * L) / 16);
  });

  it('two equal spans, central point load on each [T3-23 "Continuous beam – two equal spans – concentrated load at center of each span"]', () => {
    const r = analyseBeam(continuousBeam({ spansM: [L, L], eiKNm2: EI }), [
      pointLoad(0, L / 2, P),
      pointLoad(1, L / 2, P),
    ]);
    [5 / 16, 22 / 16, 5 / 16].forEach((c, i) => within(r.reactions[i].forceKN, c * P));
    within(r.members[0].endMomentKNm, (-3 * P * L) / 16);
  });

  it('three equal spans, uniform on all [Hicks Table 2.1]: R 16, 44, 44, 16 kN; M −16 kN·m; span moments 0.080 and 0.025 wL²', () => {
    const r = analyseBeam(
      continuousBeam({ spansM: [L, L, L], eiKNm2: EI }),
      [0, 1, 2].map((i) => uniformLoad(i, w, L)),
    );
    [16, 44, 44, 16].forEach((v, i) => within(r.reactions[i].forceKN, v));
    within(r.members[0].endMomentKNm, -16);
    within(r.members[1].endMomentKNm, -16);
    within(r.members[0].maxMoment.valueKNm, 0.08 * w * L * L);
    within(r.members[0].maxMoment.atM, 0.4 * L);
    within(r.members[1].maxMoment.valueKNm, 0.025 * w * L * L);
  });

  it('spans of 4 m and 6 m under 10 kN/m give −35 kN·m over the middle support (derived, three-moment equation)', () => {
    const r = analyseBeam(continuousBeam({ spansM: [4, 6], eiKNm2: EI }), [uniformLoad(0, w, 4), uniformLoad(1, w, 6)]);
    within(r.members[0].endMomentKNm, -35);
  });

  it('a cantilever end carries its statically known moment to the support (derived: w·a²/2)', () => {
    const r = analyseBeam(continuousBeam({ spansM: [L], eiKNm2: EI, rightCantileverM: 1.5 }), [uniformLoad(1, w, 1.5)]);
    within(r.members[0].endMomentKNm, (-w * 1.5 * 1.5) / 2);
    within(r.reactions[1].forceKN, w * 1.5 + (w * 1.5 * 1.5) / 2 / L);
  });

  it('partial uniform and linearly varying loads balance (statics)', () => {
    const loads: BeamLoad[] = [
      { kind: 'linear', member: 0, fromM: 1, toM: 3, startKNPerM: 0, endKNPerM: 12 },
      { kind: 'linear', member: 1, fromM: 0.5, toM: 2, startKNPerM: 5, endKNPerM: 5 },
    ];
    const r = analyseBeam(continuousBeam({ spansM: [L, L], eiKNm2: EI }), loads);
    within(
      r.reactions.reduce((a, x) => a + x.forceKN, 0),
      12 + 7.5,
      1e-9,
    );
  });
});

describe('input problems', () => {
  it('when a load is off its member, it reports the load and field instead of throwing', () => {
    const r = analyseBeam(continuousBeam({ spansM: [L] }), [pointLoad(0, 9, 10)]);
    expect(r.problems).toEqual([expect.objectContaining({ path: 'loads[0].atM', field: 'atM' })]);
  });
  it('when supports form a mechanism, it says so', () => {
    const r = analyseBeam({ members: [{ lengthM: 3, eiKNm2: 1 }], supports: ['pin', 'free'] }, [pointLoad(0, 3, 1)]);
    expect(r.problems[0].message).toMatch(/mechanism/);
  });
});
