import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  output,
  signal,
  untracked,
} from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import {
  FormBuilder,
  ReactiveFormsModule,
  Validators,
  type AbstractControl,
  type FormControl,
  type ValidatorFn,
} from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { ErrorStateMatcher, MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatSelect } from '@angular/material/select';
import { designBasisSchema, unitRatesSchema, type CodeFamilyValue } from '@trabeate/contracts';
import { asYouType, fieldErrorText, integer, positive } from '../../shared/forms/field-errors';
import { fieldCountText } from '../../shared/forms/form-error-focus';
import { CODE_FAMILIES } from '../projects/project-labels';
import type { DesignBasis } from './editor-model';

type NumberKey = Exclude<keyof DesignBasis, 'codeFamily' | 'rates' | 'limitOverrides'>;
type RateKey = 'concretePerM3' | 'steelPerKg' | 'formworkPerM2';

interface Field<K extends string> {
  key: K;
  label: string;
  unit: string;
  step: number;
  hint?: string;
}

/** The numbers of the basis, in the order an engineer reads them; limits come from the contract. */
export const BASIS_FIELDS: readonly Field<NumberKey>[] = [
  { key: 'concreteMPa', label: 'Concrete strength', unit: 'MPa', step: 1 },
  { key: 'steelMPa', label: 'Reinforcement yield strength', unit: 'MPa', step: 5 },
  { key: 'imposedKPa', label: 'Imposed floor load', unit: 'kPa', step: 0.1 },
  { key: 'roofImposedKPa', label: 'Imposed roof load', unit: 'kPa', step: 0.1, hint: 'Optional' },
  { key: 'superimposedDeadKPa', label: 'Superimposed dead load', unit: 'kPa', step: 0.1 },
  { key: 'wallLoadKNPerM', label: 'Wall load on walled beams', unit: 'kN/m', step: 0.5 },
  { key: 'bearingPressureKPa', label: 'Allowable bearing pressure', unit: 'kPa', step: 5 },
  { key: 'foundingDepthM', label: 'Founding depth', unit: 'm', step: 0.1 },
  { key: 'storeys', label: 'Storeys', unit: '', step: 1 },
  { key: 'storeyHeightM', label: 'Storey height', unit: 'm', step: 0.1 },
  { key: 'beamWidthMm', label: 'Beam width', unit: 'mm', step: 25 },
  { key: 'slabThicknessMm', label: 'Slab thickness', unit: 'mm', step: 5, hint: 'Optional; the engine sizes it' },
  {
    key: 'alphaCc',
    label: 'αcc',
    unit: '',
    step: 0.05,
    hint: 'EN 1992-1-1 §3.1.6(1); the national annex chooses. Empty: 1.0',
  },
];

export const RATE_FIELDS: readonly Field<RateKey>[] = [
  { key: 'concretePerM3', label: 'Concrete', unit: 'm³', step: 1 },
  { key: 'steelPerKg', label: 'Reinforcement', unit: 'kg', step: 0.01 },
  { key: 'formworkPerM2', label: 'Formwork', unit: 'm²', step: 0.5 },
];

/** Fields the contract lets a scheme leave out. */
const OPTIONAL = new Set<NumberKey>(['roofImposedKPa', 'slabThicknessMm', 'alphaCc']);

interface NumberRule {
  minValue: number | null;
  maxValue: number | null;
  isInt: boolean;
  safeParse(v: unknown): { success: boolean };
}

/**
 * The Angular validators for one number of the contract's schema, read from the schema itself
 * (its minimum, whether that minimum is excluded, its maximum, whole numbers), so the panel
 * refuses as it is typed exactly what the server would refuse on save.
 */
export function contractValidators(rule: NumberRule, required: boolean): ValidatorFn[] {
  const out: ValidatorFn[] = required ? [Validators.required] : [];
  if (rule.isInt) out.push(integer);
  if (rule.minValue !== null) {
    // a minimum the schema excludes (positive()) is "more than"; the contract uses it only at 0
    if (rule.safeParse(rule.minValue).success) out.push(Validators.min(rule.minValue));
    else out.push(rule.minValue === 0 ? positive : Validators.min(rule.minValue + Number.EPSILON));
  }
  if (rule.maxValue !== null) out.push(Validators.max(rule.maxValue));
  return out;
}

const shape = designBasisSchema.shape;
const numberRule = (key: NumberKey): NumberRule => {
  const s = shape[key];
  return ('unwrap' in s ? s.unwrap() : s) as unknown as NumberRule;
};
const rateRule = (key: RateKey): NumberRule => unitRatesSchema.shape[key] as unknown as NumberRule;

/**
 * The open scheme's design basis: code family, materials, loads, soil, storeys, beam width, αcc
 * for EN 1992 and the unit rates the costs use. Each value is held to the contract's limits as it
 * is typed; Apply hands the whole basis to the page, which makes it one undoable edit. The
 * currency is the project's and is shown, not edited here.
 */
@Component({
  selector: 'tb-scheme-basis-panel',
  imports: [
    ReactiveFormsModule,
    MatButton,
    MatError,
    MatFormField,
    MatHint,
    MatInput,
    MatLabel,
    MatOption,
    MatSelect,
    MatSuffix,
  ],
  providers: [{ provide: ErrorStateMatcher, useValue: asYouType }],
  templateUrl: './scheme-basis-panel.html',
  styleUrl: './scheme-basis-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SchemeBasisPanel {
  readonly basis = input.required<DesignBasis>();
  readonly editable = input(false);
  /** a checked basis, ready to be the document's */
  readonly apply = output<DesignBasis>();

  private readonly fb = inject(FormBuilder).nonNullable;
  protected readonly codeFamilies = CODE_FAMILIES;
  protected readonly fields = BASIS_FIELDS;
  protected readonly rateFields = RATE_FIELDS;

  protected readonly form = this.fb.group({
    codeFamily: this.fb.control<CodeFamilyValue>('EN1992', Validators.required),
    numbers: this.fb.group(
      Object.fromEntries(
        BASIS_FIELDS.map((f) => [
          f.key,
          this.fb.control<number | null>(null, contractValidators(numberRule(f.key), !OPTIONAL.has(f.key))),
        ]),
      ) as Record<NumberKey, FormControl<number | null>>,
    ),
    rates: this.fb.group(
      Object.fromEntries(
        RATE_FIELDS.map((f) => [
          f.key,
          this.fb.control<number | null>(null, contractValidators(rateRule(f.key), true)),
        ]),
      ) as Record<RateKey, FormControl<number | null>>,
    ),
  });

  private readonly family = toSignal(this.form.controls.codeFamily.valueChanges, {
    initialValue: this.form.controls.codeFamily.value,
  });
  /** αcc belongs to EN 1992 alone */
  protected readonly shownFields = computed(() =>
    this.fields.filter((f) => f.key !== 'alphaCc' || this.family() === 'EN1992'),
  );
  protected readonly formError = signal('');

  constructor() {
    // The document's basis fills the panel: when the scheme opens, after Apply, after an undo.
    effect(() => {
      const b = this.basis();
      // only the basis drives this: the form's own state must not re-fill it while someone types
      untracked(() => this.fill(b));
    });
    // Read-only for those who may not edit; αcc takes part only under EN 1992.
    effect(() => {
      const family = this.family();
      const editable = this.editable();
      untracked(() => {
        if (!editable) return this.form.disable();
        this.form.enable({ emitEvent: false });
        if (family !== 'EN1992') this.form.controls.numbers.controls.alphaCc.disable({ emitEvent: false });
      });
    });
  }

  protected currency(): string {
    return this.basis().rates.currency;
  }

  protected err(path: string, label: string, unit = ''): string {
    return fieldErrorText(this.form.get(path), label, unit);
  }

  protected submit(): void {
    this.formError.set('');
    const family = this.form.controls.codeFamily.value;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      const n = countInvalid(this.form);
      this.formError.set(`${fieldCountText(n)} The basis is not applied yet.`);
      return;
    }
    const v = this.form.getRawValue();
    const numbers: Partial<Record<NumberKey, number>> = {};
    for (const f of BASIS_FIELDS) {
      const x = v.numbers[f.key];
      // αcc is hidden, and not sent, for the other code families
      if (x !== null && !(f.key === 'alphaCc' && family !== 'EN1992')) numbers[f.key] = x;
    }
    const old = this.basis();
    const next = {
      ...(old.limitOverrides ? { limitOverrides: old.limitOverrides } : {}),
      codeFamily: family,
      ...numbers,
      rates: { currency: old.rates.currency, ...v.rates },
    };
    // the contract has the last word: what it refuses never reaches the document
    const parsed = designBasisSchema.safeParse(next);
    if (!parsed.success) {
      this.formError.set(
        `The basis is not applied: ${parsed.error.issues[0].path.join('.')} ${parsed.error.issues[0].message}`,
      );
      return;
    }
    this.apply.emit(parsed.data);
  }

  /** Back to the document's basis, dropping what was typed. */
  protected revert(): void {
    this.fill(this.basis());
  }

  private fill(b: DesignBasis): void {
    this.form.reset({
      codeFamily: b.codeFamily,
      numbers: Object.fromEntries(BASIS_FIELDS.map((f) => [f.key, b[f.key] ?? null])),
      rates: {
        concretePerM3: b.rates.concretePerM3,
        steelPerKg: b.rates.steelPerKg,
        formworkPerM2: b.rates.formworkPerM2,
      },
    });
    this.formError.set('');
  }
}

function countInvalid(c: AbstractControl): number {
  const children =
    'controls' in c ? Object.values((c as unknown as { controls: Record<string, AbstractControl> }).controls) : [];
  if (!children.length) return c.invalid ? 1 : 0;
  return children.reduce((n, x) => n + countInvalid(x), 0);
}
