import { schemeSchema } from '@trabeate/contracts';
import { analyseScheme, demoSchemeVariant } from '@trabeate/structural';
import { markerPoint, planGeometry } from './plan-geometry';

describe('plan geometry', () => {
  const doc = schemeSchema.parse(demoSchemeVariant());
  const g = planGeometry(doc);

  it("places every beam span the engine names between two columns (the member ids agree with the engine's)", () => {
    const engine = analyseScheme(demoSchemeVariant());
    const spans = engine.beamLines
      .filter((l) => l.level === 'roof')
      .flatMap((l) => l.members.map((m) => m.id))
      .filter((id) => !id.includes('end'));
    expect(spans.length).toBeGreaterThan(20);
    for (const id of spans) expect({ id, placed: g.at.has(id) }).toEqual({ id, placed: true });
    expect(g.beams.map((b) => b.id).sort()).toEqual([...new Set(spans)].sort());
  });

  it('lets the left-out column leave one two-bay span on its lines', () => {
    // demo variant: column B3 left out, so line B spans from B2 (y 4.2) to B4 (y 12.2)
    const b = g.beams.find((x) => x.id === 'B-B/2-4');
    expect(b).toEqual(expect.objectContaining({ a: { x: 4.4, y: 4.2 }, b: { x: 4.4, y: 12.2 } }));
  });

  it('marks the property lines of the plot', () => {
    expect(g.boundary.filter((s) => s.property).map((s) => s.id)).toEqual(['boundary-0', 'boundary-3']);
  });

  it('puts a marker at the column when a check names a column and its grid line', () => {
    expect(markerPoint(doc, g, ['A1', '1'])).toEqual({ x: 0.2, y: 0.2 });
    expect(markerPoint(doc, g, ['B2', 'B4'])).toEqual({ x: 4.4, y: 8.2 });
    expect(markerPoint(doc, g, ['ST1'])).toBeNull();
  });
});
