import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { analyseScheme } from './analyse';
import { demoScheme, demoSchemeVariant } from './demo';
import type { CodeFamily, Scheme } from './model';

/**
 * The library's README promises, per rule and code family, the source kind each check reports
 * "exactly as the code sets it". This reads that table and holds every check the engine reports
 * on a set of varied schemes to it, so the README cannot drift from the code.
 */
const FAMILIES: CodeFamily[] = ['IS456', 'ACI318', 'EN1992'];
const KINDS = ['code', 'practice', 'memory', 'derived', 'project', 'handbook'] as const;

function readmeTable(): Map<string, Record<CodeFamily, string>> {
  const text = readFileSync(join(__dirname, '..', 'README.md'), 'utf8');
  const start = text.indexOf('The source kind each reports');
  expect(start).toBeGreaterThan(0);
  const rows = text
    .slice(start)
    .split('\n')
    .filter((l) => l.startsWith('| `'));
  const table = new Map<string, Record<CodeFamily, string>>();
  for (const row of rows) {
    const cells = row.split('|').map((c) => c.trim());
    // | rule | what is compared | IS456 | ACI318 | EN1992 |
    const [, rules, , is, aci, en] = cells;
    for (const [, rule] of rules.matchAll(/`([a-z0-9.-]+)`/g)) {
      const before = table.get(rule);
      // A rule split over two rows (stair.riser max and min) may report either row's kind.
      table.set(rule, {
        IS456: `${before?.IS456 ?? ''} ${is}`,
        ACI318: `${before?.ACI318 ?? ''} ${aci}`,
        EN1992: `${before?.EN1992 ?? ''} ${en}`,
      });
    }
  }
  return table;
}

function inFamily(s: Scheme, codeFamily: CodeFamily): Scheme {
  return { ...s, basis: { ...s.basis, codeFamily } };
}

/** The demo schemes, plus given slab and beam depths and stair flights, so most rules report. */
function varied(): Scheme[] {
  const given = demoScheme();
  given.basis = { ...given.basis, slabThicknessMm: 110 };
  given.grid = given.grid.map((g, i) => ({ ...g, beamDepthMm: i % 2 ? 300 : 700 }));
  given.stairs = [
    { id: 'F1', riserMm: 185, treadMm: 250, risers: 18, widthM: 1, use: 'residential' },
    { id: 'F2', riserMm: 140, treadMm: 320, risers: 8, widthM: 1.2, use: 'other' },
  ];
  return [demoScheme(), demoSchemeVariant(), given];
}

describe('the README’s source-kind table (libs/structural/README.md)', () => {
  const table = readmeTable();

  it.each(FAMILIES)('lists, for %s, the source kind of every check the engine reports', (family) => {
    const seen = new Set<string>();
    for (const scheme of varied()) {
      const r = analyseScheme(inFamily(scheme, family));
      // Failures in full, passes as each rule's tightest: both report their source kind.
      for (const c of [...r.checks, ...r.passed.map((p) => p.tightest)]) {
        seen.add(c.ruleId);
        const row = table.get(c.ruleId);
        expect({ rule: c.ruleId, listed: row !== undefined }).toEqual({ rule: c.ruleId, listed: true });
        const cell = row![family];
        const kindsInCell = KINDS.filter((k) => new RegExp(`\\b${k}\\b`).test(cell));
        expect({ rule: c.ruleId, kind: c.sourceKind, cell: kindsInCell.includes(c.sourceKind) }).toEqual({
          rule: c.ruleId,
          kind: c.sourceKind,
          cell: true,
        });
      }
    }
    // The schemes exercise most of the table, so the comparison means something.
    expect(seen.size).toBeGreaterThanOrEqual(12);
  });
});
