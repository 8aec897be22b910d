import { HttpErrorResponse, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import type { InvitationPreview } from '@trabeate/contracts';
import { anonymousOk } from '../../core/auth/auth-context';
import { errorMessage } from '../../core/auth/api-error';
import { PageLocation } from '../../core/auth/page-location';
import { ROLE_LABELS, Session } from '../../core/auth/session';
import { DayTimePipe } from '../../shared/dates/app-dates';

/** Where an invitation link lands: who invited whom, as what, and the way in. Public. */
@Component({
  selector: 'tb-invitation-page',
  imports: [DayTimePipe, MatButton, MatIcon, MatProgressSpinner],
  template: `
    <section class="panel" aria-labelledby="invitation-heading" data-testid="invitation">
      <mat-icon class="mark" aria-hidden="true">mail</mat-icon>
      @if (preview.isLoading()) {
        <h1 id="invitation-heading">Opening your invitation…</h1>
        <mat-progress-spinner mode="indeterminate" diameter="28" />
      } @else if (preview.error(); as err) {
        <h1 id="invitation-heading">This invitation cannot be opened</h1>
        <p class="lead" role="alert">{{ failure(err) }}</p>
      } @else if (invitation(); as inv) {
        <h1 id="invitation-heading">{{ inv.firmName }} invites you to Trabeate</h1>
        <dl>
          <dt>Name</dt>
          <dd>{{ inv.displayName }}</dd>
          <dt>E-mail</dt>
          <dd>{{ inv.email }}</dd>
          <dt>Invited as</dt>
          <dd>{{ roleLabel(inv.role) }}</dd>
          <dt>{{ inv.status === 'expired' ? 'Expired' : 'Open until' }}</dt>
          <dd>{{ inv.expiresAt | tbDayTime }}</dd>
        </dl>
        @switch (inv.status) {
          @case ('pending') {
            <p class="lead">Sign in with the account for {{ inv.email }} to accept. Your projects open right after.</p>
            <div class="actions">
              <button mat-flat-button type="button" data-testid="invitation-sign-in" (click)="signIn(inv)">
                <mat-icon>login</mat-icon>
                Sign in to accept
              </button>
            </div>
          }
          @case ('accepted') {
            <p class="lead">This invitation has been accepted already. Sign in to carry on.</p>
            <div class="actions">
              <button mat-flat-button type="button" (click)="signIn(inv)">Sign in</button>
            </div>
          }
          @case ('expired') {
            <p class="note" role="alert">This invitation has expired. Ask {{ inv.firmName }} to send a new one.</p>
          }
        }
      }
    </section>
  `,
  styleUrl: '../../core/auth/auth-pages.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InvitationPage {
  private readonly location = inject(PageLocation);
  private readonly session = inject(Session);
  /** Route-bound `:token`. */
  readonly token = input.required<string>();

  protected readonly preview = httpResource<InvitationPreview>(() => ({
    url: `/api/invitations/${encodeURIComponent(this.token())}`,
    context: anonymousOk(),
  }));
  protected readonly invitation = computed(() => (this.preview.hasValue() ? this.preview.value() : undefined));

  protected roleLabel(role: InvitationPreview['role']): string {
    return ROLE_LABELS[role];
  }

  protected failure(err: unknown): string {
    const fallback =
      err instanceof HttpErrorResponse && err.status === 404
        ? 'The link is not valid. Check that it was copied whole, or ask the firm for a new one.'
        : undefined;
    return errorMessage(err, fallback);
  }

  protected signIn(inv: InvitationPreview): void {
    // The server gives the exact sign-in address (it carries the invitation along); fall back to ours.
    if (inv.signInUrl.startsWith('/') && !inv.signInUrl.startsWith('//')) this.location.assign(inv.signInUrl);
    else this.session.signIn('/projects');
  }
}
