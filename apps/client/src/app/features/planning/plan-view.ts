import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';
import { MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import type { SchemeCheck, SchemeDocument } from '@trabeate/contracts';
import { snap } from './editor-model';
import { markerPoint, planGeometry, type Pt } from './plan-geometry';

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

/** how far, in screen pixels, a dragged column jumps to a grid line or another column */
const SNAP_PX = 10;
/** columns within this of each other across the line count as on one line for dimensions, m */
const SAME_LINE_M = 0.01;
const ZOOM_MIN = 1;
const ZOOM_MAX = 12;

/** A column picked on the plan; `extend` adds it to (or takes it from) the selection. */
export interface ColumnPick {
  id: string;
  extend: boolean;
}
/** The end of a drag: the grabbed column's new (snapped) position, plan m. */
export interface ColumnDrop {
  id: string;
  x: number;
  y: number;
}

interface Drag {
  id: string;
  pointerId: number;
  start: Pt;
  from: Pt;
  moved: boolean;
}
interface Pan {
  pointerId: number;
  start: { x: number; y: number };
  from: Pt;
}

/**
 * The plan in Trabeate's own drawing style: plot outline with its property lines hatched, grid
 * lines with their labels in circles, beams, columns to scale, and a marker for each failed check
 * (shape and text tell the severity, not colour alone). Plan y runs up the screen.
 */
@Component({
  selector: 'tb-plan-view',
  template: `
    @let g = geometry();
    <div class="zoom" role="group" aria-label="Zoom">
      <button mat-icon-button type="button" (click)="zoomBy(1.5)" aria-label="Zoom in" data-testid="zoom-in">
        <mat-icon>add</mat-icon>
      </button>
      <button mat-icon-button type="button" (click)="zoomBy(1 / 1.5)" aria-label="Zoom out" data-testid="zoom-out">
        <mat-icon>remove</mat-icon>
      </button>
      <button mat-icon-button type="button" (click)="fit()" aria-label="Whole plan" data-testid="zoom-fit">
        <mat-icon>fit_screen</mat-icon>
      </button>
      <span class="zoom-level" aria-live="polite">{{ zoomPercent() }} %</span>
    </div>
    <svg
      class="plan"
      [class.editable]="editable()"
      role="img"
      [attr.viewBox]="viewBox()"
      [attr.aria-label]="'Plan of ' + document().name + ': ' + document().columns.length + ' columns'"
      data-testid="plan"
      (pointerdown)="startPan($event)"
      (pointermove)="pointerMove($event)"
      (pointerup)="pointerUp($event)"
      (pointercancel)="cancel()"
      (wheel)="wheel($event)"
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
          @let p = shownAt(c);
          <rect
            [class.hl]="lit().has(c.id)"
            [class.sel]="chosenIds().has(c.id)"
            [attr.x]="X(p.x) - w / 2"
            [attr.y]="Y(p.y) - d / 2"
            [attr.width]="w"
            [attr.height]="d"
            [attr.data-column]="c.id"
            [attr.aria-selected]="chosenIds().has(c.id)"
            (pointerdown)="grab($event, c.id)"
          >
            <title>Column {{ c.label }}, {{ c.widthMm }} × {{ c.depthMm }} mm</title>
          </rect>
        }
      </g>
      @if (dimensions().length) {
        <g class="dims" data-testid="dimensions">
          @for (dm of dimensions(); track dm.key) {
            <line [attr.x1]="X(dm.a.x)" [attr.y1]="Y(dm.a.y)" [attr.x2]="X(dm.b.x)" [attr.y2]="Y(dm.b.y)" />
            <text
              [attr.x]="X((dm.a.x + dm.b.x) / 2)"
              [attr.y]="Y((dm.a.y + dm.b.y) / 2) - 0.2"
              text-anchor="middle"
              data-testid="dimension"
            >
              {{ dm.text }}
            </text>
          }
        </g>
      }
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
    <p class="snap-note" aria-live="polite" data-testid="snap-note">{{ snapNote() }}</p>
  `,
  imports: [MatIcon, MatIconButton],
  styles: `
    :host {
      display: block;
      position: relative;
    }
    .zoom {
      display: flex;
      align-items: center;
      gap: 2px;
    }
    .zoom-level {
      font-size: 0.85rem;
      margin-left: 6px;
      color: var(--mat-sys-on-surface-variant);
    }
    .plan.editable .columns rect {
      cursor: grab;
    }
    .plan {
      touch-action: none;
    }
    .columns rect.sel {
      fill: var(--mat-sys-primary);
      stroke: var(--mat-sys-on-surface);
      stroke-width: 2px;
      stroke-dasharray: 3 2;
    }
    .dims line {
      stroke: var(--mat-sys-tertiary);
      stroke-width: 1px;
      marker-start: none;
    }
    .dims text {
      font:
        600 0.42px 'Atkinson Hyperlegible',
        sans-serif;
      fill: var(--mat-sys-tertiary);
    }
    .snap-note {
      min-height: 1.2em;
      margin: 2px 0 0;
      font-size: 0.85rem;
      color: var(--mat-sys-on-surface-variant);
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
  /** ids of the selected columns */
  readonly selection = input<readonly string[]>([]);
  /** whether columns can be picked and dragged */
  readonly editable = input(false);
  readonly pick = output<ColumnPick>();
  readonly place = output<ColumnDrop>();

  protected readonly chosenIds = computed(() => new Set(this.selection()));
  protected readonly zoom = signal(1);
  /** plan point at the centre of the view when zoomed in; null centres the plan */
  protected readonly centre = signal<Pt | null>(null);
  protected readonly zoomPercent = computed(() => Math.round(this.zoom() * 100));
  /** while dragging: how far the grabbed columns have moved, m (already snapped) */
  private readonly offset = signal<Pt | null>(null);
  protected readonly snapNote = signal('');
  private drag: Drag | null = null;
  private pan: Pan | null = null;

  protected readonly viewBox = computed(() => {
    const { width, height } = this.geometry().box;
    const z = this.zoom();
    const c = this.centre();
    const w = width / z;
    const h = height / z;
    const cx = c ? this.X(c.x) : width / 2;
    const cy = c ? this.Y(c.y) : height / 2;
    return `${cx - w / 2} ${cy - h / 2} ${w} ${h}`;
  });

  /** where a column is drawn: moved with the drag while it is under way */
  protected shownAt(c: { id: string; x: number; y: number }): Pt {
    const o = this.offset();
    return o && this.movingIds().has(c.id) ? { x: c.x + o.x, y: c.y + o.y } : c;
  }
  private readonly movingIds = computed(() => {
    const o = this.offset();
    if (!o || !this.drag) return new Set<string>();
    return this.chosenIds().has(this.drag.id) ? this.chosenIds() : new Set([this.drag.id]);
  });

  /** Dimensions from the last selected column to its neighbours along its row and its column line. */
  protected readonly dimensions = computed(() => {
    const id = this.selection()[this.selection().length - 1];
    const cols = this.document().columns;
    const c = cols.find((x) => x.id === id);
    if (!c) return [];
    const at = this.shownAt(c);
    const others = cols.filter((x) => x.id !== id).map((x) => ({ id: x.id, ...this.shownAt(x) }));
    const out: { key: string; a: Pt; b: Pt; text: string }[] = [];
    const nearest = (pred: (o: Pt) => boolean, dist: (o: Pt) => number) =>
      others.filter(pred).sort((p, q) => dist(p) - dist(q))[0];
    const row = (o: Pt) => Math.abs(o.y - at.y) < SAME_LINE_M;
    const line = (o: Pt) => Math.abs(o.x - at.x) < SAME_LINE_M;
    const sides = [
      {
        key: 'w',
        n: nearest(
          (o) => row(o) && o.x < at.x,
          (o) => at.x - o.x,
        ),
      },
      {
        key: 'e',
        n: nearest(
          (o) => row(o) && o.x > at.x,
          (o) => o.x - at.x,
        ),
      },
      {
        key: 's',
        n: nearest(
          (o) => line(o) && o.y < at.y,
          (o) => at.y - o.y,
        ),
      },
      {
        key: 'n',
        n: nearest(
          (o) => line(o) && o.y > at.y,
          (o) => o.y - at.y,
        ),
      },
    ];
    for (const { key, n } of sides) {
      if (!n) continue;
      const d = Math.hypot(n.x - at.x, n.y - at.y);
      out.push({ key, a: at, b: n, text: `${d.toFixed(2)} m` });
    }
    return out;
  });

  protected zoomBy(f: number): void {
    this.zoom.set(Math.min(ZOOM_MAX, Math.max(ZOOM_MIN, this.zoom() * f)));
    if (this.zoom() === ZOOM_MIN) this.centre.set(null);
  }

  protected fit(): void {
    this.zoom.set(1);
    this.centre.set(null);
  }

  protected wheel(e: WheelEvent): void {
    e.preventDefault();
    const p = this.toPlan(e);
    this.zoomBy(e.deltaY < 0 ? 1.2 : 1 / 1.2);
    if (this.zoom() > ZOOM_MIN) this.centre.set(this.centre() ?? p);
  }

  protected grab(e: PointerEvent, id: string): void {
    if (!this.editable() || e.button !== 0) return;
    e.stopPropagation();
    const c = this.document().columns.find((x) => x.id === id);
    if (!c) return;
    try {
      (e.target as Element).setPointerCapture?.(e.pointerId);
    } catch {
      // a synthetic pointer (tests, assistive tools) has nothing to capture
    }
    this.drag = { id, pointerId: e.pointerId, start: this.toPlan(e), from: { x: c.x, y: c.y }, moved: false };
  }

  protected startPan(e: PointerEvent): void {
    if (this.drag || e.button !== 0 || this.zoom() === ZOOM_MIN) return;
    const g = this.geometry().box;
    const c = this.centre() ?? { x: g.minX + g.width / 2, y: g.minY + g.height / 2 };
    this.pan = { pointerId: e.pointerId, start: { x: e.clientX, y: e.clientY }, from: c };
  }

  protected pointerMove(e: PointerEvent): void {
    if (this.drag && e.pointerId === this.drag.pointerId) {
      const p = this.toPlan(e);
      const raw = { x: this.drag.from.x + p.x - this.drag.start.x, y: this.drag.from.y + p.y - this.drag.start.y };
      const moving = this.chosenIds().has(this.drag.id) ? [...this.selection()] : [this.drag.id];
      const s = snap(this.document(), raw, { toleranceM: SNAP_PX * this.metresPerPixel(e), exclude: moving });
      this.drag.moved ||= s.x !== this.drag.from.x || s.y !== this.drag.from.y;
      this.offset.set({ x: s.x - this.drag.from.x, y: s.y - this.drag.from.y });
      const to = [s.snappedX, s.snappedY].filter(Boolean).join(' and ');
      this.snapNote.set(`${this.drag.id} at x ${s.x.toFixed(2)} m, y ${s.y.toFixed(2)} m${to ? `, on ${to}` : ''}`);
    } else if (this.pan && e.pointerId === this.pan.pointerId) {
      const k = this.metresPerPixel(e);
      this.centre.set({
        x: this.pan.from.x - (e.clientX - this.pan.start.x) * k,
        y: this.pan.from.y + (e.clientY - this.pan.start.y) * k,
      });
    }
  }

  protected pointerUp(e: PointerEvent): void {
    const d = this.drag;
    if (d && e.pointerId === d.pointerId) {
      const o = this.offset();
      this.cancel();
      if (d.moved && o) this.place.emit({ id: d.id, x: d.from.x + o.x, y: d.from.y + o.y });
      else this.pick.emit({ id: d.id, extend: e.shiftKey || e.ctrlKey || e.metaKey });
      return;
    }
    this.pan = null;
  }

  protected cancel(): void {
    this.drag = null;
    this.pan = null;
    this.offset.set(null);
    this.snapNote.set('');
  }

  /** plan metres per screen pixel at the current zoom (a typical 50 px per metre where the browser cannot tell, as in jsdom) */
  private metresPerPixel(e: Event): number {
    const svg = (e.currentTarget as Element | null)?.closest?.('svg') as SVGSVGElement | null;
    const m = svg?.getScreenCTM?.();
    return m && m.a ? 1 / m.a : 0.02;
  }

  /** A pointer's position in plan metres. Without a screen matrix (jsdom), client units are view units. */
  private toPlan(e: MouseEvent): Pt {
    const svg = ((e.currentTarget as Element | null)?.closest?.('svg') ?? null) as SVGSVGElement | null;
    const m = svg?.getScreenCTM?.();
    let u = { x: e.clientX, y: e.clientY };
    if (m && svg?.createSVGPoint) {
      const q = svg.createSVGPoint();
      q.x = e.clientX;
      q.y = e.clientY;
      const r = q.matrixTransform(m.inverse());
      u = { x: r.x, y: r.y };
    }
    const b = this.geometry().box;
    return { x: u.x + b.minX, y: b.minY + b.height - u.y };
  }

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
