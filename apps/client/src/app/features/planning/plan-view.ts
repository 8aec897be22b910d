import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';
import { MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import type { SchemeCheck, SchemeDocument } from '@trabeate/contracts';
import { snap, straighten, type PlanPart } from './editor-model';
import { PlanBaseLayer } from './plan-base-layer';
import { PlanColumnLayer } from './plan-column-layer';
import { planGeometry, type PlanGeometry, type Pt } from './plan-geometry';
import { PlanMarkerLayer, type Marker } from './plan-marker-layer';
import { PlanPartLayer } from './plan-part-layer';
import type { PlacingStep } from './secondary-beams-panel';

/** spacing of markers that share a spot, m on the plan */
const MARKER_STEP_M = 0.95;

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
/** A tap on the plan: where, in plan m, and the snap tolerance there (the columns' pixels at this zoom), m. */
export interface PlanTap {
  x: number;
  y: number;
  toleranceM: number;
}
/** The end of a boundary vertex's drag: its new (snapped) position, plan m. */
export interface VertexDrop {
  index: number;
  x: number;
  y: number;
}

interface Drag {
  id: string;
  /** the boundary vertex being dragged, when it is one rather than a column */
  vertex?: number;
  pointerId: number;
  start: Pt;
  from: Pt;
  moved: boolean;
  /** ids that move with the grab: the selection when the grabbed column is in it */
  moving: string[];
  /** the screen matrix at the grab (a drag neither zooms nor pans), so moves do not ask for layout */
  screen: { inverse: DOMMatrix; metresPerPixel: number } | null;
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
 *
 * Drawn in layers so that a drag stays cheap on a large scheme: the base (plot, grid, beams), the
 * columns and the markers are OnPush pieces whose inputs do not change while a column moves; the
 * dragged columns are drawn once more on a moving layer that follows the pointer by one transform,
 * and only their dimensions are worked out again on each move.
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
    <!-- a group, not an image: it holds focusable columns and markers, and an image's children
         would be presentational to assistive technology (axe: nested-interactive) -->
    <svg
      class="plan"
      [class.editable]="editable()"
      role="group"
      [attr.viewBox]="viewBox()"
      [attr.aria-label]="'Plan of ' + document().name + ': ' + document().columns.length + ' columns'"
      [class.placing]="placing() !== 'off'"
      data-testid="plan"
      (pointerdown)="startPan($event)"
      (pointermove)="pointerMove($event)"
      (pointerup)="pointerUp($event)"
      (pointercancel)="cancel()"
      (wheel)="wheel($event)"
    >
      <g tbPlanBaseLayer [geometry]="g" [lit]="lit()"></g>
      <g
        tbPlanPartLayer
        [boundary]="document().boundary"
        [secondaryBeams]="document().secondaryBeams"
        [box]="g.box"
        [part]="part()"
        [lit]="lit()"
        [editable]="editable()"
        [columnChosen]="selection().length > 0"
        (press)="grabPart($event.event, $event.part)"
        (choose)="editable() && pickPart.emit($event)"
      ></g>
      <g
        tbPlanColumnLayer
        [columns]="document().columns"
        [box]="g.box"
        [lit]="lit()"
        [chosen]="chosenIds()"
        [lifted]="liftedIds()"
        [editable]="editable() && placing() === 'off'"
        (press)="grab($event.event, $event.id)"
      ></g>
      @if (lifted(); as l) {
        <!-- only the dragged columns follow the pointer: one transform on their group -->
        <g class="moving" aria-hidden="true" [attr.transform]="moveTransform()">
          @for (c of l; track c.id) {
            @let w = (c.orientationDeg === 0 ? c.widthMm : c.depthMm) / 1000;
            @let d = (c.orientationDeg === 0 ? c.depthMm : c.widthMm) / 1000;
            <rect
              [attr.x]="X(c.x) - w / 2"
              [attr.y]="Y(c.y) - d / 2"
              [attr.width]="w"
              [attr.height]="d"
              [attr.data-moving-column]="c.id"
            />
          }
        </g>
      }
      @if (vertexDrag(); as v) {
        <!-- the dragged corner with its two segments; the outline itself moves on the drop -->
        <g class="moving-vertex" aria-hidden="true" data-testid="moving-vertex">
          <line [attr.x1]="X(v.prev.x)" [attr.y1]="Y(v.prev.y)" [attr.x2]="X(v.x)" [attr.y2]="Y(v.y)" />
          <line [attr.x1]="X(v.x)" [attr.y1]="Y(v.y)" [attr.x2]="X(v.next.x)" [attr.y2]="Y(v.next.y)" />
          <rect [attr.x]="X(v.x) - 0.22" [attr.y]="Y(v.y) - 0.22" width="0.44" height="0.44" />
        </g>
      }
      @if (dimensions().length) {
        <!-- Labels only: a press on a dimension goes through to the column under it. -->
        <g class="dims" data-testid="dimensions" pointer-events="none">
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
      @if (placeLine(); as pl) {
        <!-- where the beam being placed starts, and the beam as the next press would place it -->
        <g class="placing-beam" aria-hidden="true" pointer-events="none" data-testid="place-beam">
          @if (pl.end; as e) {
            <line
              class="band"
              [attr.x1]="X(pl.start.x)"
              [attr.y1]="Y(pl.start.y)"
              [attr.x2]="X(e.x)"
              [attr.y2]="Y(e.y)"
              data-testid="place-band"
            />
            <circle class="end" [attr.cx]="X(e.x)" [attr.cy]="Y(e.y)" r="0.14" />
          }
          <g class="start" data-testid="place-start">
            <circle [attr.cx]="X(pl.start.x)" [attr.cy]="Y(pl.start.y)" r="0.3" />
            <line
              [attr.x1]="X(pl.start.x) - 0.45"
              [attr.y1]="Y(pl.start.y)"
              [attr.x2]="X(pl.start.x) + 0.45"
              [attr.y2]="Y(pl.start.y)"
            />
            <line
              [attr.x1]="X(pl.start.x)"
              [attr.y1]="Y(pl.start.y) - 0.45"
              [attr.x2]="X(pl.start.x)"
              [attr.y2]="Y(pl.start.y) + 0.45"
            />
          </g>
        </g>
      }
      <!-- While a beam is placed the markers let presses through: a beam's end is often at a
           column or beam that a marker sits over, and a press there is a press on the plan. -->
      <g
        tbPlanMarkerLayer
        [attr.pointer-events]="placing() === 'off' ? null : 'none'"
        [markers]="markers()"
        [box]="g.box"
        [selected]="selected()"
        (choose)="choose.emit($event)"
      ></g>
    </svg>
    <p class="snap-note" aria-live="polite" data-testid="snap-note">{{ snapNote() }}</p>
  `,
  imports: [MatIcon, MatIconButton, PlanBaseLayer, PlanColumnLayer, PlanMarkerLayer, PlanPartLayer],
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
    .plan {
      touch-action: none;
    }
    .moving rect {
      fill: var(--mat-sys-primary);
      stroke: var(--mat-sys-on-surface);
      stroke-width: 2px;
      stroke-dasharray: 3 2;
      vector-effect: non-scaling-stroke;
      cursor: grabbing;
    }
    .moving-vertex line,
    .moving-vertex rect {
      stroke: var(--mat-sys-on-surface);
      stroke-width: 2px;
      stroke-dasharray: 3 2;
      vector-effect: non-scaling-stroke;
    }
    .moving-vertex rect {
      fill: var(--mat-sys-primary);
      cursor: grabbing;
    }
    .plan.placing {
      cursor: crosshair;
    }
    /* the beam being placed: a cross in a ring at its start (its own shape, not a colour), on a
       disc of the plan's paper so it shows over hatching, lines and columns alike, and a dash line */
    .placing-beam line,
    .placing-beam circle {
      vector-effect: non-scaling-stroke;
      fill: none;
      stroke: var(--mat-sys-on-surface);
      stroke-width: 2px;
    }
    .placing-beam .band {
      stroke: var(--mat-sys-primary);
      stroke-width: 3px;
      stroke-dasharray: 6 3;
    }
    .placing-beam .start circle {
      fill: var(--mat-sys-surface);
      fill-opacity: 0.75;
    }
    .placing-beam .end {
      fill: var(--mat-sys-primary);
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
    .dims line {
      vector-effect: non-scaling-stroke;
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
  /** the chosen boundary vertex or secondary beam */
  readonly part = input<PlanPart | null>(null);
  /** a boundary vertex or secondary beam was pressed without a drag */
  readonly pickPart = output<PlanPart>();
  readonly placeVertex = output<VertexDrop>();
  /** a press and release on the plan itself (not on an element, no pan): the plan point, m, and how far it may snap */
  readonly tap = output<PlanTap>();
  /** placing a secondary beam by two presses: the page's step (the presses come back as taps) */
  readonly placing = input<PlacingStep>('off');

  protected readonly chosenIds = computed(() => new Set(this.selection()));
  protected readonly zoom = signal(1);
  /** plan point at the centre of the view when zoomed in; null centres the plan */
  protected readonly centre = signal<Pt | null>(null);
  protected readonly zoomPercent = computed(() => Math.round(this.zoom() * 100));
  /** while dragging: how far the grabbed columns have moved, m (already snapped) */
  private readonly offset = signal<Pt | null>(null);
  /** while dragging: the columns that move, as they stand in the document */
  protected readonly lifted = signal<SchemeDocument['columns'] | null>(null);
  protected readonly liftedIds = computed<ReadonlySet<string>>(() => new Set(this.lifted()?.map((c) => c.id)));
  protected readonly moveTransform = computed(() => {
    const o = this.offset();
    return o ? `translate(${o.x} ${-o.y})` : null;
  });
  protected readonly snapNote = signal('');
  /** while a boundary vertex is dragged: where it is now (snapped) and its two neighbours */
  protected readonly vertexDrag = signal<{ index: number; x: number; y: number; prev: Pt; next: Pt } | null>(null);
  private drag: Drag | null = null;
  private pan: Pan | null = null;
  /** the tap given as the first end of the beam being placed, and the pointer since */
  private readonly placeFrom = signal<PlanTap | null>(null);
  private readonly placeTo = signal<PlanTap | null>(null);
  /**
   * The beam being placed, once its first end is in: that end snapped, and (when the pointer has
   * moved) the end the next press would give, both snapped and straightened as the page will.
   */
  protected readonly placeLine = computed(() => {
    const a = this.placeFrom();
    if (this.placing() !== 'end' || !a) return null;
    const b = this.placeTo();
    const doc = this.document();
    const toleranceM = Math.max(a.toleranceM, b?.toleranceM ?? 0);
    const start = snap(doc, a, { toleranceM });
    if (!b) return { start, end: null };
    const line = straighten(start, snap(doc, b, { toleranceM }));
    return { start: line.start, end: line.end };
  });

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

  /** where a column is drawn: moved with the drag while it is lifted */
  private shownAt(c: { id: string; x: number; y: number }, lifted: ReadonlySet<string>, o: Pt | null): Pt {
    return o && lifted.has(c.id) ? { x: c.x + o.x, y: c.y + o.y } : c;
  }

  /** The last selected column and the others, split by whether they move: redone per drag, not per move. */
  private readonly dimensionBase = computed(() => {
    const id = this.selection()[this.selection().length - 1];
    const cols = this.document().columns;
    const c = cols.find((x) => x.id === id);
    if (!c) return null;
    const lifted = this.liftedIds();
    const others = cols.filter((x) => x.id !== id);
    return { c, lifted, still: others.filter((x) => !lifted.has(x.id)), along: others.filter((x) => lifted.has(x.id)) };
  });

  /** Dimensions from the last selected column to its neighbours along its row and its column line. */
  protected readonly dimensions = computed(() => {
    const base = this.dimensionBase();
    if (!base) return [];
    const o = this.offset();
    const at = this.shownAt(base.c, base.lifted, o);
    const others: Pt[] =
      o && base.along.length
        ? [...base.still, ...base.along.map((x) => this.shownAt(x, base.lifted, o))]
        : [...base.still, ...base.along];
    const out: { key: string; a: Pt; b: Pt; text: string }[] = [];
    const nearest = (pred: (o: Pt) => boolean, dist: (o: Pt) => number) => {
      let best: Pt | undefined;
      for (const p of others) if (pred(p) && (!best || dist(p) < dist(best))) best = p;
      return best;
    };
    const row = (p: Pt) => Math.abs(p.y - at.y) < SAME_LINE_M;
    const line = (p: Pt) => Math.abs(p.x - at.x) < SAME_LINE_M;
    const sides = [
      {
        key: 'w',
        n: nearest(
          (p) => row(p) && p.x < at.x,
          (p) => at.x - p.x,
        ),
      },
      {
        key: 'e',
        n: nearest(
          (p) => row(p) && p.x > at.x,
          (p) => p.x - at.x,
        ),
      },
      {
        key: 's',
        n: nearest(
          (p) => line(p) && p.y < at.y,
          (p) => at.y - p.y,
        ),
      },
      {
        key: 'n',
        n: nearest(
          (p) => line(p) && p.y > at.y,
          (p) => p.y - at.y,
        ),
      },
    ];
    for (const { key, n } of sides) {
      if (!n) continue;
      const d = Math.hypot(n.x - at.x, n.y - at.y);
      out.push({ key, a: { x: at.x, y: at.y }, b: { x: n.x, y: n.y }, text: `${d.toFixed(2)} m` });
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
    // while a beam is placed a press on a column is a press on the plan (it bubbles on as a tap)
    if (!this.editable() || e.button !== 0 || this.placing() !== 'off') return;
    e.stopPropagation();
    const c = this.document().columns.find((x) => x.id === id);
    if (!c) return;
    try {
      (e.target as Element).setPointerCapture?.(e.pointerId);
    } catch {
      // a synthetic pointer (tests, assistive tools) has nothing to capture
    }
    const moving = this.chosenIds().has(id) ? [...this.selection()] : [id];
    const svg = (e.currentTarget as Element | null)?.closest?.('svg') as SVGSVGElement | null;
    const m = svg?.getScreenCTM?.();
    const screen = m && m.a ? { inverse: m.inverse(), metresPerPixel: 1 / m.a } : null;
    this.drag = {
      id,
      pointerId: e.pointerId,
      start: { x: 0, y: 0 },
      from: { x: c.x, y: c.y },
      moved: false,
      moving,
      screen,
    };
    this.drag.start = this.toPlan(e);
  }

  /** A press on a vertex starts a drag like a column's; a press on a secondary beam chooses it. */
  protected grabPart(e: PointerEvent, part: PlanPart): void {
    if (!this.editable() || e.button !== 0 || this.placing() !== 'off') return;
    e.stopPropagation();
    if (part.kind === 'secondary') {
      this.pickPart.emit(part);
      return;
    }
    const v = this.document().boundary.vertices[part.index];
    if (!v) return;
    const svg = (e.currentTarget as Element | null)?.closest?.('svg') as SVGSVGElement | null;
    const m = svg?.getScreenCTM?.();
    const screen = m && m.a ? { inverse: m.inverse(), metresPerPixel: 1 / m.a } : null;
    this.drag = {
      id: `corner ${part.index + 1}`,
      vertex: part.index,
      pointerId: e.pointerId,
      start: { x: 0, y: 0 },
      from: { x: v.x, y: v.y },
      moved: false,
      moving: [],
      screen,
    };
    this.drag.start = this.toPlan(e);
  }

  protected startPan(e: PointerEvent): void {
    if (this.drag || e.button !== 0) return;
    this.tapAt = {
      x: e.clientX,
      y: e.clientY,
      pointerId: e.pointerId,
      plan: { ...this.toPlan(e), toleranceM: SNAP_PX * this.metresPerPixel(e) },
    };
    if (this.zoom() === ZOOM_MIN) return;
    const g = this.geometry().box;
    const c = this.centre() ?? { x: g.minX + g.width / 2, y: g.minY + g.height / 2 };
    this.pan = { pointerId: e.pointerId, start: { x: e.clientX, y: e.clientY }, from: c };
  }

  protected pointerMove(e: PointerEvent): void {
    if (this.placing() === 'end' && this.placeFrom())
      this.placeTo.set({ ...this.toPlan(e), toleranceM: SNAP_PX * this.metresPerPixel(e) });
    if (this.drag && e.pointerId === this.drag.pointerId) {
      const p = this.toPlan(e);
      const raw = { x: this.drag.from.x + p.x - this.drag.start.x, y: this.drag.from.y + p.y - this.drag.start.y };
      const moving = this.drag.moving;
      if (this.drag.vertex !== undefined) {
        this.dragVertex(this.drag, this.drag.vertex, raw, e);
        return;
      }
      if (!this.lifted()) {
        const ids = new Set(moving);
        this.lifted.set(this.document().columns.filter((c) => ids.has(c.id)));
      }
      const s = snap(this.document(), raw, {
        toleranceM: SNAP_PX * (this.drag.screen?.metresPerPixel ?? this.metresPerPixel(e)),
        exclude: moving,
      });
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
    if (d && e.pointerId === d.pointerId && d.vertex !== undefined) {
      const v = this.vertexDrag();
      this.cancel();
      if (d.moved && v) this.placeVertex.emit({ index: v.index, x: v.x, y: v.y });
      else this.pickPart.emit({ kind: 'vertex', index: d.vertex });
      return;
    }
    if (d && e.pointerId === d.pointerId) {
      const o = this.offset();
      this.cancel();
      if (d.moved && o) this.place.emit({ id: d.id, x: d.from.x + o.x, y: d.from.y + o.y });
      else this.pick.emit({ id: d.id, extend: e.shiftKey || e.ctrlKey || e.metaKey });
      return;
    }
    const t = this.tapAt;
    this.tapAt = null;
    // a press that did not travel (a pan moves it) is a tap on the plan
    if (t && t.pointerId === e.pointerId && Math.hypot(e.clientX - t.x, e.clientY - t.y) < 4) {
      if (this.placing() === 'start') {
        // the first end of a beam: kept to draw from once the page asks for the second
        this.placeFrom.set(t.plan);
        this.placeTo.set(null);
      }
      this.tap.emit(t.plan);
    }
    this.pan = null;
  }

  private tapAt: { x: number; y: number; pointerId: number; plan: PlanTap } | null = null;

  private dragVertex(drag: Drag, index: number, raw: Pt, e: PointerEvent): void {
    const vs = this.document().boundary.vertices;
    const s = snap(this.document(), raw, {
      toleranceM: SNAP_PX * (drag.screen?.metresPerPixel ?? this.metresPerPixel(e)),
    });
    drag.moved ||= s.x !== drag.from.x || s.y !== drag.from.y;
    const n = vs.length;
    this.vertexDrag.set({ index, x: s.x, y: s.y, prev: vs[(index - 1 + n) % n], next: vs[(index + 1) % n] });
    const to = [s.snappedX, s.snappedY].filter(Boolean).join(' and ');
    this.snapNote.set(`${drag.id} at x ${s.x.toFixed(2)} m, y ${s.y.toFixed(2)} m${to ? `, on ${to}` : ''}`);
  }

  protected cancel(): void {
    this.drag = null;
    this.pan = null;
    this.offset.set(null);
    this.lifted.set(null);
    this.vertexDrag.set(null);
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
    let u = { x: e.clientX, y: e.clientY };
    const cached = this.drag?.screen?.inverse;
    if (cached) {
      u = { x: cached.a * u.x + cached.c * u.y + cached.e, y: cached.b * u.x + cached.d * u.y + cached.f };
    } else {
      const svg = ((e.currentTarget as Element | null)?.closest?.('svg') ?? null) as SVGSVGElement | null;
      const m = svg?.getScreenCTM?.();
      if (m && svg?.createSVGPoint) {
        const q = svg.createSVGPoint();
        q.x = e.clientX;
        q.y = e.clientY;
        const r = q.matrixTransform(m.inverse());
        u = { x: r.x, y: r.y };
      }
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
    const seen = new Map<string, number>();
    const doc = this.document();
    const geometry = this.geometry();
    const columnIds = new Set(doc.columns.map((c) => c.id));
    this.checks().forEach((check, index) => {
      const p = markerAt(geometry, columnIds, check.elements);
      if (!p) return;
      const spot = `${p.x.toFixed(2)},${p.y.toFixed(2)}`;
      const n = taken.get(spot) ?? 0;
      taken.set(spot, n + 1);
      const what = `${check.ruleId}|${check.elements.join(',')}`;
      const again = seen.get(what) ?? 0;
      seen.set(what, again + 1);
      out.push({ index, key: `${what}|${again}`, check, x: p.x + n * MARKER_STEP_M, y: p.y });
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
}

/**
 * Where a check's marker goes: plan-geometry's markerPoint rule (the named columns when there are
 * any, else every named element; their mean), with the document's column ids gathered once for
 * all the checks rather than once per check.
 */
function markerAt(geometry: PlanGeometry, columnIds: ReadonlySet<string>, elements: readonly string[]): Pt | null {
  const named = elements.some((e) => columnIds.has(e)) ? elements.filter((e) => columnIds.has(e)) : elements;
  const pts = named.map((e) => geometry.at.get(e)).filter((p): p is Pt => p !== undefined);
  if (!pts.length) return null;
  return { x: pts.reduce((s, p) => s + p.x, 0) / pts.length, y: pts.reduce((s, p) => s + p.y, 0) / pts.length };
}
