import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { Router } from '@angular/router';
import { Session } from './session';

/** Signed in at the provider, but nobody at the firm has invited this person yet. */
@Component({
  selector: 'tb-no-access-page',
  imports: [MatButton, MatIcon],
  template: `
    <section class="panel" aria-labelledby="no-access-heading" data-testid="no-access">
      <mat-icon class="mark" aria-hidden="true">hourglass_top</mat-icon>
      <h1 id="no-access-heading">You are signed in, but not on a project yet</h1>
      <p class="lead">{{ message() }}</p>
      <dl>
        @if (identity()?.name; as name) {
          <dt>Name</dt>
          <dd>{{ name }}</dd>
        }
        <dt>Signed in as</dt>
        <dd data-testid="no-access-email">{{ identity()?.email ?? 'an account with no e-mail address' }}</dd>
      </dl>
      <p>
        Ask the firm's principal to invite this e-mail address. Once the invitation exists, reload this page; if you
        meant to use a different account, sign out and sign in with that one.
      </p>
      <div class="actions">
        <button mat-flat-button type="button" (click)="reload()">Check again</button>
        <button
          mat-stroked-button
          type="button"
          data-testid="sign-out"
          [disabled]="session.signingOut()"
          (click)="signOut()"
        >
          <mat-icon>logout</mat-icon>
          Sign out
        </button>
      </div>
    </section>
  `,
  styleUrl: './auth-pages.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NoAccessPage {
  protected readonly session = inject(Session);
  private readonly router = inject(Router);
  private readonly me = computed(() => {
    const s = this.session.state();
    return s.status === 'none' ? s.me : null;
  });
  protected readonly identity = computed(() => this.me()?.identity ?? null);
  protected readonly message = computed(() => this.me()?.message ?? 'Your account is not linked to this firm yet.');

  protected async reload(): Promise<void> {
    await this.session.reload();
    // With access granted now, go to the projects in one step.
    if (this.session.state().status === 'granted') await this.router.navigateByUrl('/projects');
  }

  protected signOut(): void {
    void this.session.signOut();
  }
}
