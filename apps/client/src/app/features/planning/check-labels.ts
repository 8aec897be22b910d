import type { CheckSeverity, SchemeCheck, SourceKindValue } from '@trabeate/contracts';

// Words for checks on screen. Severity also has a shape (see plan-view), never colour alone.

export const SEVERITY_LABELS: Record<CheckSeverity, string> = {
  error: 'Must fix',
  warning: 'Worth a look',
  info: 'Note',
};

export const SOURCE_KIND_LABELS: Record<SourceKindValue, string> = {
  code: 'code clause',
  handbook: 'handbook table',
  practice: 'common practice',
  memory: 'from memory',
  derived: 'derived',
  project: 'set for this project',
};

/** Plain words for each rule the engine checks, by rule id; an unknown rule shows its id. */
export const RULE_LABELS: Record<string, string> = {
  'beam.span': 'Beam span against the limit for its support condition',
  'beam.depth': 'Beam depth needed for its span and moment',
  'beam.headroom': 'Headroom under the beam',
  'beam.point-load-on-long-span': 'A secondary beam lands on a long span',
  'beam.unstable': 'Beam line held up by its columns',
  'column.spacing': 'Distance between neighbouring columns',
  'column.merge': 'Columns so close that one could replace them',
  'column.wider-than-wall': 'Column wider than the wall it stands in',
  'column.capacity': 'Column section against its axial load',
  'column.steel-ratio': 'Reinforcement ratio of the column',
  'column.off-grid': 'Column standing on no beam line',
  'secondary.unsupported': 'Secondary beam without support at both ends',
  'slab.thickness': 'Slab thickness for its span',
  'stair.riser': 'Stair riser height',
  'stair.tread': 'Stair tread going',
  'stair.2r-plus-t': 'Stair pitch rule (two risers plus one tread)',
  'stair.risers-per-flight': 'Risers in one flight',
  'footing.crosses-property-line': 'Footing crossing a property line',
  'footing.overlap': 'Footings that overlap',
};

export const ruleLabel = (ruleId: string) => RULE_LABELS[ruleId] ?? ruleId;

const num = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 2 });

/** "8.4 m against a limit of at most 8 m" */
export function numbersOf(c: SchemeCheck): string {
  const unit = c.unit ? ` ${c.unit}` : '';
  return `${num.format(c.value)}${unit} against a limit of ${c.sense === 'max' ? 'at most' : 'at least'} ${num.format(c.limit)}${unit}`;
}
