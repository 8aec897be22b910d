import {
  afterRenderEffect,
  ChangeDetectionStrategy,
  Component,
  computed,
  ElementRef,
  inject,
  input,
  output,
  untracked,
} from '@angular/core';
import type { SchemeDocument } from '@trabeate/contracts';
import type { PlanPart } from './editor-model';
import type { PlanGeometry } from './plan-geometry';

/** A press on a boundary vertex or a secondary beam, handed to the plan view that owns the drag. */
export interface PartPress {
  event: PointerEvent;
  part: PlanPart;
}

/**
 * The editable parts of the plan other than columns: a handle on each boundary vertex and each
 * secondary beam with its id written beside it, chosen by a press. Its inputs change with the
 * document and the chosen part only; the plan view draws a dragged vertex on its moving layer.
 */
@Component({
  // an SVG group, since a custom element cannot sit inside <svg>
  // eslint-disable-next-line @angular-eslint/component-selector
  selector: 'g[tbPlanPartLayer]',
  template: `
    @let b0 = box();
    @for (s of secondaries(); track s.id) {
      <svg:g
        class="secondary"
        [class.sel]="s.chosen"
        [class.hl]="lit().has(s.id)"
        [attr.data-secondary]="s.id"
        (pointerdown)="editable() && press.emit({ event: $event, part: { kind: 'secondary', id: s.id } })"
      >
        <!-- a wide invisible line, so the thin beam is easy to hit -->
        <svg:line
          class="hit"
          [attr.x1]="s.a.x - b0.minX"
          [attr.y1]="b0.minY + b0.height - s.a.y"
          [attr.x2]="s.b.x - b0.minX"
          [attr.y2]="b0.minY + b0.height - s.b.y"
        />
        <svg:text
          [attr.x]="(s.a.x + s.b.x) / 2 - b0.minX + (s.vertical ? 0.25 : 0)"
          [attr.y]="b0.minY + b0.height - (s.a.y + s.b.y) / 2 - (s.vertical ? 0 : 0.25)"
          [attr.text-anchor]="s.vertical ? 'start' : 'middle'"
          data-testid="secondary-label"
        >
          {{ s.id }}
        </svg:text>
        <svg:title>Secondary beam {{ s.id }}</svg:title>
      </svg:g>
    }
    @if (editable()) {
      @for (v of vertices(); track $index) {
        <!-- Each corner is a button of its own: Tab reaches it, Enter or Space chooses it, and the
             plan's arrows then move it. -->
        <svg:rect
          class="vertex"
          [class.sel]="chosenVertex() === $index"
          [attr.x]="v.x - b0.minX - 0.22"
          [attr.y]="b0.minY + b0.height - v.y - 0.22"
          width="0.44"
          height="0.44"
          role="button"
          tabindex="0"
          [attr.aria-label]="v.label"
          [attr.data-vertex]="$index"
          (pointerdown)="press.emit({ event: $event, part: { kind: 'vertex', index: $index } })"
          (keydown)="key($event, $index)"
        >
          <svg:title>{{ v.label }}</svg:title>
        </svg:rect>
        <!-- the focus ring, shown while the corner before it has the keyboard's focus -->
        <svg:g class="ring" aria-hidden="true">
          @for (k of ringLayers; track k) {
            <svg:rect
              [class]="k"
              [attr.x]="v.x - b0.minX - 0.4"
              [attr.y]="b0.minY + b0.height - v.y - 0.4"
              width="0.8"
              height="0.8"
            />
          }
        </svg:g>
      }
    }
  `,
  host: { class: 'parts', '[class.editable]': 'editable()' },
  styles: `
    line,
    rect {
      vector-effect: non-scaling-stroke;
    }
    .hit {
      stroke: transparent;
      stroke-width: 14px;
    }
    :host(.editable) .secondary,
    :host(.editable) .vertex {
      cursor: grab;
    }
    .secondary text {
      font:
        600 0.4px 'Atkinson Hyperlegible',
        sans-serif;
      fill: var(--mat-sys-secondary);
    }
    .secondary.sel .hit,
    .secondary.hl .hit {
      stroke: var(--mat-sys-primary);
      stroke-width: 5px;
      stroke-dasharray: 3 2;
    }
    .secondary.sel text,
    .secondary.hl text {
      fill: var(--mat-sys-primary);
      font-weight: 800;
    }
    .vertex {
      fill: var(--mat-sys-surface);
      stroke: var(--mat-sys-on-surface);
      stroke-width: 1.5px;
    }
    .vertex.sel {
      fill: var(--mat-sys-primary);
      stroke-width: 2px;
      stroke-dasharray: 3 2;
    }
    .vertex:focus {
      outline: none;
    }
    /* A ring clear of the handle, in the plan's ink over a halo of its paper: it stands out
       (well over 3:1) against the plan, its hatching and its lines, in the light and dark themes. */
    .ring {
      visibility: hidden;
      pointer-events: none;
    }
    .ring rect {
      fill: none;
    }
    .ring .halo {
      stroke: var(--mat-sys-surface);
      stroke-width: 7px;
    }
    .ring .ink {
      stroke: var(--mat-sys-on-surface);
      stroke-width: 3px;
    }
    .vertex:focus-visible + .ring {
      visibility: visible;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanPartLayer {
  readonly boundary = input.required<SchemeDocument['boundary']>();
  readonly secondaryBeams = input.required<SchemeDocument['secondaryBeams']>();
  readonly box = input.required<PlanGeometry['box']>();
  readonly part = input<PlanPart | null>(null);
  /** ids drawn highlighted (the chosen check's elements) */
  readonly lit = input<ReadonlySet<string>>(new Set());
  readonly editable = input(false);
  /** whether a column is chosen (the part is then null) */
  readonly columnChosen = input(false);
  readonly press = output<PartPress>();
  /** a part chosen from the keyboard (Enter or Space on a corner) */
  readonly choose = output<PlanPart>();

  /** the ring's paper-coloured halo under its ink */
  protected readonly ringLayers = ['halo', 'ink'] as const;
  private readonly host = inject<ElementRef<SVGGElement>>(ElementRef);

  protected readonly vertices = computed(() =>
    this.boundary().vertices.map((v, i) => ({
      x: v.x,
      y: v.y,
      label: `Boundary corner ${i + 1} at x ${v.x.toFixed(2)} m, y ${v.y.toFixed(2)} m`,
    })),
  );
  protected readonly chosenVertex = computed(() => {
    const p = this.part();
    return p?.kind === 'vertex' ? p.index : null;
  });
  protected readonly secondaries = computed(() => {
    const p = this.part();
    return this.secondaryBeams().map((b) => ({
      id: b.id,
      a: b.start,
      b: b.end,
      vertical: Math.abs(b.end.x - b.start.x) < Math.abs(b.end.y - b.start.y),
      chosen: p?.kind === 'secondary' && p.id === b.id,
    }));
  });

  constructor() {
    // Focus follows the choice: when the plan's keys (Tab, an arrow with nothing chosen) choose a
    // corner while the keyboard is on the plan, its handle takes the focus, so what is focused is
    // what the arrows move.
    afterRenderEffect(() => {
      const index = this.chosenVertex();
      untracked(() => this.follow(index));
    });
  }

  protected key(e: KeyboardEvent, index: number): void {
    if (e.key === 'Enter' || e.key === ' ') {
      e.preventDefault(); // Space would scroll the page
      this.choose.emit({ kind: 'vertex', index });
    } else if (e.key.startsWith('Arrow') && this.chosenVertex() !== index) {
      // an arrow on a focused corner that is not the chosen part chooses it rather than moving
      // something else out of sight
      e.preventDefault();
      e.stopPropagation();
      this.choose.emit({ kind: 'vertex', index });
    }
  }

  private follow(index: number | null): void {
    const before = this.followed;
    this.followed = index;
    const host = this.host.nativeElement;
    const doc = host.ownerDocument;
    const active = doc.activeElement;
    if (!active || active === doc.body || active === doc.documentElement) {
      // the focused corner was deleted (Delete on it) and took the focus with it: keep the keyboard on the plan
      if (before !== null && index === null) this.editorAround()?.focus();
      return;
    }
    const onHandle = host.contains(active) && active.matches('[data-vertex]');
    if (index !== null) {
      // the plan editor (an ancestor holding the focus) or another corner hands the focus on
      if (onHandle || active.contains(host)) host.querySelector<SVGElement>(`[data-vertex="${index}"]`)?.focus();
    } else if (onHandle && (this.part() || this.columnChosen())) {
      // Tab went on from the last corner to another part: the focus goes back to the plan editor.
      // With nothing chosen (Escape) it stays, so the next Tab goes on from this corner.
      this.editorAround()?.focus();
    }
  }

  /** the chosen corner when the focus last followed the choice */
  private followed: number | null = null;

  /** the focusable element the plan sits in (the page's plan editor), if any */
  private editorAround(): HTMLElement | null {
    return this.host.nativeElement.parentElement?.closest<HTMLElement>('[tabindex]') ?? null;
  }
}
