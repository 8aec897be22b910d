import { HttpErrorResponse, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { AbstractControl, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { ErrorStateMatcher, MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { MatSelect } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import type { ProjectCreate, ProjectPage } from '@trabeate/contracts';
import { errorMessage, fieldErrorsByPath } from '../../core/auth/api-error';
import { Notice } from '../../core/notice';
import { asYouType, fieldErrorText, integer, patternWithHint, positive } from '../../shared/forms/field-errors';
import { CODE_FAMILIES, CodeFamily } from './project-labels';
import { ProjectsApi, projectUrl } from './projects-api';
import { fieldCountText, formErrorFocus } from '../../shared/forms/form-error-focus';
import { fillOnce } from '../../shared/forms/fill-once';

const notBlank = (c: AbstractControl) =>
  typeof c.value === 'string' && c.value && !c.value.trim() ? { whitespace: true } : null;

// The limits mirror projectWriteSchema in libs/contracts (the server checks the same again).
const REFERENCE = /^[A-Za-z0-9][A-Za-z0-9._/-]*$/;
const CURRENCY = /^[A-Z]{3}$/;
/** A unit rate: the bounds of projectUnitRatesSchema. */
const RATE = [Validators.required, Validators.min(0), Validators.max(1e9)];

/** Create or edit a project (principal). With `projectId` it edits; without, it creates. */
@Component({
  selector: 'tb-project-form-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButton,
    MatError,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    MatOption,
    MatProgressSpinner,
    MatSelect,
    MatSuffix,
  ],
  providers: [{ provide: ErrorStateMatcher, useValue: asYouType }],
  templateUrl: './project-form-page.html',
  styleUrls: ['../../shared/page/page.scss', './project-form-page.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectFormPage {
  private readonly fb = inject(NonNullableFormBuilder);
  private readonly api = inject(ProjectsApi);
  private readonly router = inject(Router);
  private readonly notice = inject(Notice);
  private readonly reportInvalid = formErrorFocus();

  /** Route-bound `:projectId`; absent on /projects/new. */
  readonly projectId = input<string>();
  protected readonly editing = computed(() => !!this.projectId());

  protected readonly existing = httpResource<ProjectPage>(() => {
    const id = this.projectId();
    return id ? `${projectUrl(id)}/full` : undefined;
  });
  protected readonly organisations = httpResource<{ id: string; name: string }[]>(() => '/api/client-organisations');

  protected readonly codeFamilies = CODE_FAMILIES;

  // Starting values are common practice for a framed RC building; the engineer sets the real ones.
  protected readonly form = this.fb.group({
    reference: [
      '',
      [
        Validators.required,
        Validators.minLength(2),
        Validators.maxLength(32),
        notBlank,
        patternWithHint(REFERENCE, 'Use letters, digits and . _ / - only, starting with a letter or digit.'),
      ],
    ],
    name: ['', [Validators.required, Validators.maxLength(160), notBlank]],
    clientOrganisationId: ['', Validators.required],
    siteAddress: ['', Validators.maxLength(300)],
    buildingUse: ['', Validators.maxLength(300)],
    storeys: [4, [Validators.required, integer, Validators.min(1), Validators.max(200)]],
    storeyHeightM: [3.0, [Validators.required, Validators.min(2), Validators.max(12)]],
    floorAreaM2: this.fb.control<number | null>(null, [positive, Validators.max(10_000_000)]),
    estimatedCost: this.fb.control<number | null>(null, [Validators.min(0), Validators.max(1e13)]),
    currency: ['EUR', [Validators.required, patternWithHint(CURRENCY, 'A three-letter currency code such as EUR.')]],
    designBasis: this.fb.group({
      codeFamily: this.fb.control<CodeFamily>('EN1992', Validators.required),
      concreteMPa: [30, [Validators.required, Validators.min(10), Validators.max(120)]],
      steelMPa: [500, [Validators.required, Validators.min(200), Validators.max(700)]],
      imposedKPa: [2, [Validators.required, Validators.min(0), Validators.max(50)]],
      superimposedDeadKPa: [1.5, [Validators.required, Validators.min(0), Validators.max(50)]],
      bearingPressureKPa: [150, [Validators.required, positive, Validators.max(5000)]],
      foundingDepthM: [1.5, [Validators.required, Validators.min(0), Validators.max(30)]],
      // No starting rates: prices are the firm's own, and a made-up one would price every scheme.
      rates: this.fb.group({
        concretePerM3: this.fb.control<number | null>(null, RATE),
        steelPerKg: this.fb.control<number | null>(null, RATE),
        formworkPerM2: this.fb.control<number | null>(null, RATE),
      }),
    }),
  });

  protected readonly saving = signal(false);
  protected readonly formError = signal('');

  constructor() {
    // Fill the form once when editing; later reloads must not overwrite what the user typed.
    fillOnce(this.existing, (p) =>
      this.form.reset({
        reference: p.reference,
        name: p.name,
        clientOrganisationId: p.clientOrganisation.id,
        siteAddress: p.siteAddress,
        buildingUse: p.buildingUse,
        storeys: p.storeys,
        storeyHeightM: p.storeyHeightM,
        floorAreaM2: p.floorAreaM2,
        estimatedCost: p.finance?.estimatedCost ?? null,
        currency: p.finance?.currency ?? 'EUR',
        ...(p.designBasis ? { designBasis: p.designBasis } : {}),
      }),
    );
  }

  /** The currency the rates are in, as typed, for their suffixes. */
  protected rateUnit(per: string): string {
    const c = this.form.controls.currency.value.trim();
    return `${CURRENCY.test(c) ? c : '…'}/${per}`;
  }

  protected err(path: string, label: string, unit = ''): string {
    return fieldErrorText(this.form.get(path), label, unit);
  }

  protected message(err: unknown): string {
    return errorMessage(err);
  }

  async save(): Promise<void> {
    // One request at a time: a second click while the first is on its way does nothing.
    if (this.saving()) return;
    this.formError.set('');
    if (this.form.invalid) {
      const n = this.reportInvalid(this.form);
      this.formError.set(`${fieldCountText(n)} The project is not saved yet.`);
      return;
    }
    this.saving.set(true);
    const v = this.form.getRawValue();
    const { concretePerM3, steelPerKg, formworkPerM2 } = v.designBasis.rates;
    const body: ProjectCreate = {
      ...v,
      siteAddress: v.siteAddress.trim(),
      buildingUse: v.buildingUse.trim(),
      // required above, so none is null once the form is valid
      designBasis: {
        ...v.designBasis,
        rates: { concretePerM3: concretePerM3 ?? 0, steelPerKg: steelPerKg ?? 0, formworkPerM2: formworkPerM2 ?? 0 },
      },
    };
    try {
      const id = this.projectId();
      if (id) {
        await this.api.update(id, body);
        this.notice.show('Project saved.', 4000);
        await this.router.navigate(['/projects', id]);
      } else {
        const created = await this.api.create(body);
        this.notice.show(`Project ${created.reference} created.`, 4000);
        await this.router.navigate(['/projects', created.id]);
      }
    } catch (err) {
      this.showServerErrors(err);
    } finally {
      this.saving.set(false);
    }
  }

  private showServerErrors(err: unknown): void {
    const unmatched: string[] = [];
    for (const [path, text] of Object.entries(fieldErrorsByPath(err))) {
      const control = this.form.get(path);
      if (control) {
        control.setErrors({ ...(control.errors ?? {}), server: text });
        control.markAsTouched();
      } else unmatched.push(text);
    }
    const status = err instanceof HttpErrorResponse ? err.status : 0;
    // 401 and 403 are announced by the interceptor; the rest is said here, beside the form.
    if (status === 401 || status === 403) return;
    this.formError.set(unmatched[0] ?? errorMessage(err));
  }
}
