import { HttpErrorResponse, HttpParams, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatPaginator } from '@angular/material/paginator';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { DomSanitizer, SafeHtml } from '@angular/platform-browser';
import { outboxPageSchema, type OutboxPage as OutboxList } from '@trabeate/contracts';
import { errorMessage } from '../../core/auth/api-error';
import { EmptyState } from '../../shared/empty-state/empty-state';
import { DayTimePipe } from '../../shared/dates/app-dates';
import { DEFAULT_PAGE_SIZE, PAGE_SIZES, addressTable, positiveInt } from '../../shared/table-state/address-table';

/**
 * The message's HTML, shut in: the iframe has `sandbox=""` (no scripts, forms, navigation or
 * same-origin access), and this policy stops it from loading anything, so a message can never
 * reach past loopback or the app.
 */
export function sealedHtml(html: string): string {
  const policy = `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; img-src data:; style-src 'unsafe-inline'">`;
  return `<!doctype html><html><head>${policy}<meta charset="utf-8"></head><body>${html}</body></html>`;
}

/** Development only: the e-mail the local fake SMTP server kept, newest first, a page at a time (page in the address). */
@Component({
  selector: 'tb-outbox-page',
  imports: [DayTimePipe, EmptyState, MatButton, MatIcon, MatPaginator, MatProgressSpinner],
  template: `
    <div class="page-head">
      <div>
        <h1 class="page-title">Outbox</h1>
        <p class="page-lead">
          Mail the app sent while running against the local mail fake. Nothing here left this machine.
        </p>
      </div>
      <button mat-stroked-button type="button" data-testid="outbox-refresh" (click)="messages.reload()">
        <mat-icon>refresh</mat-icon>Refresh
      </button>
    </div>
    @if (messages.error(); as err) {
      <div class="state error" role="alert" data-testid="outbox-error">
        <mat-icon aria-hidden="true">error</mat-icon>
        <span>{{ failure(err) }}</span>
      </div>
    } @else if (!shown()) {
      <div class="state" role="status">
        <mat-progress-spinner mode="indeterminate" diameter="28" /> Loading the outbox…
      </div>
    } @else if (shown()!.total === 0) {
      <tb-empty-state
        icon="outgoing_mail"
        heading="No mail yet"
        lead="Notices appear here when a stage is submitted, returned or approved."
      />
    } @else {
      <div class="split">
        <div class="list-column">
          <ul class="list" aria-label="Messages" data-testid="outbox-list">
            @for (m of sorted(); track m.id) {
              <li>
                <button
                  type="button"
                  class="item"
                  [class.selected]="m.id === selected()?.id"
                  [attr.aria-current]="m.id === selected()?.id"
                  (click)="selectedId.set(m.id)"
                  data-testid="outbox-item"
                >
                  <span class="subject">{{ m.subject }}</span>
                  <span class="meta">To {{ m.to.join(', ') }}</span>
                  <time class="meta" [attr.datetime]="m.receivedAt">{{ m.receivedAt | tbDayTime }}</time>
                </button>
              </li>
            }
          </ul>
          <mat-paginator
            [length]="shown()!.total"
            [pageIndex]="paging().page - 1"
            [pageSize]="paging().pageSize"
            [pageSizeOptions]="pageSizes"
            (page)="table.paged($event)"
            aria-label="Pages of messages"
            data-testid="outbox-pages"
          />
        </div>
        @if (selected(); as m) {
          <article class="message" data-testid="outbox-message">
            <h2>{{ m.subject }}</h2>
            <dl>
              <dt>From</dt>
              <dd>{{ m.from }}</dd>
              <dt>To</dt>
              <dd>{{ m.to.join(', ') }}</dd>
              <dt>Received</dt>
              <dd>{{ m.receivedAt | tbDayTime }}</dd>
            </dl>
            @if (html(); as h) {
              <h3>As HTML</h3>
              <iframe sandbox="" [srcdoc]="h" title="The message as HTML" data-testid="outbox-html"></iframe>
            }
            <h3>As plain text</h3>
            <pre data-testid="outbox-text">{{ m.text }}</pre>
          </article>
        }
      </div>
    }
  `,
  styleUrls: ['../../shared/page/page.scss'],
  styles: `
    .split {
      display: grid;
      grid-template-columns: minmax(16rem, 1fr) 2fr;
      gap: 1rem;
      align-items: start;
    }
    .list-column {
      min-width: 0;
    }
    .list {
      list-style: none;
      margin: 0;
      padding: 0;
      border: 1px solid var(--mat-sys-outline-variant);
    }
    .item {
      display: flex;
      flex-direction: column;
      align-items: flex-start;
      gap: 0.15rem;
      width: 100%;
      padding: 0.6rem 0.75rem;
      border: 0;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
      background: var(--mat-sys-surface-container-lowest);
      color: inherit;
      text-align: left;
      cursor: pointer;
      font: var(--mat-sys-body-medium);
    }
    .item:hover {
      background: var(--mat-sys-surface-container);
    }
    .item.selected {
      box-shadow: inset 4px 0 0 var(--tb-accent);
      background: var(--mat-sys-secondary-container);
    }
    .item:focus-visible {
      outline: 2px solid var(--tb-accent);
      outline-offset: -2px;
    }
    .subject {
      font-weight: 700;
    }
    .meta {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    .message {
      padding: 1rem 1.25rem;
      border: 1px solid var(--mat-sys-outline-variant);
      background: var(--mat-sys-surface-container-lowest);
    }
    h2 {
      font: var(--mat-sys-title-large);
      margin: 0 0 0.5rem;
    }
    h3 {
      font: var(--mat-sys-title-small);
      margin: 1rem 0 0.4rem;
    }
    dl {
      display: grid;
      grid-template-columns: max-content 1fr;
      gap: 0.2rem 1rem;
      margin: 0;
    }
    dt {
      color: var(--mat-sys-on-surface-variant);
    }
    dd {
      margin: 0;
    }
    iframe {
      width: 100%;
      height: 24rem;
      border: 1px solid var(--mat-sys-outline-variant);
      background: #fff;
    }
    pre {
      white-space: pre-wrap;
      margin: 0;
      padding: 0.75rem;
      background: var(--mat-sys-surface-container-low);
      font-family: var(--tb-font-numbers);
      font-size: 0.85rem;
    }
    @media (max-width: 839.98px) {
      .split {
        grid-template-columns: 1fr;
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutboxPage {
  private readonly sanitizer = inject(DomSanitizer);
  protected readonly table = addressTable();
  protected readonly pageSizes = PAGE_SIZES;

  // Route-bound query parameters.
  readonly page = input<string>();
  readonly pageSize = input<string>();
  protected readonly paging = computed(() => ({
    page: positiveInt(this.page(), 1),
    pageSize: positiveInt(this.pageSize(), DEFAULT_PAGE_SIZE, 100),
  }));

  protected readonly messages = httpResource(
    () => {
      const { page, pageSize } = this.paging();
      return { url: '/api/dev/outbox', params: new HttpParams().set('page', page).set('pageSize', pageSize) };
    },
    { parse: (v) => outboxPageSchema.parse(v) },
  );
  /** The last page stays on screen while the next one loads, so the list does not jump. */
  protected readonly shown = linkedSignal<OutboxList | undefined, OutboxList | undefined>({
    source: () => (this.messages.hasValue() ? this.messages.value() : undefined),
    computation: (next, previous) => next ?? previous?.value,
  });
  protected readonly sorted = computed(() =>
    [...(this.shown()?.items ?? [])].sort((a, b) => b.receivedAt.localeCompare(a.receivedAt)),
  );
  /**
   * The newest message is open until another is chosen; a chosen message stays open through a
   * refresh while it is still on the page (a refresh used to snap back to the newest).
   */
  protected readonly selectedId = linkedSignal<OutboxList['items'], string | null>({
    source: this.sorted,
    computation: (items, previous) =>
      previous?.value && items.some((m) => m.id === previous.value) ? previous.value : (items[0]?.id ?? null),
  });
  protected readonly selected = computed(() => this.sorted().find((m) => m.id === this.selectedId()));
  /**
   * Angular's sanitizer would strip the message's own styles; the sandbox and the policy in
   * sealedHtml are what keep it harmless, so the markup goes in as it was sent.
   */
  protected readonly html = computed<SafeHtml | null>(() => {
    const m = this.selected();
    return m?.html ? this.sanitizer.bypassSecurityTrustHtml(sealedHtml(m.html)) : null;
  });

  protected failure(err: unknown): string {
    if (err instanceof HttpErrorResponse && err.status === 404) {
      return 'This server does not keep a development outbox: mail goes out over the configured SMTP server.';
    }
    return errorMessage(err, 'The outbox could not be loaded. Check the connection and try again.');
  }
}
