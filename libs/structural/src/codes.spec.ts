import { beamDepthRule, codeDefaults, columnCapacityKN, limitingMomentKNm, resolveLimits, slabDepthRule } from './codes';

const close = (a: number, b: number, tol: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(tol);

describe('span/depth limits per code family', () => {
  it('IS 456:2000 cl. 23.2.1: cantilever 7, simply supported 20, continuous 26', () => {
    expect(beamDepthRule('IS456', 'cantilever', 3, 415).ratio).toBe(7);
    expect(beamDepthRule('IS456', 'simple', 6, 415).ratio).toBe(20);
    expect(beamDepthRule('IS456', 'interior', 6, 415).ratio).toBe(26);
    expect(beamDepthRule('IS456', 'endSpan', 6, 415).ratio).toBe(26);
    expect(beamDepthRule('IS456', 'simple', 5, 415).requiredMm).toBeCloseTo(250, 6);
  });
  it('IS 456:2000 cl. 23.2.1(b): a 12 m continuous beam gives 26 × 10/12 = 21.67 (derived)', () => {
    close(beamDepthRule('IS456', 'interior', 12, 415).ratio, 21.67, 0.005);
  });
  it('ACI 318-19 Table 9.3.1.1: 6.0 m simply supported beam, fy 420, needs 375 mm (derived)', () => {
    const r = beamDepthRule('ACI318', 'simple', 6, 420);
    close(r.requiredMm, 375, 1e-9);
    expect(r.measure).toBe('overall');
    close(beamDepthRule('ACI318', 'cantilever', 2, 420).requiredMm, 250, 1e-9); // l/8
  });
  it('ACI 318-19 Table 7.3.1.1: 4.2 m one-way slab continuous both ends, fy 420, needs 150 mm (derived)', () => {
    close(slabDepthRule('ACI318', true, 'interior', 4.2, 10, 420, 25).requiredMm, 150, 1e-9);
  });
  it('ACI 318-19 Table 7.3.1.1 modifier (0.4 + fy/700) for other steel', () => {
    close(slabDepthRule('ACI318', true, 'simple', 4, 10, 280, 25).requiredMm, (4000 / 20) * (0.4 + 280 / 700), 1e-9);
  });
  it('EN 1992-1-1 Table 7.4N: K 1.0 / 1.3 / 1.5 / 0.4 order the ratios simply supported < end < interior, cantilever lowest', () => {
    const s = beamDepthRule('EN1992', 'simple', 6, 500).ratio;
    const e = beamDepthRule('EN1992', 'endSpan', 6, 500).ratio;
    const i = beamDepthRule('EN1992', 'interior', 6, 500).ratio;
    const c = beamDepthRule('EN1992', 'cantilever', 6, 500).ratio;
    close(e / s, 1.3, 0.03);
    close(i / s, 1.5, 0.08);
    close(c / s, 0.4, 0.03);
  });
});

describe('capacities', () => {
  it('IS 456 cl. 39.3: 400 × 400, M20, Fe 415, 1 % steel gives Pu = 1712.1 kN (derived, reference §2)', () => {
    close(columnCapacityKN('IS456', 400, 400, 20, 415, 0.01).value, 1712.1, 0.05);
  });
  it('ACI 318-19 §22.4.2: 400 × 400, f′c 28, fy 420, 1 %: φ·0.80·Po = 2309.8 kN (derived)', () => {
    // Po = 0.85·28·(160 000 − 1 600) + 420·1 600 = 4 441 920 N
    close(columnCapacityKN('ACI318', 400, 400, 28, 420, 0.01).value, 0.65 * 0.8 * 4441.92, 0.01);
  });
  it('EN 1992-1-1 §3.1.6: 400 × 400, fck 30, fyk 500, 1 %: fcd·Ac + fyd·As (derived)', () => {
    close(columnCapacityKN('EN1992', 400, 400, 30, 500, 0.01).value, (0.85 * 30 / 1.5) * 158.4 + (500 / 1.15) * 1.6, 0.01);
  });
  it('IS 456 Annex G: b 300, d 500, M20, Fe 415 gives Mu,lim = 207.0 kN·m; k = 0.148, 0.138, 0.133', () => {
    close(limitingMomentKNm('IS456', 300, 500, 20, 415).value, 207.0, 0.05);
    expect(limitingMomentKNm('IS456', 1, 1, 20, 250).coefficient).toBe(0.148);
    expect(limitingMomentKNm('IS456', 1, 1, 20, 415).coefficient).toBe(0.138);
    expect(limitingMomentKNm('IS456', 1, 1, 20, 500).coefficient).toBe(0.133);
  });
  it('ACI 318-19 tension-controlled limit, b 300, d 500, f′c 28 (β1 0.85): φMn = 430.5 kN·m (derived)', () => {
    close(limitingMomentKNm('ACI318', 300, 500, 28, 420).value, 430.46, 0.05);
  });
  it('EN 1992-1-1 x/d = 0.45 gives K′ ≈ 0.167 (derived)', () => {
    close(limitingMomentKNm('EN1992', 1, 1, 30, 500).coefficient, 0.167, 0.0005);
  });
});

describe('load combinations', () => {
  it('IS 456 Table 18: 1.5 (DL + IL)', () => {
    expect(codeDefaults('IS456').combinations).toEqual([expect.objectContaining({ dead: 1.5, live: 1.5 })]);
  });
  it('ASCE 7-22 §2.3.1: 1.4D and 1.2D + 1.6L', () => {
    const c = codeDefaults('ACI318').combinations;
    expect(c.map((x) => [x.dead, x.live])).toEqual([[1.4, 0], [1.2, 1.6]]);
  });
  it('EN 1990 eq. 6.10a/6.10b: Gk 10, Qk 5 give 18.75 and 18.98; 6.10b governs the pair', () => {
    const [a, b] = codeDefaults('EN1992').combinations;
    close(a.dead * 10 + a.live * 5, 18.75, 1e-9);
    close(b.dead * 10 + b.live * 5, 18.975, 1e-9);
  });
});

describe('limits', () => {
  it('marks common-practice limits as such and keeps code clauses as sources', () => {
    const l = codeDefaults('IS456').limits;
    expect(l.beamSpanSimpleMaxM).toMatchObject({ value: 6, kind: 'practice' });
    expect(l.beamSpanSimpleMaxM.source).toMatch(/common practice/);
    expect(l.columnSteelRatioMin).toMatchObject({ value: 0.008, kind: 'code', source: expect.stringMatching(/26\.5\.3\.1/) });
    expect(codeDefaults('ACI318').limits.stairRiserMaxMm).toMatchObject({ value: 178, source: expect.stringMatching(/IBC 2015 §1011\.5\.2/) });
  });
  it('a project override replaces the value and says where the default came from', () => {
    const l = resolveLimits('IS456', { beamSpanContinuousMaxM: 9, notALimit: 3 });
    expect(l.beamSpanContinuousMaxM).toMatchObject({ value: 9, kind: 'project' });
    expect(l.beamSpanContinuousMaxM.source).toMatch(/default 8 m/);
  });
});
