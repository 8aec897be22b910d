import { FOOTING_OPTION_LABELS, type FootingOption, type SchemeDocument } from '@trabeate/contracts';
import type { BoundaryOptions, OverlapCombined, SchemeResult } from '@trabeate/structural';

// What the footing panel shows, worked out from the engine's result and the document's recorded
// choices: one entry per column whose own footing crosses a property line or meets another
// column's, the options the engine sized for it, and any recorded choice that no longer fits.

export type FootingChoice = SchemeDocument['footingChoices'][number];

/** Words for each option, used in the panel, its list and the choice's record (shared with the report). */
export { FOOTING_OPTION_LABELS };

export interface FootingSiteEntry {
  columnId: string;
  label: string;
  /** one per property line the column's own pad would cross (a corner column has two) */
  lines: BoundaryOptions[];
  /** isolated pads of this column and a neighbour that overlap or nearly touch */
  overlaps: OverlapCombined[];
  /** the options the engine found workable, in the order shown */
  possible: FootingOption[];
  choice: FootingChoice | null;
}

export interface StaleChoice {
  choice: FootingChoice;
  /** why the record no longer fits the plan, in plain words */
  why: string;
}

/** The options of one property line the engine sized as workable. */
export function workableAtLine(o: BoundaryOptions): FootingOption[] {
  const out: FootingOption[] = ['shift'];
  if (o.strap?.feasible) out.push('strap');
  if (o.combinedRectangular?.feasible) out.push('combinedRectangular');
  if (o.combinedTrapezoidal?.feasible) out.push('combinedTrapezoidal');
  return out;
}

/** The overlap options: one combined footing, or separate pads while they do not overlap. */
export function workableForOverlap(o: OverlapCombined): FootingOption[] {
  return o.gapM < 0 ? ['combinedOverlap'] : ['combinedOverlap', 'isolated'];
}

/** Every column with footing options, in plan order (by y, then x), with its recorded choice. */
export function footingSites(doc: SchemeDocument, result: SchemeResult): FootingSiteEntry[] {
  const byId = new Map(doc.columns.map((c) => [c.id, c]));
  const choices = new Map((doc.footingChoices ?? []).map((c) => [c.columnId, c]));
  const entries = new Map<string, FootingSiteEntry>();
  const entry = (columnId: string) => {
    let e = entries.get(columnId);
    if (!e) {
      e = {
        columnId,
        label: byId.get(columnId)?.label ?? columnId,
        lines: [],
        overlaps: [],
        possible: [],
        choice: choices.get(columnId) ?? null,
      };
      entries.set(columnId, e);
    }
    return e;
  };
  for (const o of result.footings.boundary) entry(o.columnId).lines.push(o);
  for (const o of result.footings.combined) for (const id of o.columnIds) entry(id).overlaps.push(o);
  for (const e of entries.values()) {
    const all = [...e.lines.flatMap(workableAtLine), ...e.overlaps.flatMap(workableForOverlap)];
    e.possible = [...new Set(all)];
  }
  const at = (id: string) => byId.get(id) ?? { x: Infinity, y: Infinity };
  return [...entries.values()].sort(
    (a, b) => at(a.columnId).y - at(b.columnId).y || at(a.columnId).x - at(b.columnId).x,
  );
}

/**
 * Recorded choices that no longer fit the plan: the column is gone, it no longer stands where
 * its own footing meets a property line or another pad, or the chosen option is no longer one
 * the engine finds workable for it. A warning for the engineer to look at, never an error.
 */
export function staleChoices(doc: SchemeDocument, sites: readonly FootingSiteEntry[]): StaleChoice[] {
  const byId = new Map(sites.map((s) => [s.columnId, s]));
  const out: StaleChoice[] = [];
  for (const choice of doc.footingChoices ?? []) {
    const site = byId.get(choice.columnId);
    if (!doc.columns.some((c) => c.id === choice.columnId))
      out.push({ choice, why: `Column ${choice.columnId} is no longer in the scheme.` });
    else if (!site)
      out.push({
        choice,
        why: `Column ${choice.columnId}'s own footing no longer crosses a property line or meets another footing.`,
      });
    else if (!site.possible.includes(choice.option))
      out.push({
        choice,
        why: `${FOOTING_OPTION_LABELS[choice.option]} is no longer workable for column ${choice.columnId}.`,
      });
  }
  return out;
}
