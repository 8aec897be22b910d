import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import type { SchemeCheck } from '@trabeate/contracts';
import type { PlanGeometry } from './plan-geometry';

/** A check on the plan: where its marker sits, with its index in the page's list. */
export interface Marker {
  index: number;
  check: SchemeCheck;
  x: number;
  y: number;
}

const SHAPE_LABEL = { error: 'must fix', warning: 'worth a look', info: 'note' } as const;

/**
 * A marker for each failed check: a diamond for must-fix, a triangle for worth-a-look, a circle for
 * a note, each with its text in the title, so severity never rests on colour alone. Its inputs
 * change only when the checks or the chosen one do, never during a drag.
 */
@Component({
  // an SVG group, since a custom element cannot sit inside <svg>
  // eslint-disable-next-line @angular-eslint/component-selector
  selector: 'g[tbPlanMarkerLayer]',
  template: `
    @let b0 = box();
    @for (m of markers(); track m.index) {
      <svg:g
        class="marker"
        [class]="m.check.severity"
        [class.chosen]="m.index === selected()"
        role="button"
        tabindex="0"
        [attr.transform]="'translate(' + (m.x - b0.minX + 0.45) + ' ' + (b0.minY + b0.height - m.y - 0.45) + ')'"
        [attr.aria-label]="label(m.check)"
        [attr.data-testid]="'marker-' + m.check.ruleId"
        (click)="choose.emit(m.index)"
        (keydown.enter)="choose.emit(m.index)"
        (keydown.space)="choose.emit(m.index); $event.preventDefault()"
      >
        @switch (m.check.severity) {
          @case ('error') {
            <svg:rect x="-0.32" y="-0.32" width="0.64" height="0.64" transform="rotate(45)" />
            <svg:text dominant-baseline="central" text-anchor="middle">!</svg:text>
          }
          @case ('warning') {
            <svg:path d="M 0 -0.42 L 0.42 0.32 L -0.42 0.32 Z" />
            <svg:text y="0.05" dominant-baseline="central" text-anchor="middle">!</svg:text>
          }
          @default {
            <svg:circle r="0.34" />
            <svg:text dominant-baseline="central" text-anchor="middle">i</svg:text>
          }
        }
      </svg:g>
    }
  `,
  host: { class: 'markers' },
  styles: `
    .marker {
      cursor: pointer;
    }
    .marker rect,
    .marker path,
    .marker circle {
      vector-effect: non-scaling-stroke;
      stroke: var(--mat-sys-surface);
      stroke-width: 1.5px;
    }
    .marker.error rect {
      fill: var(--mat-sys-error);
    }
    .marker.warning path {
      fill: #8a5a00;
    }
    .marker.info circle {
      fill: var(--mat-sys-secondary);
    }
    .marker text {
      font:
        700 0.5px 'Atkinson Hyperlegible',
        sans-serif;
      fill: #fff;
    }
    .marker.chosen rect,
    .marker.chosen path,
    .marker.chosen circle,
    .marker:focus-visible rect,
    .marker:focus-visible path,
    .marker:focus-visible circle {
      stroke: var(--mat-sys-primary);
      stroke-width: 3px;
    }
    .marker:focus {
      outline: none;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanMarkerLayer {
  readonly markers = input.required<readonly Marker[]>();
  readonly box = input.required<PlanGeometry['box']>();
  /** index into the page's list of the chosen check */
  readonly selected = input<number | null>(null);
  readonly choose = output<number>();

  protected label = (c: SchemeCheck) => `${SHAPE_LABEL[c.severity]}: ${c.message}`;
}
