import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { Session, safeReturnTo } from './session';

/** The public front door: one button to the firm's identity provider. */
@Component({
  selector: 'tb-sign-in-page',
  imports: [MatButton, MatIcon],
  template: `
    <section class="panel" aria-labelledby="sign-in-heading">
      <mat-icon class="mark" aria-hidden="true">login</mat-icon>
      <h1 id="sign-in-heading">Sign in to Trabeate</h1>
      @if (reason() === 'expired') {
        <p class="note" role="status" data-testid="sign-in-reason">
          Your session has ended. Sign in again to carry on where you were.
        </p>
      }
      @if (unreachable(); as message) {
        <p class="note" role="alert">{{ message }}</p>
      }
      <p class="lead">
        Trabeate is the workspace for your structural projects: stages, schemes, drawings and fees. You sign in with the
        account your firm gave you; you will come straight back here afterwards.
      </p>
      <div class="actions">
        <button mat-flat-button type="button" data-testid="sign-in" (click)="signIn()">
          <mat-icon>login</mat-icon>
          Sign in
        </button>
        @if (unreachable()) {
          <button mat-stroked-button type="button" (click)="retry()">Try again</button>
        }
      </div>
    </section>
  `,
  styleUrl: './auth-pages.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignInPage {
  private readonly session = inject(Session);
  /** Route-bound query parameters. */
  readonly returnTo = input<string>();
  readonly reason = input<string>();

  protected readonly unreachable = computed(() => {
    const s = this.session.state();
    return s.status === 'unreachable' ? `The server did not answer as expected: ${s.message}` : null;
  });

  protected signIn(): void {
    const target = safeReturnTo(this.returnTo());
    this.session.signIn(target === '/' ? '/projects' : target);
  }

  protected retry(): void {
    void this.session.reload();
  }
}
