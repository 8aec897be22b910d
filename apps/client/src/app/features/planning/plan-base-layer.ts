import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { PlanGeometry } from './plan-geometry';

/**
 * What a drag never moves: the plot outline with its property lines, the grid lines with their
 * labels, and the beams. Its inputs change only with the document or the chosen check.
 */
@Component({
  // an SVG group, since a custom element cannot sit inside <svg>
  // eslint-disable-next-line @angular-eslint/component-selector
  selector: 'g[tbPlanBaseLayer]',
  template: `
    @let b0 = geometry().box;
    <svg:g class="boundary">
      @for (s of geometry().boundary; track s.id) {
        <svg:line
          [class.property]="s.property"
          [attr.x1]="s.a.x - b0.minX"
          [attr.y1]="b0.minY + b0.height - s.a.y"
          [attr.x2]="s.b.x - b0.minX"
          [attr.y2]="b0.minY + b0.height - s.b.y"
          [attr.data-testid]="s.property ? 'property-line' : 'plot-edge'"
        />
        @if (s.property) {
          <!-- words as well as a line style: a property line never rests on the look of a line alone -->
          <svg:text
            class="property-label"
            [attr.x]="(s.a.x + s.b.x) / 2 - b0.minX"
            [attr.y]="b0.minY + b0.height - (s.a.y + s.b.y) / 2"
            [attr.transform]="labelTurn(s, b0)"
            text-anchor="middle"
            dy="-0.2"
            data-testid="property-line-label"
          >
            property line
          </svg:text>
        }
      }
    </svg:g>
    <svg:g class="grid">
      @for (l of geometry().grid; track l.id) {
        @let bx = l.a.x - b0.minX - (l.axis === 'y' ? 0.6 : 0);
        @let by = b0.minY + b0.height - l.a.y + (l.axis === 'x' ? 0.6 : 0);
        <svg:line
          [class.hl]="lit().has(l.id)"
          [attr.x1]="l.a.x - b0.minX"
          [attr.y1]="b0.minY + b0.height - l.a.y"
          [attr.x2]="l.b.x - b0.minX"
          [attr.y2]="b0.minY + b0.height - l.b.y"
        />
        <svg:g class="bubble" data-testid="grid-label">
          <svg:circle r="0.55" [attr.cx]="bx" [attr.cy]="by" />
          <svg:text [attr.x]="bx" [attr.y]="by" dominant-baseline="central" text-anchor="middle">
            {{ l.label }}
          </svg:text>
        </svg:g>
      }
    </svg:g>
    <svg:g class="beams">
      @for (b of geometry().beams; track b.id) {
        <svg:line
          [class.hl]="lit().has(b.id) || lit().has('L-' + b.lineId)"
          [attr.x1]="b.a.x - b0.minX"
          [attr.y1]="b0.minY + b0.height - b.a.y"
          [attr.x2]="b.b.x - b0.minX"
          [attr.y2]="b0.minY + b0.height - b.b.y"
          [attr.data-beam]="b.id"
        />
      }
      @for (b of geometry().secondaries; track b.id) {
        <svg:line
          class="secondary"
          [class.hl]="lit().has(b.id)"
          [attr.x1]="b.a.x - b0.minX"
          [attr.y1]="b0.minY + b0.height - b.a.y"
          [attr.x2]="b.b.x - b0.minX"
          [attr.y2]="b0.minY + b0.height - b.b.y"
        />
      }
    </svg:g>
  `,
  styles: `
    line,
    circle {
      vector-effect: non-scaling-stroke;
    }
    .boundary line {
      stroke: var(--mat-sys-on-surface-variant);
      stroke-width: 1.5px;
    }
    .boundary line.property {
      stroke: var(--mat-sys-on-surface);
      stroke-width: 3px;
      stroke-dasharray: 10 3 2 3;
    }
    .property-label {
      font:
        italic 600 0.4px 'Atkinson Hyperlegible',
        sans-serif;
      fill: var(--mat-sys-on-surface);
      paint-order: stroke;
      stroke: var(--mat-sys-surface-container-lowest);
      stroke-width: 0.12px;
    }
    .grid line {
      stroke: var(--mat-sys-outline);
      stroke-width: 0.75px;
      stroke-dasharray: 8 4;
    }
    .bubble circle {
      fill: var(--mat-sys-surface);
      stroke: var(--mat-sys-outline);
      stroke-width: 1px;
    }
    .bubble text {
      font:
        600 0.55px 'Atkinson Hyperlegible',
        sans-serif;
      fill: var(--mat-sys-on-surface);
    }
    .beams line {
      stroke: var(--mat-sys-secondary);
      stroke-width: 3px;
    }
    .beams line.secondary {
      stroke-dasharray: 6 3;
      stroke-width: 2px;
    }
    .grid line.hl,
    .beams line.hl {
      stroke: var(--mat-sys-primary);
      stroke-width: 6px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanBaseLayer {
  readonly geometry = input.required<PlanGeometry>();
  /** ids drawn highlighted (the chosen check's elements) */
  readonly lit = input<ReadonlySet<string>>(new Set());

  /** turns a property line's label to run along it, kept readable (never upside down) */
  protected labelTurn(s: { a: { x: number; y: number }; b: { x: number; y: number } }, b0: PlanGeometry['box']) {
    let deg = (Math.atan2(-(s.b.y - s.a.y), s.b.x - s.a.x) * 180) / Math.PI;
    if (deg > 90) deg -= 180;
    if (deg < -90) deg += 180;
    const cx = (s.a.x + s.b.x) / 2 - b0.minX;
    const cy = b0.minY + b0.height - (s.a.y + s.b.y) / 2;
    return `rotate(${Math.round(deg * 10) / 10} ${cx} ${cy})`;
  }
}
