import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import type { SchemeDocument } from '@trabeate/contracts';
import { MIN_BOUNDARY_VERTICES, PLAN_COORD_M, typedCoordinate } from './editor-model';
import type { VertexDrop } from './plan-view';

/**
 * The plot outline as a list: each corner with its typed coordinates, and after it the side that
 * runs to the next corner, marked as a property line or not, with a way to add a corner on it.
 * The page turns every event into an editor-model step (undo and redo like any other edit).
 */
@Component({
  selector: 'tb-boundary-panel',
  imports: [MatButton, MatCheckbox, MatFormField, MatIcon, MatIconButton, MatInput, MatLabel],
  template: `
    <fieldset class="boundary" data-testid="boundary-panel">
      <legend>Plot boundary</legend>
      <p class="hint">
        Drag a corner on the plan (it snaps like a column) or type its coordinates. A plot keeps at least
        {{ minCorners }} corners.
      </p>
      <ol class="corners">
        @for (c of rows(); track $index) {
          <li [class.chosen]="c.chosen" data-testid="boundary-corner">
            <div class="corner">
              <button
                mat-button
                type="button"
                class="pick"
                [attr.aria-pressed]="c.chosen"
                (click)="choose.emit($index)"
                data-testid="corner-pick"
              >
                Corner {{ $index + 1 }}
              </button>
              <mat-form-field subscriptSizing="dynamic">
                <mat-label>x (m)</mat-label>
                <input
                  matInput
                  inputmode="decimal"
                  [value]="c.x"
                  [disabled]="!editable()"
                  (change)="typed($index, 'x', $any($event.target).value)"
                  data-testid="corner-x"
                />
              </mat-form-field>
              <mat-form-field subscriptSizing="dynamic">
                <mat-label>y (m)</mat-label>
                <input
                  matInput
                  inputmode="decimal"
                  [value]="c.y"
                  [disabled]="!editable()"
                  (change)="typed($index, 'y', $any($event.target).value)"
                  data-testid="corner-y"
                />
              </mat-form-field>
              <button
                mat-icon-button
                type="button"
                [disabled]="!editable() || rows().length <= minCorners"
                [attr.aria-label]="'Remove corner ' + ($index + 1)"
                (click)="remove.emit($index)"
                data-testid="corner-delete"
              >
                <mat-icon>delete</mat-icon>
              </button>
            </div>
            <div class="side" data-testid="boundary-side">
              <mat-checkbox
                [checked]="c.property"
                [disabled]="!editable()"
                (change)="toggleProperty.emit($index)"
                data-testid="side-property"
              >
                Side {{ $index + 1 }}–{{ c.next }} is a property line
              </mat-checkbox>
              <button
                mat-button
                type="button"
                [disabled]="!editable()"
                (click)="insert.emit($index)"
                data-testid="side-add-corner"
              >
                <mat-icon>add</mat-icon> Corner on this side
              </button>
            </div>
          </li>
        }
      </ol>
      @if (error(); as m) {
        <p class="field-error" role="alert" data-testid="boundary-error">
          <mat-icon aria-hidden="true">error</mat-icon> {{ m }}
        </p>
      }
    </fieldset>
  `,
  styles: `
    fieldset {
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: 8px;
      padding: 8px 12px 12px;
      margin: 8px 0;
    }
    .field-error {
      display: flex;
      align-items: center;
      gap: 4px;
      margin: 4px 0 0;
      color: var(--mat-sys-error);
    }
    .corners {
      list-style: none;
      margin: 0;
      padding: 0;
    }
    .corners li {
      border-bottom: 1px solid var(--mat-sys-outline-variant);
      padding: 4px 0;
    }
    .corners li.chosen {
      border-left: 4px solid var(--mat-sys-primary);
      padding-left: 6px;
    }
    .corner,
    .side {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 6px;
    }
    .corner mat-form-field {
      width: 8rem;
    }
    .side {
      padding-left: 1rem;
    }
    .hint {
      margin: 0 0 6px;
      font-size: var(--tb-type-caption);
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BoundaryPanel {
  readonly boundary = input.required<SchemeDocument['boundary']>();
  /** index of the chosen corner, or null */
  readonly chosen = input<number | null>(null);
  readonly editable = input(false);
  readonly choose = output<number>();
  readonly move = output<VertexDrop>();
  readonly insert = output<number>();
  readonly remove = output<number>();
  readonly toggleProperty = output<number>();

  protected readonly minCorners = MIN_BOUNDARY_VERTICES;
  protected readonly error = signal<string | null>(null);
  protected readonly rows = computed(() => {
    const { vertices, propertyLines } = this.boundary();
    const marked = new Set(propertyLines);
    return vertices.map((v, i) => ({
      x: v.x,
      y: v.y,
      next: ((i + 1) % vertices.length) + 1,
      property: marked.has(i),
      chosen: this.chosen() === i,
    }));
  });

  /** a typed coordinate: a number within the scheme's plan limits, else a message and no change */
  protected typed(index: number, axis: 'x' | 'y', text: string): void {
    const v = typedCoordinate(text);
    if (v === null) {
      this.error.set(`A corner coordinate is a number of metres between −${PLAN_COORD_M} and ${PLAN_COORD_M}.`);
      return;
    }
    this.error.set(null);
    const at = this.boundary().vertices[index];
    if (at) this.move.emit({ index, x: axis === 'x' ? v : at.x, y: axis === 'y' ? v : at.y });
  }
}
