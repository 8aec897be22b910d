import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
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
        <svg:rect
          class="vertex"
          [class.sel]="chosenVertex() === $index"
          [attr.x]="v.x - b0.minX - 0.22"
          [attr.y]="b0.minY + b0.height - v.y - 0.22"
          width="0.44"
          height="0.44"
          [attr.data-vertex]="$index"
          (pointerdown)="press.emit({ event: $event, part: { kind: 'vertex', index: $index } })"
        >
          <svg:title>Boundary corner {{ $index + 1 }} at x {{ v.x }} m, y {{ v.y }} m</svg:title>
        </svg:rect>
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
  readonly press = output<PartPress>();

  protected readonly vertices = computed(() => this.boundary().vertices);
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
}
