import { HttpEventType, httpResource } from '@angular/common/http';
import {
  afterNextRender,
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  ElementRef,
  inject,
  Injector,
  input,
  output,
  signal,
} from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { RouterLink } from '@angular/router';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatDatepicker, MatDatepickerInput, MatDatepickerToggle } from '@angular/material/datepicker';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSelect } from '@angular/material/select';
import {
  PURPOSES,
  PURPOSE_LABELS,
  STAGE_TITLES,
  drawingSchema,
  nextRevisionSchema,
  suitabilityMeaning,
  type Drawing,
  type Revision,
  type RevisionAction,
  type RevisionSeries,
} from '@trabeate/contracts';
import { errorMessage } from '../../core/auth/api-error';
import { Session } from '../../core/auth/session';
import { DayPipe, DayTimePipe } from '../../shared/dates/app-dates';
import { formErrorFocus } from '../../shared/forms/form-error-focus';
import { StateMarker } from '../../shared/state-marker/state-marker';
import { DrawingsApi } from './drawings-api';
import { REVISION_STATE_LABELS, formatBytes } from './drawing-labels';
import { fromIsoDay, toIsoDay } from '../../shared/dates/firm-date-adapter';

const SUITABILITY = /^(S[0-4]|A[1-9][0-9]?|CR)$/i;
const today = (): Date | null => fromIsoDay(new Date().toISOString().slice(0, 10));

/** One drawing: its revision history, the actions the caller may take, uploads and a new revision. */
@Component({
  selector: 'tb-drawing-detail',
  imports: [
    DayPipe,
    RouterLink,
    DayTimePipe,
    StateMarker,
    ReactiveFormsModule,
    MatButton,
    MatDatepicker,
    MatDatepickerInput,
    MatDatepickerToggle,
    MatError,
    MatFormField,
    MatHint,
    MatIcon,
    MatInput,
    MatLabel,
    MatOption,
    MatProgressBar,
    MatSelect,
  ],
  template: `
    @if (drawing.error(); as err) {
      <div class="state error" role="alert">
        <mat-icon aria-hidden="true">error</mat-icon>
        <span>The drawing could not be loaded. {{ message(err) }}</span>
        <button mat-stroked-button type="button" (click)="drawing.reload()">Try again</button>
      </div>
    } @else if (drawing.hasValue()) {
      @let d = drawing.value();
      <section class="detail" data-testid="drawing-detail" [attr.aria-label]="'Drawing ' + d.number">
        <header>
          <h2>
            <span class="mono">{{ d.number }}</span> {{ d.title }}
          </h2>
          <p class="muted">{{ stageTitle(d) }} · {{ d.sheetSize }} · {{ d.scale }}</p>
        </header>

        @if (error()) {
          <p class="refusal" role="alert" data-testid="drawing-refusal">
            <mat-icon aria-hidden="true">block</mat-icon> {{ error() }}
          </p>
        }

        <h3>Revisions</h3>
        @if (d.revisions.length === 0) {
          <p class="muted">No revision yet. Register the first one below, then upload its PDF.</p>
        }
        <ol class="revisions" data-testid="revision-history">
          @for (r of d.revisions; track r.id) {
            <li [class.current]="$first">
              <div class="line">
                <strong class="mono code">{{ r.code }}</strong>
                <tb-state-marker [shape]="marker(r).shape" [tone]="marker(r).tone" [attr.data-state]="r.state">{{
                  stateLabel(r)
                }}</tb-state-marker>
                <span [title]="meaning(r.suitability)">{{ r.suitability }} · {{ meaning(r.suitability) }}</span>
                <span>{{ purposeLabel(r) }}</span>
                <span class="muted">{{ r.date | tbDay }}</span>
              </div>
              @if (r.description) {
                <p class="desc">{{ r.description }}</p>
              }
              @if (r.fromScheme; as s) {
                <p class="from-scheme muted" data-testid="revision-from-scheme">
                  Plan sheet drawn from
                  <a [routerLink]="['/projects', projectId(), 'schemes', s.id]">{{ s.name }}</a>, version
                  {{ s.version }}
                </p>
              }
              <p class="people muted">
                Drawn by {{ r.drawnBy.displayName }}
                @if (r.checkedBy) {
                  · checked by {{ r.checkedBy.displayName }}
                }
                @if (r.approvedBy) {
                  · approved by {{ r.approvedBy.displayName }}
                }
                @if (r.issuedAt) {
                  · issued {{ r.issuedAt | tbDayTime }}
                }
              </p>
              <ul class="files">
                @for (f of r.files; track f.id) {
                  <li>
                    <mat-icon aria-hidden="true">{{ f.role === 'pdf' ? 'picture_as_pdf' : 'attach_file' }}</mat-icon>
                    <a [href]="f.downloadUrl" download data-testid="file-download">{{ f.fileName }}</a>
                    <span class="muted">{{ size(f.sizeBytes) }} · SHA-256 {{ f.sha256.slice(0, 12) }}…</span>
                  </li>
                }
              </ul>
              @if (r.state === 'draft' && canWork()) {
                <div class="upload">
                  <!-- The file inputs stay in the tab order (visually hidden, not [hidden]) so the
                       keyboard reaches them; the label shows the focus ring. -->
                  <label class="file-button">
                    <input
                      type="file"
                      class="tb-visually-hidden"
                      accept=".pdf,application/pdf"
                      (change)="upload(r, 'pdf', $event)"
                      data-testid="upload-pdf"
                    />
                    <mat-icon>upload_file</mat-icon> {{ hasPdf(r) ? 'PDF uploaded' : 'Upload the PDF' }}
                  </label>
                  <label class="file-button">
                    <input
                      type="file"
                      class="tb-visually-hidden"
                      (change)="upload(r, 'source', $event)"
                      data-testid="upload-source"
                    />
                    <mat-icon>attach_file</mat-icon> Add a source file
                  </label>
                  @if (progress() !== null) {
                    <mat-progress-bar mode="determinate" [value]="progress()" aria-label="Upload progress" />
                  }
                </div>
              }
              @if (r.allowedActions.length) {
                <div class="actions">
                  @for (a of r.allowedActions; track a) {
                    <button
                      mat-flat-button
                      type="button"
                      [disabled]="busy()"
                      (click)="act(r, a)"
                      [attr.data-testid]="'revision-' + a"
                    >
                      {{ a === 'check' ? 'Mark as checked' : 'Approve' }}
                    </button>
                  }
                </div>
              }
            </li>
          }
        </ol>

        @if (d.canRegisterRevision) {
          <form class="new-revision" [formGroup]="form" (ngSubmit)="register(d)" data-testid="new-revision-form">
            <h3>
              New revision
              @if (next.hasValue()) {
                <span class="mono proposed" data-testid="proposed-code">{{ next.value().code }}</span>
              }
            </h3>
            <mat-form-field>
              <mat-label>Series</mat-label>
              <mat-select formControlName="series">
                <mat-option value="preliminary">Preliminary (shared)</mat-option>
                <mat-option value="contractual">Contractual (authorised)</mat-option>
              </mat-select>
            </mat-form-field>
            <mat-form-field>
              <mat-label>Suitability</mat-label>
              <input matInput formControlName="suitability" maxlength="3" data-testid="revision-suitability" />
              <mat-hint>{{ meaning(form.controls.suitability.value.toUpperCase()) }}</mat-hint>
              @if (form.controls.suitability.invalid) {
                <mat-error>S0–S4 while preliminary; A1–An or CR once contractual</mat-error>
              }
            </mat-form-field>
            <mat-form-field>
              <mat-label>Purpose of issue</mat-label>
              <mat-select formControlName="purpose" data-testid="revision-purpose">
                @for (p of purposes; track p) {
                  <mat-option [value]="p">{{ purposeLabels[p] }}</mat-option>
                }
              </mat-select>
            </mat-form-field>
            <mat-form-field>
              <mat-label>Date</mat-label>
              <input
                matInput
                [matDatepicker]="revisionDatePicker"
                formControlName="date"
                placeholder="e.g. 20 Dec 2026"
                data-testid="revision-date"
              />
              <mat-datepicker-toggle matIconSuffix [for]="revisionDatePicker" />
              <mat-datepicker #revisionDatePicker />
              @if (form.controls.date.invalid) {
                <mat-error>Give the revision's date</mat-error>
              }
            </mat-form-field>
            <mat-form-field class="wide">
              <mat-label>Description</mat-label>
              <input matInput formControlName="description" maxlength="2000" data-testid="revision-description" />
            </mat-form-field>
            <button mat-flat-button type="submit" [disabled]="busy()" data-testid="register-revision">
              Register revision
            </button>
          </form>
        }
      </section>
    } @else {
      <mat-progress-bar mode="indeterminate" aria-label="Loading the drawing" />
    }
  `,
  styleUrls: ['../../shared/page/page.scss', './drawings.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DrawingDetail {
  private readonly api = inject(DrawingsApi);
  private readonly host: ElementRef<HTMLElement> = inject(ElementRef);
  private readonly injector = inject(Injector);
  /** Set once a revision is registered: its PDF upload takes the focus when the drawing reloads. */
  private focusUploadNext = false;
  private readonly session = inject(Session);
  readonly projectId = input.required<string>();
  readonly drawingId = input.required<string>();
  /** Something in the register changed (a revision, a state): the list should reload. */
  readonly changed = output<void>();

  private readonly showErrors = formErrorFocus();
  protected readonly canWork = computed(() => this.session.role() !== 'client');
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly progress = signal<number | null>(null);
  protected readonly purposes = PURPOSES;
  protected readonly purposeLabels = PURPOSE_LABELS;

  protected readonly drawing = httpResource<Drawing>(
    () => `/api/projects/${encodeURIComponent(this.projectId())}/drawings/${encodeURIComponent(this.drawingId())}`,
    { parse: (x) => drawingSchema.parse(x) },
  );

  protected readonly form = inject(FormBuilder).nonNullable.group({
    series: ['preliminary' as RevisionSeries],
    suitability: ['S2', [Validators.required, Validators.pattern(SUITABILITY)]],
    purpose: ['information' as (typeof PURPOSES)[number], Validators.required],
    date: [today(), Validators.required],
    description: [''],
  });
  private readonly series = signal<RevisionSeries>('preliminary');

  protected readonly next = httpResource(
    () =>
      this.drawing.hasValue() && this.drawing.value().canRegisterRevision
        ? {
            url: `/api/projects/${encodeURIComponent(this.projectId())}/drawings/${encodeURIComponent(this.drawingId())}/next-revision`,
            params: { series: this.series() },
          }
        : undefined,
    { parse: (x) => nextRevisionSchema.parse(x) },
  );

  constructor() {
    effect(() => {
      if (!this.drawing.hasValue()) return;
      this.drawing.value(); // a new value: the reload after registering has arrived
      if (!this.focusUploadNext) return;
      this.focusUploadNext = false;
      afterNextRender(
        () => this.host.nativeElement.querySelector<HTMLInputElement>('[data-testid="upload-pdf"]')?.focus(),
        { injector: this.injector },
      );
    });
    this.form.controls.series.valueChanges.subscribe((s) => this.series.set(s));
  }

  protected stageTitle(d: Drawing): string {
    return STAGE_TITLES[d.stageKey];
  }
  protected stateLabel(r: Revision): string {
    return REVISION_STATE_LABELS[r.state].label;
  }
  protected marker(r: Revision) {
    return REVISION_STATE_LABELS[r.state];
  }
  protected purposeLabel(r: Revision): string {
    return PURPOSE_LABELS[r.purpose];
  }
  protected meaning(code: string): string {
    return suitabilityMeaning(code);
  }
  protected size(n: number): string {
    return formatBytes(n);
  }
  protected hasPdf(r: Revision): boolean {
    return r.files.some((f) => f.role === 'pdf');
  }
  protected message(err: unknown): string {
    return errorMessage(err);
  }

  protected async act(r: Revision, action: RevisionAction): Promise<void> {
    await this.run(() => this.api.transition(this.projectId(), r.id, action));
  }

  protected async register(d: Drawing): Promise<void> {
    if (this.form.invalid) {
      this.showErrors(this.form);
      return;
    }
    const v = this.form.getRawValue();
    const done = await this.run(() =>
      this.api.registerRevision(this.projectId(), d.id, {
        ...v,
        date: toIsoDay(v.date),
        suitability: v.suitability.toUpperCase(),
      }),
    );
    // The form goes away with the new draft; without this, focus would fall back to the page.
    if (done) this.focusUploadNext = true;
  }

  protected upload(r: Revision, role: 'pdf' | 'source', event: Event): void {
    const input = event.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (!file || this.busy()) return;
    this.busy.set(true);
    this.error.set(null);
    this.progress.set(0);
    this.api.upload(this.projectId(), r.id, role, file).subscribe({
      next: (e) => {
        if (e.type === HttpEventType.UploadProgress && e.total)
          this.progress.set(Math.round((100 * e.loaded) / e.total));
      },
      error: (err: unknown) => {
        this.error.set(errorMessage(err));
        this.busy.set(false);
        this.progress.set(null);
      },
      complete: () => {
        this.busy.set(false);
        this.progress.set(null);
        this.drawing.reload();
        this.changed.emit();
      },
    });
  }

  private async run(work: () => Promise<unknown>): Promise<boolean> {
    if (this.busy()) return false;
    this.busy.set(true);
    this.error.set(null);
    try {
      await work();
      this.drawing.reload();
      this.changed.emit();
      return true;
    } catch (err) {
      this.error.set(errorMessage(err));
      return false;
    } finally {
      this.busy.set(false);
    }
  }
}
