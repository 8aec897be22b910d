import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import type { SchemeDocument } from '@trabeate/contracts';
import type { PlanGeometry } from './plan-geometry';

/** A press on a column of the plan, handed to the plan view that owns the drag. */
export interface ColumnPress {
  event: PointerEvent;
  id: string;
}

/**
 * The plan's columns where the document has them. None of its inputs change while a column is
 * dragged (the plan view draws the moving ones on a layer of their own), so a drag never walks
 * these views; the lifted columns stay here as faint outlines of where they came from.
 */
@Component({
  // an SVG group, since a custom element cannot sit inside <svg>
  // eslint-disable-next-line @angular-eslint/component-selector
  selector: 'g[tbPlanColumnLayer]',
  template: `
    @for (c of columns(); track c.id) {
      @let w = (c.orientationDeg === 0 ? c.widthMm : c.depthMm) / 1000;
      @let d = (c.orientationDeg === 0 ? c.depthMm : c.widthMm) / 1000;
      <svg:rect
        [class.hl]="lit().has(c.id)"
        [class.sel]="chosen().has(c.id)"
        [class.lifted]="lifted().has(c.id)"
        [attr.x]="c.x - box().minX - w / 2"
        [attr.y]="box().minY + box().height - c.y - d / 2"
        [attr.width]="w"
        [attr.height]="d"
        [attr.data-column]="c.id"
        [attr.aria-selected]="chosen().has(c.id)"
        (pointerdown)="press.emit({ event: $event, id: c.id })"
      >
        <svg:title>Column {{ c.label }}, {{ c.widthMm }} × {{ c.depthMm }} mm</svg:title>
      </svg:rect>
    }
  `,
  host: { class: 'columns', '[class.editable]': 'editable()' },
  styles: `
    rect {
      fill: var(--mat-sys-on-surface);
      vector-effect: non-scaling-stroke;
    }
    :host(.editable) rect {
      cursor: grab;
    }
    rect.sel {
      fill: var(--mat-sys-primary);
      stroke: var(--mat-sys-on-surface);
      stroke-width: 2px;
      stroke-dasharray: 3 2;
    }
    rect.hl {
      fill: var(--mat-sys-primary);
      stroke: var(--mat-sys-primary);
      stroke-width: 4px;
    }
    rect.lifted {
      fill: none;
      stroke: var(--mat-sys-outline);
      stroke-width: 1px;
      stroke-dasharray: 2 2;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanColumnLayer {
  readonly columns = input.required<SchemeDocument['columns']>();
  readonly box = input.required<PlanGeometry['box']>();
  /** ids drawn highlighted (the chosen check's elements) */
  readonly lit = input<ReadonlySet<string>>(new Set());
  /** ids of the selected columns */
  readonly chosen = input<ReadonlySet<string>>(new Set());
  /** ids of the columns being dragged, drawn on the moving layer instead */
  readonly lifted = input<ReadonlySet<string>>(new Set());
  readonly editable = input(false);
  readonly press = output<ColumnPress>();
}
