// Two schemes side by side: the figures that differ and the member types that drive the cost.
import { analyseScheme, SchemeResult } from './analyse';
import type { Severity } from './checks';
import { CAUTION } from './codes';
import type { Scheme } from './model';
import type { MemberType } from './quantities';

export interface SchemeComparison {
  caution: string;
  ok: boolean;
  a: { id: string; name: string; cost: number };
  b: { id: string; name: string; cost: number };
  currency: string;
  /** figures of both schemes with b − a */
  differences: { item: string; unit: string; a: number; b: number; delta: number }[];
  /** cost by member type, largest change first */
  costDrivers: { member: MemberType; a: number; b: number; delta: number }[];
  /** plain sentences naming what drives the difference */
  summary: string[];
  /** failed checks of each scheme by severity (all zero when the schemes could not be compared) */
  checkCounts: { a: Record<Severity, number>; b: Record<Severity, number> };
}

const NO_CHECKS = (): Record<Severity, number> => ({ error: 0, warning: 0, info: 0 });

/** Failed checks of one result, counted by the engine's severities. */
function failedBySeverity(r: SchemeResult): Record<Severity, number> {
  const n = NO_CHECKS();
  for (const c of r.checks) if (c.status === 'fail') n[c.severity]++;
  return n;
}

/** Words for each severity in the figures' item names (the screens use their own labels). */
const SEVERITY_ITEM: Record<Severity, string> = { error: 'errors', warning: 'warnings', info: 'notes' };

const fmt = (v: number, d = 0) => v.toLocaleString('en-GB', { maximumFractionDigits: d, minimumFractionDigits: d });

/** Compares two analysed schemes; costs in the schemes' currency, lengths m, depths mm. */
export function compareResults(ra: SchemeResult, rb: SchemeResult): SchemeComparison {
  // anything but two results of analyseScheme is refused as "not comparable", never a TypeError
  const usable = (r: unknown): r is SchemeResult => {
    const o = r as Partial<SchemeResult> | null;
    return (
      typeof o === 'object' &&
      o !== null &&
      typeof o.ok === 'boolean' &&
      typeof o.cost?.total === 'number' &&
      typeof o.summary === 'object' &&
      o.summary !== null
    );
  };
  if (!usable(ra) || !usable(rb))
    return {
      caution: CAUTION,
      ok: false,
      a: { id: '', name: '', cost: 0 },
      b: { id: '', name: '', cost: 0 },
      currency: '',
      differences: [],
      costDrivers: [],
      summary: ['Both arguments must be results of analyseScheme.'],
      checkCounts: { a: NO_CHECKS(), b: NO_CHECKS() },
    };
  const base = {
    caution: CAUTION,
    a: { id: ra.schemeId, name: ra.schemeName, cost: ra.cost.total },
    b: { id: rb.schemeId, name: rb.schemeName, cost: rb.cost.total },
    currency: ra.cost.currency,
  };
  if (!ra.ok || !rb.ok)
    return {
      ...base,
      ok: false,
      differences: [],
      costDrivers: [],
      summary: ['One of the schemes has input problems; fix them to compare.'],
      checkCounts: { a: NO_CHECKS(), b: NO_CHECKS() },
    };
  const row = (item: string, unit: string, a: number, b: number) => ({ item, unit, a, b, delta: b - a });
  const maxCol = (r: SchemeResult) => r.sizes.columns.reduce((m, c) => Math.max(m, c.requiredSideMm[0] ?? 0), 0);
  const checkCounts = { a: failedBySeverity(ra), b: failedBySeverity(rb) };
  const concrete = (r: SchemeResult, m: MemberType) => r.quantities.rows.find((x) => x.member === m)?.concreteM3 ?? 0;
  const differences = [
    row('columns', 'no.', ra.summary.columns, rb.summary.columns),
    row('beam spans', 'no.', ra.summary.beamSpans, rb.summary.beamSpans),
    row('longest beam span', 'm', ra.summary.longestSpanM, rb.summary.longestSpanM),
    row('deepest beam', 'mm', ra.summary.deepestBeamMm, rb.summary.deepestBeamMm),
    row('largest column needed (lowest storey, square side)', 'mm', maxCol(ra), maxCol(rb)),
    row('beam concrete', 'm³', concrete(ra, 'beams'), concrete(rb, 'beams')),
    row('column concrete', 'm³', concrete(ra, 'columns'), concrete(rb, 'columns')),
    row('footing concrete', 'm³', concrete(ra, 'footings'), concrete(rb, 'footings')),
    row('concrete', 'm³', ra.quantities.totals.concreteM3, rb.quantities.totals.concreteM3),
    row('reinforcement', 'kg', ra.quantities.totals.steelKg, rb.quantities.totals.steelKg),
    row('formwork', 'm²', ra.quantities.totals.formworkM2, rb.quantities.totals.formworkM2),
    row(
      'footings crossing a property line',
      'no.',
      new Set(ra.footings.boundary.map((o) => o.columnId)).size,
      new Set(rb.footings.boundary.map((o) => o.columnId)).size,
    ),
    ...(['error', 'warning', 'info'] as const).map((sev) =>
      row(`failed checks: ${SEVERITY_ITEM[sev]}`, 'no.', checkCounts.a[sev], checkCounts.b[sev]),
    ),
    row('cost', ra.cost.currency, ra.cost.total, rb.cost.total),
  ];
  const costDrivers = ra.cost.rows
    .map((x) => {
      const y = rb.cost.rows.find((r) => r.member === x.member);
      return { member: x.member, a: x.total, b: y?.total ?? 0, delta: (y?.total ?? 0) - x.total };
    })
    .sort((p, q) => Math.abs(q.delta) - Math.abs(p.delta));

  const summary: string[] = [];
  const dc = rb.summary.columns - ra.summary.columns;
  if (dc !== 0)
    summary.push(
      `${rb.schemeName} has ${Math.abs(dc)} column${Math.abs(dc) === 1 ? '' : 's'} ${dc < 0 ? 'fewer' : 'more'} than ${ra.schemeName} (${rb.summary.columns} against ${ra.summary.columns}).`,
    );
  if (Math.abs(rb.summary.longestSpanM - ra.summary.longestSpanM) > 1e-6)
    summary.push(
      `Its longest beam span is ${fmt(rb.summary.longestSpanM, 2)} m against ${fmt(ra.summary.longestSpanM, 2)} m, and its deepest beam ${fmt(rb.summary.deepestBeamMm)} mm against ${fmt(ra.summary.deepestBeamMm)} mm.`,
    );
  if (ra.cost.currency !== rb.cost.currency)
    summary.push(
      `The schemes price in different currencies (${ra.cost.currency}, ${rb.cost.currency}); the cost difference is not meaningful.`,
    );
  else {
    const d = rb.cost.total - ra.cost.total;
    const pct = ra.cost.total > 0 ? (100 * d) / ra.cost.total : 0;
    const drivers = costDrivers.filter((x) => Math.abs(x.delta) > 0.005 * Math.max(ra.cost.total, 1)).slice(0, 3);
    summary.push(
      `${rb.schemeName} costs ${fmt(Math.abs(d))} ${ra.cost.currency} ${d >= 0 ? 'more' : 'less'} (${d >= 0 ? '+' : '−'}${fmt(Math.abs(pct), 1)} %)` +
        (drivers.length
          ? `, mostly in ${drivers.map((x) => `${x.member} (${x.delta >= 0 ? '+' : '−'}${fmt(Math.abs(x.delta))})`).join(', ')}.`
          : '.'),
    );
  }
  return { ...base, ok: true, differences, costDrivers, summary, checkCounts };
}

/** Analyses and compares two schemes (see compareResults). */
export function compareSchemes(a: Scheme, b: Scheme): SchemeComparison {
  return compareResults(analyseScheme(a), analyseScheme(b));
}
