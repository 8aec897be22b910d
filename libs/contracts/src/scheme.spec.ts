import {
  codeDefaults,
  demoScheme,
  demoSchemeVariant,
  LIMIT_KEYS,
  Scheme,
  SCHEME_LIMITS,
  SOURCE_KINDS,
  validateScheme,
} from '@trabeate/structural';
import { schemeCheckSchema, sourceKindSchema } from './schemes';
import { SCHEME_DOCUMENT_LIMITS, schemeSchema, SchemeDocument } from './scheme';

// The contract and the engine describe the same document: a parsed scheme is an engine scheme.
const asEngine = (d: SchemeDocument): Scheme => d;

describe('scheme contract', () => {
  it('accepts the demo schemes unchanged', () => {
    for (const s of [demoScheme(), demoSchemeVariant()]) {
      const parsed = schemeSchema.parse(s);
      expect(asEngine(parsed)).toEqual(s);
    }
  });
  it('rejects a grid line with both x and y, naming where', () => {
    const s = demoScheme();
    s.grid[0].y = 2;
    const r = schemeSchema.safeParse(s);
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual(['grid', 0, 'x']);
  });
  it('rejects duplicate column ids, an unknown code family and a bad orientation', () => {
    const s = demoScheme() as unknown as Record<string, any>;
    s['columns'][1].id = s['columns'][0].id;
    expect(schemeSchema.safeParse(s).success).toBe(false);
    const t = demoScheme() as unknown as Record<string, any>;
    t['basis'].codeFamily = 'XX';
    expect(schemeSchema.safeParse(t).error?.issues[0].path).toEqual(['basis', 'codeFamily']);
    const u = demoScheme() as unknown as Record<string, any>;
    u['columns'][0].orientationDeg = 45;
    expect(schemeSchema.safeParse(u).error?.issues[0].path).toEqual(['columns', 0, 'orientationDeg']);
  });
  it('rejects a property line beyond the boundary and an unknown schema version', () => {
    const s = demoScheme() as unknown as Record<string, any>;
    s['boundary'].propertyLines = [7];
    expect(schemeSchema.safeParse(s).success).toBe(false);
    expect(schemeSchema.safeParse({ ...demoScheme(), schemaVersion: 3 }).success).toBe(false);
    expect(schemeSchema.safeParse({ ...demoScheme(), schemaVersion: 1 }).success).toBe(false);
  });
  it('reads a document without footing choices as having none, and refuses two choices for one column or a blank reason', () => {
    const { footingChoices: _none, ...bare } = demoScheme();
    expect(schemeSchema.parse(bare).footingChoices).toEqual([]);
    const one = { columnId: 'A1', option: 'strap', reason: 'Strap keeps the edge pad inside the plot.' };
    expect(schemeSchema.safeParse({ ...demoScheme(), footingChoices: [one] }).success).toBe(true);
    const twice = schemeSchema.safeParse({ ...demoScheme(), footingChoices: [one, { ...one, option: 'shift' }] });
    expect(twice.error?.issues[0].path).toEqual(['footingChoices']);
    const blank = schemeSchema.safeParse({ ...demoScheme(), footingChoices: [{ ...one, reason: '   ' }] });
    expect(blank.error?.issues[0].path).toEqual(['footingChoices', 0, 'reason']);
    const unknown = schemeSchema.safeParse({ ...demoScheme(), footingChoices: [{ ...one, option: 'raft' }] });
    expect(unknown.error?.issues[0].path).toEqual(['footingChoices', 0, 'option']);
  });

  describe('carries the engine’s bounds', () => {
    // [path, the largest value the engine accepts, a value beyond it]; the numbers are the
    // engine's (validateScheme), and each case checks that the engine and the schema agree
    const cases: [(string | number)[], number, number][] = [
      [['basis', 'imposedKPa'], 50, 50.5],
      [['basis', 'roofImposedKPa'], 50, 51],
      [['basis', 'superimposedDeadKPa'], 50, 51],
      [['basis', 'wallLoadKNPerM'], 200, 201],
      [['basis', 'bearingPressureKPa'], 10000, 1e12],
      [['basis', 'foundingDepthM'], 50, 51],
      [['basis', 'storeyHeightM'], 20, 21],
      [['basis', 'slabThicknessMm'], 1500, 1501],
      [['basis', 'beamWidthMm'], 3000, 3001],
      [['basis', 'rates', 'steelPerKg'], 1e9, 2e9],
      [['basis', 'limitOverrides', LIMIT_KEYS[0]], 1e6, 2e6],
      [['boundary', 'vertices', 1, 'x'], 5000, 5001],
      [['boundary', 'vertices', 1, 'y'], -5000, -5001],
      [['grid', 0, 'x'], 5000, 5001],
      [['grid', 5, 'overhangEndM'], 10, 11],
      [['grid', 0, 'wallThicknessMm'], 1000, 1001],
      [['grid', 0, 'beamDepthMm'], 5000, 5001],
      [['columns', 0, 'y'], 5000, 5001],
      [['columns', 0, 'widthMm'], 5000, 5001],
      [['secondaryBeams', 0, 'start', 'x'], 5000, 5001],
      [['secondaryBeams', 0, 'depthMm'], 5000, 5001],
      [['stairs', 0, 'riserMm'], 400, 401],
      [['stairs', 0, 'treadMm'], 1000, 1001],
      [['stairs', 0, 'risers'], 100, 101],
      [['stairs', 0, 'widthM'], 20, 21],
    ];
    const withValue = (path: (string | number)[], v: number): Record<string, unknown> => {
      const s = demoScheme() as unknown as Record<string, any>;
      let o = s;
      for (const k of path.slice(0, -1)) o = o[k] ??= {};
      o[path[path.length - 1]] = v;
      return s;
    };
    // the engine names a place as basis.rates.steelPerKg or grid[5].overhangEndM
    const enginePath = (path: (string | number)[]) =>
      path.map((k, i) => (typeof k === 'number' ? `[${k}]` : i === 0 ? k : `.${k}`)).join('');
    it.each(cases)('%j: the engine’s largest value is accepted, one beyond is refused there', (path, max, beyond) => {
      const at = enginePath(path);
      const ok = withValue(path, max);
      expect(
        (schemeSchema.safeParse(ok).error?.issues ?? []).filter((i) => enginePath(i.path as never) === at),
      ).toEqual([]);
      expect(validateScheme(ok).filter((p) => p.path === at)).toEqual([]);
      const bad = withValue(path, beyond);
      expect(schemeSchema.safeParse(bad).error?.issues.map((i) => i.path)).toContainEqual(path);
      expect(validateScheme(bad).map((p) => p.path)).toContain(at);
    });
    // [path, the smallest value the engine accepts, a value below it]
    const floors: [(string | number)[], number, number][] = [
      [['columns', 0, 'widthMm'], 100, 99],
      [['columns', 0, 'depthMm'], 100, 99],
      [['secondaryBeams', 0, 'widthMm'], 100, 99],
      [['secondaryBeams', 0, 'depthMm'], 100, 99],
      [['stairs', 0, 'riserMm'], 50, 49],
      [['stairs', 0, 'treadMm'], 100, 99],
      [['stairs', 0, 'widthM'], 0.5, 0.49],
    ];
    it.each(floors)('%j: the engine’s smallest value is accepted, one below is refused there', (path, min, below) => {
      const at = enginePath(path);
      const ok = withValue(path, min);
      expect(
        (schemeSchema.safeParse(ok).error?.issues ?? []).filter((i) => enginePath(i.path as never) === at),
      ).toEqual([]);
      expect(validateScheme(ok).filter((p) => p.path === at)).toEqual([]);
      const bad = withValue(path, below);
      expect(schemeSchema.safeParse(bad).error?.issues.map((i) => i.path)).toContainEqual(path);
      expect(validateScheme(bad).map((p) => p.path)).toContain(at);
    });
    it('has the engine’s limits on loads, coordinates and counts', () => {
      expect(SCHEME_DOCUMENT_LIMITS).toEqual(SCHEME_LIMITS);
    });
    it('refuses more columns than the engine plans, naming the list', () => {
      const s = demoScheme();
      const over = Array.from({ length: SCHEME_LIMITS.columns + 1 }, (_, i) => ({
        ...s.columns[0],
        id: `K${i}`,
        x: i * 0.1,
      }));
      const r = schemeSchema.safeParse({ ...s, columns: over });
      expect(r.error?.issues.map((i) => i.path)).toContainEqual(['columns']);
      expect(validateScheme({ ...s, columns: over }).map((p) => p.path)).toContain('columns');
    });
  });

  it('names the same source kinds as the engine, a handbook table among them, and carries one through a check', () => {
    expect([...sourceKindSchema.options].sort()).toEqual([...SOURCE_KINDS].sort());
    expect(sourceKindSchema.options).toContain('handbook');
    // A limit read from a handbook table (the value here is illustrative, not a design value).
    const limit = { value: 2, unit: 'm', source: 'a design handbook, its table of spans', kind: 'handbook' as const };
    const parsed = schemeCheckSchema.parse({
      ruleId: 'beam.span',
      severity: 'warning',
      status: 'fail',
      elements: ['B1'],
      message: 'span',
      value: 2.5,
      limit: limit.value,
      unit: limit.unit,
      sense: 'max',
      source: limit.source,
      sourceKind: limit.kind,
    });
    expect(parsed).toMatchObject({ sourceKind: 'handbook', source: limit.source });
    // every default limit's kind is one the contract accepts
    for (const family of ['IS456', 'ACI318', 'EN1992'] as const)
      for (const l of Object.values(codeDefaults(family).limits)) expect(sourceKindSchema.options).toContain(l.kind);
  });
});
