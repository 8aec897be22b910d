// Every public function of the engine, driven with arbitrary input (fast-check): it returns
// problems or throws the one documented error type (StructuralInputError), never a TypeError
// or another crash, and a result it calls good holds no NaN or Infinity. Source: none needed —
// these are properties of the interface, not engineering values.
import fc from 'fast-check';
import * as E from './index';
import type { BeamModel, Scheme } from './index';

/** The path of the first number in v that is NaN or infinite, or null. */
function nonFinite(v: unknown, path = '$', seen = new Set<unknown>()): string | null {
  if (typeof v === 'number') return Number.isFinite(v) ? null : path;
  if (typeof v !== 'object' || v === null || seen.has(v)) return null;
  seen.add(v);
  if (v instanceof Map) return null;
  for (const [k, x] of Object.entries(v)) {
    const p = nonFinite(x, `${path}.${k}`, seen);
    if (p) return p;
  }
  return null;
}

/** Runs f: it may return, or throw StructuralInputError; anything else fails the property. */
function settles<T>(f: () => T): T | undefined {
  try {
    return f();
  } catch (e) {
    if (e instanceof E.StructuralInputError) {
      expect(e.problems.length).toBeGreaterThan(0);
      for (const p of e.problems) expect(typeof p.field).toBe('string');
      return undefined;
    }
    throw e;
  }
}

const num = fc.oneof(
  fc.double(),
  fc.constantFrom(NaN, Infinity, -Infinity, 0, -1, 1e-12, 1e12, 1e300),
  fc.double({ min: -1000, max: 1000, noNaN: true }),
);
const anything = fc.oneof(fc.jsonValue(), num, fc.constant(undefined), fc.constant(null));
const family = fc.oneof(
  fc.constantFrom('IS456', 'ACI318', 'EN1992'),
  fc.string(),
  fc.constant(undefined),
) as fc.Arbitrary<'IS456'>;
const condition = fc.oneof(
  fc.constantFrom('cantilever', 'simple', 'endSpan', 'interior'),
  fc.string(),
) as fc.Arbitrary<'simple'>;
const RUNS = { numRuns: 150 };

describe('every public function survives arbitrary input', () => {
  it('formula helpers: StructuralInputError or finite numbers', () => {
    fc.assert(
      fc.property(
        family,
        condition,
        num,
        num,
        num,
        num,
        num,
        num,
        num,
        fc.boolean(),
        (fam, cond, a, b, c, d, e, f, g, flag) => {
          for (const r of [
            settles(() => E.beamDepthRule(fam, cond, a, b)),
            settles(() => E.slabDepthRule(fam, flag, cond, a, b, c, d)),
            settles(() => E.limitingMomentKNm(fam, a, b, c, d, { alphaCc: flag ? e : undefined })),
            settles(() => E.columnCapacityKN(fam, a, b, c, d, e, flag ? { alphaCc: f, eccentricityMm: g } : undefined)),
            settles(() => E.concreteModulusMPa(fam, a)),
            settles(() => E.beamDepth(fam, cond, a, b, c, d, e, f)),
            settles(() => E.columnSize(fam, a, b, c, d, e, [f, g])),
            settles(() => E.twoWayEquivalentLoads(a, b, c)),
            settles(() => E.isolatedFooting(a, b, c, d)),
            settles(() => E.rectangularCombined(a, b, c, d, e, f)),
            settles(() => E.trapezoidalCombined(a, b, c, d, e, f, g)),
            settles(() => E.strapFooting(a, b, c, d, e, f, flag ? g : undefined)),
            settles(() => E.codeDefaults(fam)),
            settles(() => E.resolveLimits(fam, { beamSpanSimpleMaxM: a })),
          ])
            expect(nonFinite(r)).toBeNull();
        },
      ),
      { numRuns: 400 },
    );
  });

  it('beam builders and analyses: problems or StructuralInputError, never a TypeError; good results finite', () => {
    const model = fc.oneof(
      anything,
      fc.record({
        members: fc.array(fc.record({ lengthM: num, eiKNm2: num }), { maxLength: 5 }),
        supports: fc.array(fc.oneof(fc.constantFrom('pin', 'fixed', 'free'), fc.string()), { maxLength: 6 }),
      }),
      fc
        .array(fc.double({ min: 0.5, max: 10, noNaN: true }), { minLength: 1, maxLength: 5 })
        .map((spans) => E.continuousBeam({ spansM: spans, eiKNm2: 20000 })),
    ) as fc.Arbitrary<BeamModel>;
    const load = fc.oneof(
      anything,
      fc.record({ kind: fc.constant('point'), member: fc.oneof(fc.nat(6), num), atM: num, forceKN: num }),
      fc.record({
        kind: fc.constantFrom('linear', 'other'),
        member: fc.nat(6),
        fromM: num,
        toM: num,
        startKNPerM: num,
        endKNPerM: num,
      }),
    );
    const loads = fc.oneof(fc.array(load, { maxLength: 5 }), anything) as fc.Arbitrary<E.BeamLoad[]>;
    const combos = fc.oneof(
      fc.constant(E.codeDefaults('EN1992').combinations),
      fc.array(fc.record({ id: fc.string(), dead: num, live: num, source: fc.string() }), { maxLength: 2 }),
      anything,
    ) as fc.Arbitrary<E.Combination[]>;
    fc.assert(
      fc.property(model, loads, loads, combos, anything, (m, l1, l2, cs, opt) => {
        const a = E.analyseBeam(
          m,
          l1,
          (typeof opt === 'object' && opt !== null ? opt : {}) as { samplesPerMember?: number },
        );
        expect(a.caution).toBe(E.CAUTION);
        if (a.problems.length === 0) expect(nonFinite(a)).toBeNull();
        const env = E.envelopeBeam(m, l1, l2, cs);
        if (env.ok) expect(nonFinite(env)).toBeNull();
        else expect(env.problems.length).toBeGreaterThan(0);
        settles(() => E.loadPatterns(m));
        settles(() => E.continuousBeam(opt as Parameters<typeof E.continuousBeam>[0]));
        settles(() => E.splitChecks(opt as never));
      }),
      RUNS,
    );
  });

  it('scheme functions: validateScheme never throws; analyseScheme and compareSchemes return problems or finite results', () => {
    // the demo with one field replaced by an arbitrary value
    const fields: [string, string][] = [
      ['basis', 'imposedKPa'],
      ['basis', 'bearingPressureKPa'],
      ['basis', 'storeys'],
      ['basis', 'storeyHeightM'],
      ['basis', 'concreteMPa'],
      ['basis', 'steelMPa'],
      ['basis', 'slabThicknessMm'],
      ['basis', 'beamWidthMm'],
      ['basis', 'wallLoadKNPerM'],
      ['basis', 'alphaCc'],
      ['basis', 'codeFamily'],
    ];
    fc.assert(
      fc.property(fc.nat(fields.length - 1), fc.oneof(num, anything), fc.nat(19), num, (k, v, col, x) => {
        const s = E.demoScheme() as unknown as Record<string, any>;
        s[fields[k][0]][fields[k][1]] = v;
        s['columns'][col].x = typeof x === 'number' && Number.isFinite(x) ? s['columns'][col].x + (x % 40) : x;
        expect(Array.isArray(E.validateScheme(s))).toBe(true);
        const r = E.analyseScheme(s as Scheme);
        expect(r.caution).toBe(E.CAUTION);
        if (r.ok) expect(nonFinite(r)).toBeNull();
        else expect(r.problems.length).toBeGreaterThan(0);
        const c = E.compareSchemes(s as Scheme, E.demoScheme());
        if (c.ok) expect(nonFinite(c)).toBeNull();
      }),
      { numRuns: 40 },
    );
    fc.assert(
      fc.property(anything, anything, (a, b) => {
        expect(E.compareResults(a as never, b as never).ok).toBe(false);
        expect(E.analyseScheme(a as unknown as Scheme).ok).toBe(false);
      }),
      RUNS,
    );
  });

  it('physically absurd schemes are refused with the accepted range', () => {
    const with_ = (f: (s: Scheme) => void) => {
      const s = E.demoScheme();
      f(s);
      return E.analyseScheme(s);
    };
    // a million storeys; 1e12 kPa imposed load; 1e-12 kPa bearing pressure
    for (const [r, path] of [
      [with_((s) => (s.basis.storeys = 1e6)), 'basis.storeys'],
      [with_((s) => (s.basis.imposedKPa = 1e12)), 'basis.imposedKPa'],
      [with_((s) => (s.basis.bearingPressureKPa = 1e-12)), 'basis.bearingPressureKPa'],
    ] as const) {
      expect(r.ok).toBe(false);
      expect(r.problems).toEqual([
        expect.objectContaining({ path, message: expect.stringMatching(/accepted: [-0-9.e]+ to [0-9.e]+/) }),
      ]);
    }
    // columns 40 m apart on a line: a span beyond what the engine plans
    const far = with_((s) => s.columns.filter((c) => c.id.startsWith('D')).forEach((c) => (c.x = 60)));
    expect(far.ok).toBe(false);
    expect(far.problems[0]).toMatchObject({ field: 'span', message: expect.stringMatching(/accepted: up to 30 m/) });
  });

  it('analyseBeam names the field for null loads, an empty model, an unknown support and a bad cantilever', () => {
    const m = E.continuousBeam({ spansM: [4] });
    expect(E.analyseBeam(m, null as never).problems).toEqual([expect.objectContaining({ path: 'loads' })]);
    expect(E.analyseBeam({} as BeamModel, []).problems).toEqual(
      expect.arrayContaining([expect.objectContaining({ path: 'members' })]),
    );
    expect(E.analyseBeam({ ...m, supports: ['pin', 'roller' as 'pin'] }, []).problems).toEqual([
      expect.objectContaining({ path: 'supports[1]' }),
    ]);
    expect(() => E.continuousBeam({ spansM: [4], leftCantileverM: -1 })).toThrow(E.StructuralInputError);
    expect(() => E.continuousBeam({ spansM: [4], rightCantileverM: NaN })).toThrow(/rightCantileverM/);
  });
});
