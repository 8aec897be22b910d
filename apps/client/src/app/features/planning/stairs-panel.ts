import { ChangeDetectionStrategy, Component, input, output, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, type AbstractControl, type ValidatorFn } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatSelect } from '@angular/material/select';
import { stairFlightSchema, type SchemeDocument } from '@trabeate/contracts';
import type { z } from 'zod';
import { asYouType, fieldErrorText } from '../../shared/forms/field-errors';

type Flight = SchemeDocument['stairs'][number];
/** A flight as the form gives it: the id is absent for a new one. */
export type FlightDraft = Omit<Flight, 'id'> & { id?: string };

const USE_LABELS: Record<Flight['use'], string> = { residential: 'Residential', other: 'Other buildings' };

/**
 * A field checked by the contract's own schema for it, so the form refuses exactly what the API
 * would refuse; the zod issue is turned into the app's error keys for `fieldErrorText`.
 */
function bySchema(schema: z.ZodType): ValidatorFn {
  return (c: AbstractControl) => {
    if (c.value === null || c.value === '') return { required: true };
    const r = schema.safeParse(c.value);
    if (r.success) return null;
    const issue = r.error.issues[0];
    if (issue.code === 'too_small')
      return Number(issue.minimum) === 0 && !issue.inclusive ? { positive: true } : { min: { min: issue.minimum } };
    if (issue.code === 'too_big') return { max: { max: issue.maximum } };
    if (issue.code === 'invalid_type' && issue.expected === 'int') return { integer: true };
    return { hint: 'Not a value a stair flight can have.' };
  };
}

const shape = stairFlightSchema.shape;
const newForm = () =>
  new FormGroup({
    riserMm: new FormControl<number | null>(null, bySchema(shape.riserMm)),
    treadMm: new FormControl<number | null>(null, bySchema(shape.treadMm)),
    risers: new FormControl<number | null>(null, bySchema(shape.risers)),
    widthM: new FormControl<number | null>(null, bySchema(shape.widthM)),
    use: new FormControl<Flight['use']>('residential', { nonNullable: true }),
  });

/**
 * The scheme's stair flights: each listed with its geometry, edited in a form that checks every
 * field as it is typed against the contract's limits, added and removed. The engine's stair checks
 * stay where they are (the check list and the results below the plan).
 */
@Component({
  selector: 'tb-stairs-panel',
  imports: [MatButton, MatError, MatFormField, MatIcon, MatInput, MatLabel, MatOption, MatSelect, ReactiveFormsModule],
  template: `
    <fieldset data-testid="stairs-panel">
      <legend>Stair flights</legend>
      @if (flights().length === 0) {
        <p class="muted" data-testid="stairs-empty">No stair flights in this scheme.</p>
      }
      <ul class="flights">
        @for (f of flights(); track f.id) {
          <li [class.editing]="editing() === f.id" data-testid="stair-row">
            <span class="what">
              <strong>{{ f.id }}</strong>: {{ f.risers }} risers of {{ f.riserMm }} mm, treads {{ f.treadMm }} mm,
              {{ f.widthM }} m wide,
              {{ useLabels[f.use] }}
            </span>
            @if (editable()) {
              <button mat-button type="button" (click)="edit(f)" data-testid="stair-edit">
                <mat-icon>edit</mat-icon> Edit
              </button>
              <button
                mat-button
                type="button"
                (click)="remove.emit(f.id)"
                [attr.aria-label]="'Remove flight ' + f.id"
                data-testid="stair-delete"
              >
                <mat-icon>delete</mat-icon> Remove
              </button>
            }
          </li>
        }
      </ul>
      @if (editable()) {
        @if (editing() === null) {
          <button mat-stroked-button type="button" (click)="startNew()" data-testid="stair-add">
            <mat-icon>add</mat-icon> Add a flight
          </button>
        } @else {
          <form [formGroup]="form" (ngSubmit)="submit()" class="flight-form" data-testid="stair-form" novalidate>
            <p class="form-title">{{ editing() === 'new' ? 'New flight' : 'Flight ' + editing() }}</p>
            <mat-form-field subscriptSizing="dynamic">
              <mat-label>Riser (mm)</mat-label>
              <input
                matInput
                type="number"
                formControlName="riserMm"
                [errorStateMatcher]="asYouType"
                data-testid="stair-riser"
              />
              <mat-error data-testid="stair-riser-error">{{ err('riserMm', 'The riser', 'mm') }}</mat-error>
            </mat-form-field>
            <mat-form-field subscriptSizing="dynamic">
              <mat-label>Tread (mm)</mat-label>
              <input
                matInput
                type="number"
                formControlName="treadMm"
                [errorStateMatcher]="asYouType"
                data-testid="stair-tread"
              />
              <mat-error>{{ err('treadMm', 'The tread', 'mm') }}</mat-error>
            </mat-form-field>
            <mat-form-field subscriptSizing="dynamic">
              <mat-label>Risers</mat-label>
              <input
                matInput
                type="number"
                formControlName="risers"
                [errorStateMatcher]="asYouType"
                data-testid="stair-risers"
              />
              <mat-error data-testid="stair-risers-error">{{ err('risers', 'The number of risers') }}</mat-error>
            </mat-form-field>
            <mat-form-field subscriptSizing="dynamic">
              <mat-label>Width (m)</mat-label>
              <input
                matInput
                type="number"
                formControlName="widthM"
                [errorStateMatcher]="asYouType"
                data-testid="stair-width"
              />
              <mat-error>{{ err('widthM', 'The width', 'm') }}</mat-error>
            </mat-form-field>
            <mat-form-field subscriptSizing="dynamic">
              <mat-label>Use</mat-label>
              <mat-select formControlName="use" data-testid="stair-use">
                <mat-option value="residential">{{ useLabels.residential }}</mat-option>
                <mat-option value="other">{{ useLabels.other }}</mat-option>
              </mat-select>
            </mat-form-field>
            <div class="actions">
              <button mat-flat-button type="submit" data-testid="stair-save">
                {{ editing() === 'new' ? 'Add flight' : 'Apply' }}
              </button>
              <button mat-button type="button" (click)="cancel()" data-testid="stair-cancel">Cancel</button>
              @if (refused()) {
                <span class="field-error" role="alert" data-testid="stair-form-error">
                  Fix the marked fields first.
                </span>
              }
            </div>
          </form>
        }
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
    .flights {
      list-style: none;
      margin: 0 0 6px;
      padding: 0;
    }
    .flights li {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 6px;
      padding: 4px 0;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    .flights li.editing {
      border-left: 4px solid var(--mat-sys-primary);
      padding-left: 6px;
    }
    .what {
      flex: 1 1 16rem;
    }
    .flight-form {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      align-items: flex-start;
    }
    .flight-form mat-form-field {
      width: 9rem;
    }
    .form-title {
      width: 100%;
      margin: 0;
      font-weight: 600;
    }
    .actions {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      gap: 8px;
      width: 100%;
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
    .field-error {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StairsPanel {
  readonly flights = input.required<SchemeDocument['stairs']>();
  readonly editable = input(false);
  /** a flight to add (no id) or to change (with its id) */
  readonly save = output<FlightDraft>();
  readonly remove = output<string>();

  protected readonly useLabels = USE_LABELS;
  protected readonly asYouType = asYouType;
  /** the flight in the form: its id, 'new', or null when the form is closed */
  protected readonly editing = signal<string | null>(null);
  protected readonly refused = signal(false);
  protected readonly form = newForm();

  protected err(name: 'riserMm' | 'treadMm' | 'risers' | 'widthM', label: string, unit = ''): string {
    return fieldErrorText(this.form.controls[name], label, unit);
  }

  protected edit(f: Flight): void {
    this.form.reset({ riserMm: f.riserMm, treadMm: f.treadMm, risers: f.risers, widthM: f.widthM, use: f.use });
    this.refused.set(false);
    this.editing.set(f.id);
  }

  protected startNew(): void {
    // a start the engineer changes: common practice for a dwelling's stair, no source
    this.form.reset({ riserMm: 170, treadMm: 260, risers: 9, widthM: 1, use: 'residential' });
    this.refused.set(false);
    this.editing.set('new');
  }

  protected cancel(): void {
    this.editing.set(null);
  }

  protected submit(): void {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      this.refused.set(true);
      return;
    }
    const v = this.form.getRawValue();
    const id = this.editing();
    const draft: FlightDraft = {
      riserMm: v.riserMm as number,
      treadMm: v.treadMm as number,
      risers: v.risers as number,
      widthM: v.widthM as number,
      use: v.use,
      ...(id && id !== 'new' ? { id } : {}),
    };
    this.save.emit(draft);
    this.editing.set(null);
  }
}
