import { HttpClient, HttpErrorResponse, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { MatSelect } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import {
  apiErrorSchema,
  drawingListSchema,
  PLAN_SCALES,
  planSheetRegisteredSchema,
  SHEET_SIZES,
  STAGE_KEYS,
  STAGE_TITLES,
  schemeReportSchema,
  type PlanSheetRegistered,
  type SchemeReport,
  type StageKey,
} from '@trabeate/contracts';
import { firstValueFrom, map } from 'rxjs';
import { errorMessage } from '../../core/auth/api-error';
import { fieldCountText, formErrorFocus } from '../../shared/forms/form-error-focus';
import { StateMarker } from '../../shared/state-marker/state-marker';
import { schemeUrl } from './schemes-api';

const POLL_MS = 1000;
const NEW_DRAWING = 'new';

/**
 * What a saved scheme version gives out: its calculation report (made by a job on the server,
 * with progress) and its plan sheet (previewed here as SVG, registered as a draft drawing revision).
 * Used on the planning page and in the stage review.
 */
@Component({
  selector: 'tb-scheme-outputs',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButton,
    MatFormField,
    MatLabel,
    MatError,
    MatInput,
    MatSelect,
    MatOption,
    MatProgressBar,
    MatProgressSpinner,
    StateMarker,
  ],
  template: `
    <section class="outputs" aria-labelledby="outputs-heading" data-testid="scheme-outputs">
      <h2 id="outputs-heading">Outputs of version {{ version() }}</h2>
      <p class="muted">
        Preliminary: the governing code and local regulations apply; final design and sealing belong to a licensed
        structural engineer.
      </p>

      <h3>Calculation report</h3>
      <div class="row">
        <mat-form-field appearance="outline" class="narrow">
          <mat-label>Also file on stage</mat-label>
          <mat-select [value]="fileOn()" (valueChange)="fileOn.set($event)" data-testid="report-stage">
            <mat-option value="">Do not file</mat-option>
            @for (k of stageKeys; track k) {
              <mat-option [value]="k">{{ stageTitles[k] }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <button
          mat-flat-button
          type="button"
          (click)="generate()"
          [disabled]="requesting() || working()"
          data-testid="report-generate"
        >
          {{ requesting() ? 'Asking…' : 'Generate report' }}
        </button>
      </div>
      @if (report(); as r) {
        <div class="state" role="status" data-testid="report-status">
          @switch (r.state) {
            @case ('queued') {
              <tb-state-marker shape="wait" tone="neutral">Waiting in the queue</tb-state-marker>
            }
            @case ('running') {
              <tb-state-marker shape="half" tone="accent">Writing</tb-state-marker>
              {{ r.progress.done }} of {{ r.progress.total }} sections
            }
            @case ('done') {
              <tb-state-marker shape="done" tone="accent">Ready</tb-state-marker>
              {{ r.pages }} pages
              <a mat-stroked-button [href]="fileUrl(r)" target="_blank" rel="noopener" data-testid="report-open"
                >Open the report</a
              >
            }
            @case ('failed') {
              <tb-state-marker shape="stop" tone="alert">Failed</tb-state-marker>
            }
          }
        </div>
        @if (r.state === 'queued' || r.state === 'running') {
          <mat-progress-bar
            mode="determinate"
            [value]="r.progress.total ? (100 * r.progress.done) / r.progress.total : 0"
            aria-label="Report progress"
          />
        }
        @if (r.failure) {
          <p class="error" role="alert" data-testid="report-failure">{{ r.failure }}</p>
        }
      }
      @if (reportError(); as m) {
        <p class="error" role="alert" data-testid="report-error">{{ m }}</p>
      }

      <h3>Plan sheet</h3>
      <div class="row">
        <mat-form-field appearance="outline" class="narrow">
          <mat-label>Sheet</mat-label>
          <mat-select [value]="size()" (valueChange)="size.set($event)" data-testid="sheet-size">
            @for (s of sizes; track s) {
              <mat-option [value]="s">{{ s }} landscape</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <mat-form-field appearance="outline" class="narrow">
          <mat-label>Scale</mat-label>
          <mat-select [value]="scale()" (valueChange)="scale.set($event)" data-testid="sheet-scale">
            @for (s of scales; track s) {
              <mat-option [value]="s">1:{{ s }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <a mat-button [href]="sheetUrl('pdf')" target="_blank" rel="noopener" data-testid="sheet-pdf">Open as PDF</a>
      </div>
      @if (sheet.isLoading()) {
        <div class="state" role="status">
          <mat-progress-spinner mode="indeterminate" diameter="20" /> Drawing the sheet…
        </div>
      } @else if (sheet.error(); as err) {
        <div class="error" role="alert" data-testid="sheet-error">
          {{ message(err, 'The sheet could not be drawn.') }}
          <button mat-stroked-button type="button" (click)="sheet.reload()">Try again</button>
        </div>
      } @else if (preview(); as src) {
        <img
          class="sheet"
          [src]="src"
          [alt]="'Plan sheet of version ' + version() + ' at ' + size() + ', 1:' + scale()"
          data-testid="sheet-preview"
        />
      }

      <form [formGroup]="form" (ngSubmit)="register()" class="register" data-testid="sheet-register">
        <mat-form-field appearance="outline">
          <mat-label>Drawing</mat-label>
          <mat-select formControlName="drawing" data-testid="register-drawing">
            <mat-option value="new">A new drawing (next number)</mat-option>
            @for (d of drawingOptions(); track d.id) {
              <mat-option [value]="d.id">{{ d.number }} {{ d.title }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        @if (form.controls.drawing.value === 'new') {
          <mat-form-field appearance="outline">
            <mat-label>Title of the new drawing</mat-label>
            <input matInput formControlName="title" data-testid="register-title" />
            @if (form.controls.title.hasError('required')) {
              <mat-error>Give the drawing a title.</mat-error>
            }
          </mat-form-field>
          <mat-form-field appearance="outline">
            <mat-label>Stage</mat-label>
            <mat-select formControlName="stageKey">
              @for (k of stageKeys; track k) {
                <mat-option [value]="k">{{ stageTitles[k] }}</mat-option>
              }
            </mat-select>
          </mat-form-field>
        }
        <mat-form-field appearance="outline" class="narrow">
          <mat-label>Suitability</mat-label>
          <mat-select formControlName="suitability">
            @for (s of suitabilities; track s) {
              <mat-option [value]="s">{{ s }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <div class="row">
          <button mat-flat-button type="submit" [disabled]="registering()" data-testid="register-submit">
            {{ registering() ? 'Registering…' : 'Register as a drawing revision' }}
          </button>
          @if (invalidCount()) {
            <span class="error">{{ invalidText() }}</span>
          }
        </div>
      </form>
      @if (registered(); as r) {
        <p class="state" role="status" data-testid="register-done">
          <tb-state-marker shape="open" tone="neutral">Draft</tb-state-marker>
          Revision {{ r.revision.code }} of {{ r.drawingNumber }} registered from version {{ r.version }}; check and
          approve it in the <a routerLink="/drawings">drawing register</a>.
        </p>
      }
      @if (registerError(); as m) {
        <p class="error" role="alert" data-testid="register-error">{{ m }}</p>
      }
    </section>
  `,
  styles: `
    .outputs {
      display: grid;
      gap: 8px;
    }
    h2 {
      font-size: 1.1rem;
      margin: 0;
    }
    h3 {
      font-size: 1rem;
      margin: 12px 0 0;
    }
    .row {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      align-items: center;
    }
    .narrow {
      width: 12rem;
    }
    .state {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      align-items: center;
    }
    .error {
      color: var(--tb-alert, #8a1c12);
    }
    .muted {
      color: var(--tb-muted, #5b6568);
      margin: 0;
    }
    .sheet {
      width: 100%;
      max-width: 960px;
      height: auto;
      border: 1px solid #c9d0d2;
      background: #fff;
    }
    .register {
      display: grid;
      gap: 4px;
      max-width: 32rem;
    }
  `,
})
export class SchemeOutputs {
  private readonly http = inject(HttpClient);
  private readonly destroyRef = inject(DestroyRef);
  private readonly reportInvalid = formErrorFocus();

  readonly projectId = input.required<string>();
  readonly schemeId = input.required<string>();
  readonly version = input.required<number>();

  protected readonly sizes = SHEET_SIZES;
  protected readonly scales = PLAN_SCALES;
  protected readonly stageKeys = STAGE_KEYS;
  protected readonly stageTitles = STAGE_TITLES;
  protected readonly suitabilities = ['S0', 'S1', 'S2', 'S3', 'S4'];

  protected readonly size = signal<(typeof SHEET_SIZES)[number]>('A3');
  protected readonly scale = signal<number>(200);
  protected readonly fileOn = signal<StageKey | ''>('');

  protected readonly report = signal<SchemeReport | null>(null);
  protected readonly requesting = signal(false);
  protected readonly reportError = signal<string | null>(null);
  protected readonly working = computed(() => ['queued', 'running'].includes(this.report()?.state ?? ''));
  private timer: ReturnType<typeof setTimeout> | undefined;

  private readonly versionUrl = computed(
    () => `${schemeUrl(this.projectId(), this.schemeId())}/versions/${this.version()}`,
  );
  protected readonly sheet = httpResource.text(
    () => `${this.versionUrl()}/sheet.svg?size=${this.size()}&scale=${this.scale()}`,
  );
  protected readonly preview = computed(() =>
    this.sheet.hasValue() ? `data:image/svg+xml;charset=utf-8,${encodeURIComponent(this.sheet.value())}` : null,
  );
  private readonly drawings = httpResource(
    () => `/api/projects/${encodeURIComponent(this.projectId())}/drawings?pageSize=100`,
    { parse: (b) => drawingListSchema.parse(b) },
  );
  /** Drawings that can take a new revision now would be ideal; the server says 409 for the others. */
  protected readonly drawingOptions = computed(() => (this.drawings.hasValue() ? this.drawings.value().items : []));

  protected readonly form = inject(NonNullableFormBuilder).group({
    drawing: [NEW_DRAWING],
    title: ['Column layout', [Validators.required, Validators.maxLength(200)]],
    stageKey: ['column_layout' as StageKey],
    suitability: ['S2'],
  });
  protected readonly registering = signal(false);
  protected readonly registered = signal<PlanSheetRegistered | null>(null);
  protected readonly registerError = signal<string | null>(null);
  protected readonly invalidCount = signal(0);
  protected readonly invalidText = computed(() => fieldCountText(this.invalidCount()));

  constructor() {
    this.destroyRef.onDestroy(() => clearTimeout(this.timer));
  }

  /** The sheet is read as text, so its error body arrives unparsed: read it as the API's error. */
  protected message(err: unknown, fallback: string): string {
    if (err instanceof HttpErrorResponse && typeof err.error === 'string') {
      try {
        const parsed = apiErrorSchema.safeParse(JSON.parse(err.error));
        return parsed.success ? parsed.data.error.message : fallback;
      } catch {
        return fallback;
      }
    }
    return errorMessage(err, fallback);
  }

  protected fileUrl(r: SchemeReport): string {
    return `/api/projects/${encodeURIComponent(r.projectId)}/scheme-reports/${encodeURIComponent(r.id)}/file`;
  }

  protected sheetUrl(kind: 'pdf' | 'svg'): string {
    return `${this.versionUrl()}/sheet.${kind}?size=${this.size()}&scale=${this.scale()}`;
  }

  protected async generate(): Promise<void> {
    if (this.requesting()) return;
    this.requesting.set(true);
    this.reportError.set(null);
    try {
      const stage = this.fileOn();
      const r = await firstValueFrom(
        this.http
          .post(`${this.versionUrl()}/reports`, stage ? { stageKey: stage } : {})
          .pipe(map((b) => schemeReportSchema.parse(b))),
      );
      this.report.set(r);
      this.poll();
    } catch (err) {
      this.reportError.set(errorMessage(err, 'The report could not be asked for.'));
    } finally {
      this.requesting.set(false);
    }
  }

  private poll(): void {
    clearTimeout(this.timer);
    const r = this.report();
    if (!r || !['queued', 'running'].includes(r.state)) return;
    this.timer = setTimeout(async () => {
      try {
        const next = await firstValueFrom(
          this.http
            .get(`/api/projects/${encodeURIComponent(r.projectId)}/scheme-reports/${encodeURIComponent(r.id)}`)
            .pipe(map((b) => schemeReportSchema.parse(b))),
        );
        this.report.set(next);
        this.poll();
      } catch (err) {
        this.reportError.set(errorMessage(err, 'The report status could not be read; it may still be written.'));
      }
    }, POLL_MS);
  }

  protected async register(): Promise<void> {
    if (this.registering()) return;
    if (this.form.invalid) {
      this.invalidCount.set(this.reportInvalid(this.form));
      return;
    }
    this.invalidCount.set(0);
    this.registering.set(true);
    this.registerError.set(null);
    const v = this.form.getRawValue();
    try {
      const body = {
        size: this.size(),
        scale: this.scale(),
        suitability: v.suitability,
        purpose: 'information' as const,
        ...(v.drawing === NEW_DRAWING
          ? { newDrawing: { title: v.title, stageKey: v.stageKey } }
          : { drawingId: v.drawing }),
      };
      const r = await firstValueFrom(
        this.http
          .post(`${this.versionUrl()}/sheet/revisions`, body)
          .pipe(map((b) => planSheetRegisteredSchema.parse(b))),
      );
      this.registered.set(r);
      this.drawings.reload();
    } catch (err) {
      this.registerError.set(errorMessage(err, 'The sheet could not be registered.'));
    } finally {
      this.registering.set(false);
    }
  }
}
