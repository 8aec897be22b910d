import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import type { SchemeCheck } from '@trabeate/contracts';
import type { PlanGeometry } from './plan-geometry';

/** A check on the plan: where its marker sits, with its index in the page's list. */
export interface Marker {
  index: number;
  /**
   * The check's rule and elements (and which of the same, if several): the same from one edit to
   * the next while the check stands, so its marker is kept rather than redrawn as another.
   */
  key: string;
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
  // Each shape is drawn at its own coordinates rather than moved by a transform: a transform per
  // marker gives the browser a paint node per marker to lay out into layers on every frame that
  // redraws the plan (the drop of a column, the checks arriving); hundreds of markers made that
  // the larger part of the frame.
  template: `
    @for (d of drawn(); track d.m.key) {
      <svg:g
        class="marker"
        [class]="d.m.check.severity"
        [class.chosen]="d.m.index === selected()"
        role="button"
        tabindex="0"
        [attr.data-spot]="d.spot"
        [attr.aria-label]="label(d.m.check)"
        [attr.data-testid]="'marker-' + d.m.check.ruleId"
        (click)="choose.emit(d.m.index)"
        (keydown.enter)="choose.emit(d.m.index)"
        (keydown.space)="choose.emit(d.m.index); $event.preventDefault()"
      >
        @if (d.m.check.severity === 'info') {
          <svg:circle [attr.cx]="d.x" [attr.cy]="d.y" r="0.34" />
        } @else {
          <svg:path [attr.d]="d.path" />
        }
        <svg:text [attr.x]="d.x" [attr.y]="d.textY" dominant-baseline="central" text-anchor="middle">
          {{ d.m.check.severity === 'info' ? 'i' : '!' }}
        </svg:text>
      </svg:g>
    }
  `,
  host: { class: 'markers' },
  styles: `
    .marker {
      cursor: pointer;
    }
    .marker path,
    .marker circle {
      vector-effect: non-scaling-stroke;
      stroke: var(--mat-sys-surface);
      stroke-width: 1.5px;
    }
    .marker.error path {
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
    .marker.chosen path,
    .marker.chosen circle,
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

  /** Where each marker's shape goes on the drawing (SVG y down), and its outline. */
  protected readonly drawn = computed(() => {
    const b = this.box();
    return this.markers().map((m) => {
      const x = round(m.x - b.minX + 0.45);
      const y = round(b.minY + b.height - m.y - 0.45);
      // must fix: a square turned on its corner (0.64 m sides); worth a look: a triangle
      const path =
        m.check.severity === 'error'
          ? `M ${x} ${round(y - 0.45)} L ${round(x + 0.45)} ${y} L ${x} ${round(y + 0.45)} L ${round(x - 0.45)} ${y} Z`
          : `M ${x} ${round(y - 0.42)} L ${round(x + 0.42)} ${round(y + 0.32)} L ${round(x - 0.42)} ${round(y + 0.32)} Z`;
      return { m, x, y, textY: m.check.severity === 'warning' ? round(y + 0.05) : y, path, spot: `${x} ${y}` };
    });
  });

  protected label = (c: SchemeCheck) => `${SHAPE_LABEL[c.severity]}: ${c.message}`;
}

/** Plan metres to the millimetre: shorter attributes, and nothing finer matters on screen. */
const round = (v: number) => Math.round(v * 1000) / 1000;
