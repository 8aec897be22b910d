import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatSelect } from '@angular/material/select';
import type { SchemeDocument } from '@trabeate/contracts';
import { PLAN_COORD_M, SECONDARY_MIN_M, typedCoordinate } from './editor-model';

type Pt = { x: number; y: number };
/** A secondary beam as typed: the axis it runs along, the line it sits on, and where it runs from and to. */
export interface SecondaryEnds {
  id?: string;
  start: Pt;
  end: Pt;
}
/** Where placing a beam on the plan has got to: off, waiting for the first end, or for the second. */
export type PlacingStep = 'off' | 'start' | 'end';

type Field = 'at' | 'from' | 'to';
interface Row {
  id: string;
  runs: 'x' | 'y';
  at: number;
  from: number;
  to: number;
}

const rowOf = (b: { id: string; start: Pt; end: Pt }): Row => {
  const runs: 'x' | 'y' = Math.abs(b.end.x - b.start.x) >= Math.abs(b.end.y - b.start.y) ? 'x' : 'y';
  const cross = runs === 'x' ? 'y' : 'x';
  return { id: b.id, runs, at: b.start[cross], from: b.start[runs], to: b.end[runs] };
};
const endsOf = (r: Omit<Row, 'id'>): { start: Pt; end: Pt } =>
  r.runs === 'x'
    ? { start: { x: r.from, y: r.at }, end: { x: r.to, y: r.at } }
    : { start: { x: r.at, y: r.from }, end: { x: r.at, y: r.to } };

/**
 * The scheme's secondary beams, each typed as the line it sits on and where it runs from and to,
 * so a typed beam always runs along x or y as the engine needs; a new one is typed the same way or
 * placed on the plan by two presses (the page snaps them). Every change is an editor-model step.
 */
@Component({
  selector: 'tb-secondary-beams-panel',
  imports: [MatButton, MatFormField, MatIcon, MatIconButton, MatInput, MatLabel, MatOption, MatSelect],
  template: `
    <fieldset data-testid="secondary-panel">
      <legend>Secondary beams</legend>
      @if (rows().length === 0) {
        <p class="muted" data-testid="secondary-empty">No secondary beams: every slab spans between grid beams.</p>
      }
      <ul class="beams">
        @for (r of rows(); track r.id) {
          <li [class.chosen]="r.id === chosen()" data-testid="secondary-row">
            <button
              mat-button
              type="button"
              [attr.aria-pressed]="r.id === chosen()"
              (click)="choose.emit(r.id)"
              data-testid="secondary-pick"
            >
              {{ r.id }}
            </button>
            <span class="runs">along {{ r.runs }}</span>
            <mat-form-field subscriptSizing="dynamic">
              <mat-label>on {{ cross(r.runs) }} (m)</mat-label>
              <input
                matInput
                inputmode="decimal"
                [value]="r.at"
                [disabled]="!editable()"
                (change)="typed(r, 'at', $any($event.target).value)"
                data-testid="secondary-at"
              />
            </mat-form-field>
            <mat-form-field subscriptSizing="dynamic">
              <mat-label>from {{ r.runs }} (m)</mat-label>
              <input
                matInput
                inputmode="decimal"
                [value]="r.from"
                [disabled]="!editable()"
                (change)="typed(r, 'from', $any($event.target).value)"
                data-testid="secondary-from"
              />
            </mat-form-field>
            <mat-form-field subscriptSizing="dynamic">
              <mat-label>to {{ r.runs }} (m)</mat-label>
              <input
                matInput
                inputmode="decimal"
                [value]="r.to"
                [disabled]="!editable()"
                (change)="typed(r, 'to', $any($event.target).value)"
                data-testid="secondary-to"
              />
            </mat-form-field>
            <button
              mat-icon-button
              type="button"
              [disabled]="!editable()"
              [attr.aria-label]="'Remove secondary beam ' + r.id"
              (click)="remove.emit(r.id)"
              data-testid="secondary-delete"
            >
              <mat-icon>delete</mat-icon>
            </button>
          </li>
        }
      </ul>
      @if (editable()) {
        <div class="add" data-testid="secondary-add">
          <mat-form-field subscriptSizing="dynamic">
            <mat-label>Runs along</mat-label>
            <mat-select [value]="newRuns()" (valueChange)="newRuns.set($event)" data-testid="secondary-new-runs">
              <mat-option value="x">x (lettered lines)</mat-option>
              <mat-option value="y">y (numbered lines)</mat-option>
            </mat-select>
          </mat-form-field>
          <mat-form-field subscriptSizing="dynamic">
            <mat-label>on {{ cross(newRuns()) }} (m)</mat-label>
            <input matInput inputmode="decimal" #na data-testid="secondary-new-at" />
          </mat-form-field>
          <mat-form-field subscriptSizing="dynamic">
            <mat-label>from {{ newRuns() }} (m)</mat-label>
            <input matInput inputmode="decimal" #nf data-testid="secondary-new-from" />
          </mat-form-field>
          <mat-form-field subscriptSizing="dynamic">
            <mat-label>to {{ newRuns() }} (m)</mat-label>
            <input matInput inputmode="decimal" #nt data-testid="secondary-new-to" />
          </mat-form-field>
          <button
            mat-stroked-button
            type="button"
            (click)="addTyped(na.value, nf.value, nt.value)"
            data-testid="secondary-add-typed"
          >
            <mat-icon>add</mat-icon> Add beam
          </button>
          <button
            mat-stroked-button
            type="button"
            [attr.aria-pressed]="placing() !== 'off'"
            (click)="place.emit()"
            (keydown.escape)="placing() !== 'off' && place.emit()"
            data-testid="secondary-place"
          >
            <mat-icon>ads_click</mat-icon>
            {{ placing() === 'off' ? 'Place on the plan' : 'Stop placing' }}
          </button>
        </div>
        @if (placing() !== 'off') {
          <p class="hint" role="status" data-testid="secondary-placing">
            {{
              placing() === 'start'
                ? 'Press on the plan where the beam starts.'
                : 'Now press where it ends; it snaps and runs along x or y. Escape stops.'
            }}
          </p>
        }
      }
      @if (error(); as m) {
        <p class="field-error" role="alert" data-testid="secondary-error">
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
    .beams {
      list-style: none;
      margin: 0;
      padding: 0;
    }
    .beams li,
    .add {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 6px;
      padding: 4px 0;
    }
    .beams li {
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    .beams li.chosen {
      border-left: 4px solid var(--mat-sys-primary);
      padding-left: 6px;
    }
    mat-form-field {
      width: 8rem;
    }
    .runs,
    .muted,
    .hint {
      color: var(--mat-sys-on-surface-variant);
      font-size: var(--tb-type-caption);
    }
    .field-error {
      display: flex;
      align-items: center;
      gap: 4px;
      margin: 4px 0 0;
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SecondaryBeamsPanel {
  readonly beams = input.required<SchemeDocument['secondaryBeams']>();
  /** id of the chosen beam, or null */
  readonly chosen = input<string | null>(null);
  readonly editable = input(false);
  readonly placing = input<PlacingStep>('off');
  readonly choose = output<string>();
  readonly update = output<Required<SecondaryEnds>>();
  readonly add = output<SecondaryEnds>();
  readonly remove = output<string>();
  /** starts (or stops) placing a beam on the plan */
  readonly place = output<void>();

  protected readonly rows = computed(() => this.beams().map(rowOf));
  protected readonly newRuns = signal<'x' | 'y'>('x');
  protected readonly error = signal<string | null>(null);
  protected readonly cross = (runs: 'x' | 'y') => (runs === 'x' ? 'y' : 'x');

  protected typed(r: Row, field: Field, text: string): void {
    const v = this.number(text);
    if (v === null) return;
    const next = { ...r, [field]: v };
    if (!this.longEnough(next)) return;
    this.update.emit({ id: r.id, ...endsOf(next) });
  }

  protected addTyped(at: string, from: string, to: string): void {
    const [a, f, t] = [this.number(at), this.number(from), this.number(to)];
    if (a === null || f === null || t === null) return;
    const row = { runs: this.newRuns(), at: a, from: f, to: t };
    if (!this.longEnough(row)) return;
    this.add.emit(endsOf(row));
  }

  private number(text: string): number | null {
    const v = typedCoordinate(text);
    if (v === null)
      this.error.set(`A beam coordinate is a number of metres between −${PLAN_COORD_M} and ${PLAN_COORD_M}.`);
    return v;
  }

  private longEnough(r: { from: number; to: number }): boolean {
    if (Math.abs(r.to - r.from) < SECONDARY_MIN_M) {
      this.error.set(`A secondary beam is at least ${SECONDARY_MIN_M} m long: its ends must differ by that much.`);
      return false;
    }
    this.error.set(null);
    return true;
  }
}
