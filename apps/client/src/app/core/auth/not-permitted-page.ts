import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { Session } from './session';

/** Shown in place of a page the signed-in role does not open (the server refuses it too). */
@Component({
  selector: 'tb-not-permitted-page',
  imports: [MatButton, MatIcon, RouterLink],
  template: `
    <section class="panel" aria-labelledby="not-permitted-heading" data-testid="not-permitted">
      <mat-icon class="mark" aria-hidden="true">block</mat-icon>
      <h1 id="not-permitted-heading">This page is not part of your role</h1>
      <p class="lead">
        You are signed in as {{ session.roleLabel() || 'a person without a role' }}. This page belongs to another role
        at the firm. If you need it for your work, ask the firm's principal.
      </p>
      <div class="actions">
        <a mat-flat-button routerLink="/projects">Go to projects</a>
      </div>
    </section>
  `,
  styleUrl: './auth-pages.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NotPermittedPage {
  protected readonly session = inject(Session);
}
