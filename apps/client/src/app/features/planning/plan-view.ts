import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import type { SchemeCheck, SchemeDocument } from '@trabeate/contracts';
import { markerPoint, planGeometry } from './plan-geometry';

/** A check on the plan: where its marker sits, with its index in the page's list. */
interface Marker {
  index: number;
  check: SchemeCheck;
  x: number;
  y: number;
}

/** spacing of markers that share a spot, m on the plan */
const MARKER_STEP_M = 0.95;

const SHAPE_LABEL = { error: 'must fix', warning: 'worth a look', info: 'note' } as const;

/**
 * The plan in Trabeate's own drawing style: plot outline with its property lines hatched, grid
 * lines with their labels in circles, beams, columns to scale, and a marker for each failed check
 * (shape and text tell the severity, not colour alone). Plan y runs up the screen.
 */
@Component({
  selector: 'tb-plan-view',
  template: `
    @let g = geometry();
    <svg
      class="plan"
      role="img"
      [attr.viewBox]="'0 0 ' + g.box.width + ' ' + g.box.height"
      [attr.aria-label]="'Plan of ' + document().name + ': ' + document().columns.length + ' columns'"
      data-testid="plan"
    >
      <g class="boundary">
        @for (s of g.boundary; track s.id) {
          <line
            [class.property]="s.property"
            [attr.x1]="X(s.a.x)"
            [attr.y1]="Y(s.a.y)"
            [attr.x2]="X(s.b.x)"
            [attr.y2]="Y(s.b.y)"
            [attr.data-testid]="s.property ? 'property-line' : 'plot-edge'"
          />
        }
      </g>
      <g class="grid">
        @for (l of g.grid; track l.id) {
          <line
            [class.hl]="lit().has(l.id)"
            [attr.x1]="X(l.a.x)"
            [attr.y1]="Y(l.a.y)"
            [attr.x2]="X(l.b.x)"
            [attr.y2]="Y(l.b.y)"
          />
          <g class="bubble" data-testid="grid-label">
            <circle
              r="0.55"
              [attr.cx]="X(l.a.x) - (l.axis === 'y' ? 0.6 : 0)"
              [attr.cy]="Y(l.a.y) + (l.axis === 'x' ? 0.6 : 0)"
            />
            <text
              [attr.x]="X(l.a.x) - (l.axis === 'y' ? 0.6 : 0)"
              [attr.y]="Y(l.a.y) + (l.axis === 'x' ? 0.6 : 0)"
              dominant-baseline="central"
              text-anchor="middle"
            >
              {{ l.label }}
            </text>
          </g>
        }
      </g>
      <g class="beams">
        @for (b of g.beams; track b.id) {
          <line
            [class.hl]="lit().has(b.id) || lit().has('L-' + b.lineId)"
            [attr.x1]="X(b.a.x)"
            [attr.y1]="Y(b.a.y)"
            [attr.x2]="X(b.b.x)"
            [attr.y2]="Y(b.b.y)"
            [attr.data-beam]="b.id"
          />
        }
        @for (b of g.secondaries; track b.id) {
          <line
            class="secondary"
            [class.hl]="lit().has(b.id)"
            [attr.x1]="X(b.a.x)"
            [attr.y1]="Y(b.a.y)"
            [attr.x2]="X(b.b.x)"
            [attr.y2]="Y(b.b.y)"
          />
        }
      </g>
      <g class="columns">
        @for (c of document().columns; track c.id) {
          @let w = (c.orientationDeg === 0 ? c.widthMm : c.depthMm) / 1000;
          @let d = (c.orientationDeg === 0 ? c.depthMm : c.widthMm) / 1000;
          <rect
            [class.hl]="lit().has(c.id)"
            [attr.x]="X(c.x) - w / 2"
            [attr.y]="Y(c.y) - d / 2"
            [attr.width]="w"
            [attr.height]="d"
            [attr.data-column]="c.id"
          >
            <title>Column {{ c.label }}, {{ c.widthMm }} × {{ c.depthMm }} mm</title>
          </rect>
        }
      </g>
      <g class="markers">
        @for (m of markers(); track m.index) {
          <g
            class="marker"
            [class]="m.check.severity"
            [class.chosen]="m.index === selected()"
            role="button"
            tabindex="0"
            [attr.transform]="'translate(' + (X(m.x) + 0.45) + ' ' + (Y(m.y) - 0.45) + ')'"
            [attr.aria-label]="label(m.check)"
            [attr.data-testid]="'marker-' + m.check.ruleId"
            (click)="choose.emit(m.index)"
            (keydown.enter)="choose.emit(m.index)"
            (keydown.space)="choose.emit(m.index); $event.preventDefault()"
          >
            @switch (m.check.severity) {
              @case ('error') {
                <rect x="-0.32" y="-0.32" width="0.64" height="0.64" transform="rotate(45)" />
                <text dominant-baseline="central" text-anchor="middle">!</text>
              }
              @case ('warning') {
                <path d="M 0 -0.42 L 0.42 0.32 L -0.42 0.32 Z" />
                <text y="0.05" dominant-baseline="central" text-anchor="middle">!</text>
              }
              @default {
                <circle r="0.34" />
                <text dominant-baseline="central" text-anchor="middle">i</text>
              }
            }
          </g>
        }
      </g>
    </svg>
  `,
  styles: `
    :host {
      display: block;
    }
    .plan {
      width: 100%;
      height: auto;
      max-height: 70vh;
      background: var(--mat-sys-surface-container-lowest);
      border: 1px solid var(--mat-sys-outline-variant);
    }
    line,
    rect,
    circle,
    path {
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
    .columns rect {
      fill: var(--mat-sys-on-surface);
    }
    .hl,
    .grid line.hl,
    .beams line.hl {
      stroke: var(--mat-sys-primary);
      stroke-width: 6px;
    }
    .columns rect.hl {
      fill: var(--mat-sys-primary);
      stroke: var(--mat-sys-primary);
      stroke-width: 4px;
    }
    .marker {
      cursor: pointer;
    }
    .marker rect,
    .marker path,
    .marker circle {
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
export class PlanView {
  readonly document = input.required<SchemeDocument>();
  /** the failed checks, in the page's order */
  readonly checks = input<readonly SchemeCheck[]>([]);
  /** index into `checks` of the check chosen in the list or on the plan */
  readonly selected = input<number | null>(null);
  readonly choose = output<number>();

  protected readonly geometry = computed(() => planGeometry(this.document()));
  protected readonly markers = computed<Marker[]>(() => {
    const out: Marker[] = [];
    // Checks about the same place (a long span and the wide column spacing under it) would hide
    // one another: each further marker at a spot steps along to the right.
    const taken = new Map<string, number>();
    this.checks().forEach((check, index) => {
      const p = markerPoint(this.document(), this.geometry(), check.elements);
      if (!p) return;
      const spot = `${p.x.toFixed(2)},${p.y.toFixed(2)}`;
      const n = taken.get(spot) ?? 0;
      taken.set(spot, n + 1);
      out.push({ index, check, x: p.x + n * MARKER_STEP_M, y: p.y });
    });
    return out;
  });
  /** elements of the chosen check, drawn highlighted */
  protected readonly lit = computed(() => {
    const i = this.selected();
    return new Set(i === null ? [] : (this.checks()[i]?.elements ?? []));
  });

  protected X = (x: number) => x - this.geometry().box.minX;
  protected Y = (y: number) => this.geometry().box.minY + this.geometry().box.height - y;
  protected label = (c: SchemeCheck) => `${SHAPE_LABEL[c.severity]}: ${c.message}`;
}
