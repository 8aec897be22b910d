import { analyseScheme } from './analyse';
import { demoScheme, demoSchemeVariant } from './demo';
import { EngineMemo } from './memo';
import type { Scheme } from './model';

// Source of the expected values: none from outside, on purpose. The memo is a cache and changes no
// figure, so the reference is an independent path through the engine: the same scheme analysed
// afresh, without a memo (analyseScheme's own figures are held to published values in
// analyse.spec.ts and envelope.spec.ts). Every result analysed with a memo kept across a run of
// edits must equal that fresh result to the last digit.
const fresh = (s: Scheme) => JSON.stringify(analyseScheme(s));

function edits(base: Scheme): Scheme[] {
  const moved = structuredClone(base);
  moved.columns[1].x += 0.35;
  const movedBack = structuredClone(base);
  const heavier = structuredClone(base);
  heavier.basis.superimposedDeadKPa += 1.5;
  const section = structuredClone(moved);
  section.columns[2] = { ...section.columns[2], widthMm: 600, depthMm: 600 };
  const wall = structuredClone(base);
  wall.basis.wallLoadKNPerM += 4;
  return [base, moved, movedBack, heavier, section, wall, base];
}

describe('EngineMemo (beam-line envelopes kept between analyses of an edited scheme)', () => {
  it.each([
    ['the demo scheme', demoScheme()],
    ['its variant without a column', demoSchemeVariant()],
  ])('gives exactly the results of a fresh analysis through a run of edits to %s', (_name, base) => {
    const memo = new EngineMemo();
    for (const s of edits(base)) expect(JSON.stringify(analyseScheme(s, { memo }))).toBe(fresh(s));
  });

  it('reuses the lines an edit does not touch and recomputes those it does', () => {
    const memo = new EngineMemo();
    const [base, moved, movedBack, heavier] = edits(demoScheme());
    analyseScheme(base, { memo });
    const all = memo.last.computed;
    expect(all).toBeGreaterThan(0);
    expect(memo.last.reused).toBe(0);
    // one column moved: its lines change, the others are taken from the memo
    analyseScheme(moved, { memo });
    expect(memo.last.reused).toBeGreaterThan(0);
    expect(memo.last.computed).toBeGreaterThan(0);
    expect(memo.last.reused + memo.last.computed).toBe(all);
    // undone: everything was kept from the analysis before
    analyseScheme(movedBack, { memo });
    expect(memo.last).toEqual({ reused: all, computed: 0 });
    // more finishes on every level, roof included: no line's input is the same
    analyseScheme(heavier, { memo });
    expect(memo.last).toEqual({ reused: 0, computed: all });
  });

  it('keeps only what the newest analyses used', () => {
    const memo = new EngineMemo();
    const base = demoScheme();
    for (let k = 0; k < 6; k++) {
      const s = structuredClone(base);
      s.basis.superimposedDeadKPa += k;
      analyseScheme(s, { memo });
    }
    // two analyses' worth, each with every line on both level kinds
    expect(memo.size).toBe(2 * memo.last.computed);
  });

  it('is left as it was by a scheme with input problems', () => {
    const memo = new EngineMemo();
    analyseScheme(demoScheme(), { memo });
    const kept = memo.size;
    const broken = demoScheme();
    broken.basis.concreteMPa = -5;
    expect(analyseScheme(broken, { memo }).ok).toBe(false);
    expect(memo.size).toBe(kept);
  });
});
