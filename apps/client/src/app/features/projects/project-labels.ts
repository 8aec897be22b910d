import type { StageAction, StageKey, StageState } from '@trabeate/contracts';
import type { MarkerShape, MarkerTone } from '../../shared/state-marker/state-marker';

// Runtime words for the screens. The contracts hold the same keys, but importing their values
// would bring zod into the browser bundle; the types keep these in step with the server.

export const STAGE_ORDER: readonly StageKey[] = [
  'design_basis',
  'column_layout',
  'beam_framing',
  'slab_panels',
  'stairs',
  'foundations',
];

export const STAGE_TITLES: Readonly<Record<StageKey, string>> = {
  design_basis: 'Design basis',
  column_layout: 'Column layout',
  beam_framing: 'Beam framing',
  slab_panels: 'Slab panels',
  stairs: 'Stairs',
  foundations: 'Foundations',
};

export const STATE_LABELS: Readonly<Record<StageState, string>> = {
  not_started: 'Not started',
  in_progress: 'In progress',
  under_review: 'Under review',
  returned: 'Returned',
  approved: 'Approved',
};

/** What the button says; the order here is the order the buttons appear in. */
export const ACTION_LABELS: Readonly<Record<StageAction, string>> = {
  start: 'Start work',
  submit: 'Submit for review',
  approve: 'Approve',
  return: 'Return with comments',
  reopen: 'Reopen',
};

export type CodeFamily = 'IS456' | 'ACI318' | 'EN1992';

export const CODE_FAMILIES: readonly { readonly value: CodeFamily; readonly label: string }[] = [
  { value: 'IS456', label: 'IS 456 with IS 875 loads' },
  { value: 'ACI318', label: 'ACI 318 with ASCE 7 loads' },
  { value: 'EN1992', label: 'EN 1992 with EN 1990/1991' },
];

export const codeFamilyLabel = (value: string): string => CODE_FAMILIES.find((c) => c.value === value)?.label ?? value;

export type ActivityObjectType = 'project' | 'stage' | 'deliverable' | 'comment' | 'membership';
export const ACTIVITY_TYPES: readonly { readonly value: ActivityObjectType; readonly label: string }[] = [
  { value: 'project', label: 'Project' },
  { value: 'stage', label: 'Stages' },
  { value: 'deliverable', label: 'Deliverables' },
  { value: 'comment', label: 'Comments' },
  { value: 'membership', label: 'People' },
];

/** 1536 → "1.5 kB"; decimal units, as file managers on most desktops show them. */
export function formatBytes(bytes: number): string {
  if (bytes < 1000) return `${bytes} B`;
  const units = ['kB', 'MB', 'GB', 'TB'];
  let value = bytes;
  let unit = -1;
  do {
    value /= 1000;
    unit++;
  } while (value >= 1000 && unit < units.length - 1);
  return `${value < 10 ? value.toFixed(1) : Math.round(value)} ${units[unit]}`;
}

/** Each stage state as a shape and a tone (see shared/state-marker): readable without colour. */
export const STATE_MARKERS: Readonly<Record<StageState, { shape: MarkerShape; tone: MarkerTone }>> = {
  not_started: { shape: 'open', tone: 'neutral' },
  in_progress: { shape: 'half', tone: 'accent' },
  under_review: { shape: 'wait', tone: 'accent' },
  returned: { shape: 'back', tone: 'alert' },
  approved: { shape: 'done', tone: 'accent' },
};
