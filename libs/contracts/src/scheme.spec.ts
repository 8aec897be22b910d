import { demoScheme, demoSchemeVariant, Scheme } from '@trabeate/structural';
import { schemeSchema, SchemeDocument } from './scheme';

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
});
