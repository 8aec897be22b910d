import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import {
  FormBuilder,
  ReactiveFormsModule,
  Validators,
  type AbstractControl,
  type ValidationErrors,
} from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatCheckbox } from '@angular/material/checkbox';
import { MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatSelect } from '@angular/material/select';
import {
  PURPOSES,
  PURPOSE_LABELS,
  drawingListSchema,
  projectPageSchema,
  transmittalListSchema,
  transmittalSchema,
  type DrawingList,
  type Purpose,
  type Transmittal,
  type TransmittalListItem,
} from '@trabeate/contracts';
import { z } from 'zod';
import { errorMessage } from '../../core/auth/api-error';
import { Session } from '../../core/auth/session';
import { DayTimePipe } from '../../shared/dates/app-dates';
import { fieldCountText, formErrorFocus } from '../../shared/forms/form-error-focus';
import { StateMarker } from '../../shared/state-marker/state-marker';
import { DrawingsApi } from './drawings-api';

const email = z.email();
/** Outside addresses, one per line or separated by commas; every one must be an e-mail address. */
/** "1 revision", "3 revisions": counted text for the list and the issue button. */
export function revisionCount(n: number): string {
  return n === 1 ? '1 revision' : `${n} revisions`;
}

function emailList(control: AbstractControl<string>): ValidationErrors | null {
  const bad = splitEmails(control.value).filter((e) => !email.safeParse(e).success);
  return bad.length ? { emails: bad.join(', ') } : null;
}
const splitEmails = (v: string) =>
  v
    .split(/[\s,;]+/)
    .map((x) => x.trim())
    .filter(Boolean);

/** Transmittals of a project: the list, one opened with its downloads and receipts, and the issue form. */
@Component({
  selector: 'tb-transmittals-panel',
  imports: [
    DayTimePipe,
    StateMarker,
    ReactiveFormsModule,
    MatButton,
    MatCheckbox,
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
    <section class="transmittals" aria-labelledby="transmittals-heading">
      <h2 id="transmittals-heading">Transmittals</h2>
      @if (error()) {
        <p class="refusal" role="alert"><mat-icon aria-hidden="true">block</mat-icon> {{ error() }}</p>
      }
      @if (list.error(); as err) {
        <div class="state error" role="alert">
          <mat-icon aria-hidden="true">error</mat-icon>
          <span>Transmittals could not be loaded. {{ message(err) }}</span>
          <button mat-stroked-button type="button" (click)="list.reload()">Try again</button>
        </div>
      } @else if (list.hasValue()) {
        @if (list.value().length === 0) {
          <p class="muted" data-testid="no-transmittals">
            {{
              isClient()
                ? 'Nothing has been sent to you on this project yet.'
                : 'No drawings have been issued on this project yet.'
            }}
          </p>
        }
        <ul class="transmittal-list" data-testid="transmittal-list">
          @for (t of list.value(); track t.id) {
            <li>
              <button type="button" class="link" (click)="opened.set(t.id)" [attr.aria-expanded]="opened() === t.id">
                <span class="mono">{{ t.reference }}</span>
              </button>
              <span
                >{{ purposeLabel(t.purpose) }} · {{ t.issuedAt | tbDayTime }} · {{ revisionsText(t.itemCount) }}</span
              >
              @if (t.myAcknowledgement; as mine) {
                <tb-state-marker
                  [shape]="mine.acknowledgedAt ? 'done' : 'wait'"
                  [tone]="mine.acknowledgedAt ? 'neutral' : 'accent'"
                  >{{ mine.acknowledgedAt ? 'Acknowledged' : 'Awaiting your acknowledgement' }}</tb-state-marker
                >
              } @else if (!isClient()) {
                <span class="muted">{{ t.acknowledgedCount }} of {{ t.recipientCount }} acknowledged</span>
              }
            </li>
          }
        </ul>
      } @else {
        <mat-progress-bar mode="indeterminate" aria-label="Loading transmittals" />
      }

      @if (one.hasValue()) {
        @let t = one.value();
        <article class="transmittal" data-testid="transmittal-detail">
          <h3>
            <span class="mono">{{ t.reference }}</span> · {{ purposeLabel(t.purpose) }}
          </h3>
          <p class="muted">Issued {{ t.issuedAt | tbDayTime }} by {{ t.issuedBy.displayName }}</p>
          @if (t.note) {
            <p class="note">{{ t.note }}</p>
          }
          <ul>
            @for (i of t.items; track i.revisionId) {
              <li>
                <span class="mono">{{ i.number }}</span> revision <strong class="mono">{{ i.code }}</strong> ({{
                  i.suitability
                }}) {{ i.title }}
                @if (i.state === 'superseded') {
                  <tb-state-marker shape="stop" data-state="superseded">since superseded</tb-state-marker>
                }
                @for (f of i.files; track f.id) {
                  · <a [href]="f.downloadUrl" download>{{ f.fileName }}</a>
                }
              </li>
            }
          </ul>
          <p>
            <a mat-stroked-button [href]="t.sheetUrl" download data-testid="sheet-download"
              ><mat-icon>description</mat-icon> Transmittal sheet</a
            >
            <a mat-stroked-button [href]="t.zipUrl" download data-testid="zip-download"
              ><mat-icon>folder_zip</mat-icon> All files (ZIP)</a
            >
            @if (t.myAcknowledgement && !t.myAcknowledgement.acknowledgedAt) {
              <button
                mat-flat-button
                type="button"
                [disabled]="busy()"
                (click)="acknowledge(t)"
                data-testid="acknowledge"
              >
                Acknowledge receipt
              </button>
            }
          </p>
          @if (!isClient()) {
            <h4>Recipients</h4>
            <ul data-testid="recipients">
              @for (r of t.recipients; track r.id) {
                <li>
                  <mat-icon aria-hidden="true">{{
                    r.acknowledgedAt ? 'mark_email_read' : r.userId ? 'mark_email_unread' : 'link'
                  }}</mat-icon>
                  {{ r.name || r.email }}
                  @if (r.acknowledgedAt) {
                    <span>acknowledged {{ r.acknowledgedAt | tbDayTime }}</span>
                  } @else if (r.userId) {
                    <span class="muted">not acknowledged yet</span>
                  } @else {
                    <span class="muted">outside address; signed links until {{ t.linksExpireAt | tbDayTime }}</span>
                  }
                </li>
              }
            </ul>
          }
        </article>
      }

      @if (isPrincipal()) {
        <form class="issue" [formGroup]="form" (ngSubmit)="issue()" data-testid="issue-form">
          <h3>Issue approved revisions</h3>
          @if (approved.hasValue() && approved.value().items.length === 0) {
            <p class="muted">No revision is approved and waiting to be issued.</p>
          } @else if (approved.hasValue()) {
            <fieldset>
              <legend>Revisions</legend>
              @for (d of approved.value().items; track d.id) {
                <mat-checkbox
                  [checked]="chosen().has(d.current!.id)"
                  (change)="toggle(d.current!.id, $event.checked)"
                  [attr.data-testid]="'issue-' + d.number"
                >
                  <span class="mono">{{ d.number }}</span> {{ d.current!.code }} ({{ d.current!.suitability }})
                  {{ d.title }}
                </mat-checkbox>
              }
            </fieldset>
            <fieldset>
              <legend>Client contacts</legend>
              @for (c of contacts(); track c.id) {
                <mat-checkbox
                  [checked]="contactIds().has(c.id)"
                  (change)="toggleContact(c.id, $event.checked)"
                  [attr.data-testid]="'contact-' + c.id"
                >
                  {{ c.displayName }}
                </mat-checkbox>
              } @empty {
                <p class="muted">This project has no client contacts with accounts.</p>
              }
            </fieldset>
            <mat-form-field class="wide">
              <mat-label>Outside addresses</mat-label>
              <textarea matInput formControlName="externals" rows="2" data-testid="issue-externals"></textarea>
              <mat-hint>A contractor's site office, say. They get signed links that expire.</mat-hint>
              @if (form.controls.externals.hasError('emails')) {
                <mat-error>Not an e-mail address: {{ form.controls.externals.getError('emails') }}</mat-error>
              }
            </mat-form-field>
            <mat-form-field>
              <mat-label>Purpose of issue</mat-label>
              <mat-select formControlName="purpose" data-testid="issue-purpose">
                @for (p of purposes; track p) {
                  <mat-option [value]="p">{{ purposeLabel(p) }}</mat-option>
                }
              </mat-select>
            </mat-form-field>
            <mat-form-field class="wide">
              <mat-label>Covering note</mat-label>
              <textarea matInput formControlName="note" rows="2" maxlength="4000"></textarea>
            </mat-form-field>
            <button mat-flat-button type="submit" [disabled]="busy() || !canIssue()" data-testid="issue-submit">
              Issue {{ revisionsText(chosen().size) }}
            </button>
            @if (invalidCount()) {
              <span class="count" data-testid="issue-error-count">{{ countText(invalidCount()) }}</span>
            }
          }
        </form>
      }
    </section>
  `,
  styleUrls: ['../../shared/page/page.scss', './drawings.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TransmittalsPanel {
  private readonly api = inject(DrawingsApi);
  private readonly session = inject(Session);
  readonly projectId = input.required<string>();
  /** Opened from an e-mail link (?transmittal=…). */
  readonly initial = input<string | undefined>(undefined);
  readonly changed = output<void>();

  protected readonly isClient = computed(() => this.session.role() === 'client');
  protected readonly isPrincipal = computed(() => this.session.isPrincipal());
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly purposes = PURPOSES;
  private readonly reportInvalid = formErrorFocus();
  protected readonly invalidCount = signal(0);
  protected readonly countText = fieldCountText;
  protected readonly revisionsText = revisionCount;
  protected readonly opened = signal<string | null>(null);
  private readonly openedId = computed(() => this.opened() ?? this.initial() ?? null);

  private readonly base = computed(() => `/api/projects/${encodeURIComponent(this.projectId())}`);
  protected readonly list = httpResource<TransmittalListItem[]>(() => `${this.base()}/transmittals`, {
    parse: (x) => transmittalListSchema.parse(x),
  });
  protected readonly one = httpResource<Transmittal>(
    () => (this.openedId() ? `${this.base()}/transmittals/${encodeURIComponent(this.openedId()!)}` : undefined),
    { parse: (x) => transmittalSchema.parse(x) },
  );
  protected readonly approved = httpResource<DrawingList>(
    () =>
      this.isPrincipal() ? { url: `${this.base()}/drawings`, params: { state: 'approved', pageSize: 100 } } : undefined,
    { parse: (x) => drawingListSchema.parse(x) },
  );
  private readonly project = httpResource(() => (this.isPrincipal() ? `${this.base()}/full` : undefined), {
    parse: (x) => projectPageSchema.parse(x),
  });
  protected readonly contacts = computed(() =>
    this.project.hasValue() ? this.project.value().members.filter((m) => m.role === 'client') : [],
  );

  protected readonly chosen = signal(new Set<string>());
  protected readonly contactIds = signal(new Set<string>());
  protected readonly form = inject(FormBuilder).nonNullable.group({
    purpose: ['information' as Purpose, Validators.required],
    note: [''],
    externals: ['', emailList],
  });
  private readonly externalsValue = signal('');
  protected readonly canIssue = computed(
    () => this.chosen().size > 0 && (this.contactIds().size > 0 || splitEmails(this.externalsValue()).length > 0),
  );

  constructor() {
    this.form.controls.externals.valueChanges.subscribe((v) => this.externalsValue.set(v));
  }

  /** Reload after the register changed (a revision approved elsewhere on the page). */
  reload(): void {
    this.list.reload();
    this.approved.reload();
  }

  protected purposeLabel(p: Purpose): string {
    return PURPOSE_LABELS[p];
  }
  protected message(err: unknown): string {
    return errorMessage(err);
  }
  protected toggle(id: string, on: boolean): void {
    const next = new Set(this.chosen());
    if (on) next.add(id);
    else next.delete(id);
    this.chosen.set(next);
  }
  protected toggleContact(id: string, on: boolean): void {
    const next = new Set(this.contactIds());
    if (on) next.add(id);
    else next.delete(id);
    this.contactIds.set(next);
  }

  protected async issue(): Promise<void> {
    if (!this.canIssue() || this.busy()) return;
    if (this.form.invalid) {
      // An address that is not one: focus goes to it and the count is announced, not left on the button.
      this.invalidCount.set(this.reportInvalid(this.form));
      return;
    }
    this.invalidCount.set(0);
    const v = this.form.getRawValue();
    await this.run(async () => {
      const t = await this.api.issue(this.projectId(), {
        purpose: v.purpose,
        note: v.note,
        revisionIds: [...this.chosen()],
        contactIds: [...this.contactIds()],
        externalEmails: splitEmails(v.externals),
      });
      this.chosen.set(new Set());
      this.form.reset();
      this.opened.set(t.id);
      this.approved.reload();
      this.changed.emit();
    });
  }

  protected async acknowledge(t: Transmittal): Promise<void> {
    await this.run(() => this.api.acknowledge(this.projectId(), t.id));
  }

  private async run(work: () => Promise<unknown>): Promise<void> {
    this.busy.set(true);
    this.error.set(null);
    try {
      await work();
      this.list.reload();
      this.one.reload();
    } catch (err) {
      this.error.set(errorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
