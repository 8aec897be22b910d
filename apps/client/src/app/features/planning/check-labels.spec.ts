import { sourceKindSchema, type SchemeCheck } from '@trabeate/contracts';
import { numbersOf, SOURCE_KIND_LABELS } from './check-labels';

describe('check labels', () => {
  it('words every source kind the contract names, a handbook table apart from a code clause', () => {
    for (const kind of sourceKindSchema.options) expect(SOURCE_KIND_LABELS[kind]).toMatch(/\w/);
    expect(SOURCE_KIND_LABELS.handbook).toBe('handbook table');
    expect(new Set(Object.values(SOURCE_KIND_LABELS)).size).toBe(sourceKindSchema.options.length);
  });

  it('writes the numbers of a check with its unit and the sense of its limit', () => {
    const c = { value: 8.4, limit: 8, unit: 'm', sense: 'max' } as SchemeCheck;
    expect(numbersOf(c)).toBe('8.4 m against a limit of at most 8 m');
  });
});
