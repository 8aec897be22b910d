import { BreakpointObserver } from '@angular/cdk/layout';
import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, ElementRef, computed, inject, signal, viewChild } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatSidenav, MatSidenavContainer, MatSidenavContent } from '@angular/material/sidenav';
import { MatToolbar } from '@angular/material/toolbar';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import type { Role } from '@trabeate/contracts';
import { map } from 'rxjs';
import { Session } from '../auth/session';

export interface NavLink {
  readonly path: string;
  readonly label: string;
  readonly hint: string;
  readonly icon: string;
  /** For `data-testid="nav-<id>"`. */
  readonly id: string;
}

const STATUS_LINK: NavLink = {
  id: 'status',
  path: '/status',
  label: 'System status',
  hint: 'Server and database',
  icon: 'monitor_heart',
};
const PROJECTS: NavLink = {
  id: 'projects',
  path: '/projects',
  label: 'Projects',
  hint: 'Buildings, stages, schemes',
  icon: 'apartment',
};
/** Only when the server runs with the local mail fake; see `Shell.links`. */
export const OUTBOX_LINK: NavLink = {
  id: 'outbox',
  path: '/dev/outbox',
  label: 'Outbox',
  hint: 'Mail kept by the local fake',
  icon: 'outgoing_mail',
};
const DRAWINGS: NavLink = {
  id: 'drawings',
  path: '/drawings',
  label: 'Drawings',
  hint: 'Revisions and transmittals',
  icon: 'architecture',
};

/**
 * What each role is offered. The server refuses the rest anyway; this keeps people away from
 * pages that would only say no.
 */
export const NAV_BY_ROLE: Readonly<Record<Role, readonly NavLink[]>> = {
  principal: [
    PROJECTS,
    DRAWINGS,
    { id: 'fees', path: '/fees', label: 'Fees', hint: 'Agreements and invoices', icon: 'receipt_long' },
    { id: 'people', path: '/people', label: 'People', hint: 'Staff, clients, invitations', icon: 'group' },
    {
      id: 'firm-dates',
      path: '/firm/settings',
      label: 'Dates and time',
      hint: 'The firm date language',
      icon: 'schedule',
    },
    STATUS_LINK,
  ],
  engineer: [PROJECTS, DRAWINGS, STATUS_LINK],
  client: [
    PROJECTS,
    DRAWINGS,
    { id: 'fees', path: '/fees', label: 'Fees', hint: 'Your invoices', icon: 'receipt_long' },
    STATUS_LINK,
  ],
};

/** Below this width the navigation folds into a drawer so the page keeps the full width. */
export const NARROW_QUERY = '(max-width: 839.98px)';

@Component({
  selector: 'tb-shell',
  imports: [
    MatToolbar,
    MatIconButton,
    MatIcon,
    MatSidenavContainer,
    MatSidenav,
    MatSidenavContent,
    RouterLink,
    RouterLinkActive,
    RouterOutlet,
  ],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    '(document:keydown.escape)': 'accountOpen.set(false)',
    '(document:click)': 'closeAccountOnOutsideClick($event)',
  },
})
export class Shell {
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);
  protected readonly accountOpen = signal(false);

  private readonly drawer = viewChild.required<MatSidenav>('drawer');

  protected readonly narrow = toSignal(
    inject(BreakpointObserver)
      .observe(NARROW_QUERY)
      .pipe(map((state) => state.matches)),
    { initialValue: false },
  );

  protected readonly session = inject(Session);
  private readonly router = inject(Router);

  /**
   * The development outbox exists only where the server keeps mail in its local fake; anywhere else
   * it answers 404, and the link stays away. Only the principal may read it.
   */
  private readonly outbox = httpResource<unknown>(() => (this.session.isPrincipal() ? '/api/dev/outbox' : undefined));

  /** Signed-out visitors see only what is public. */
  protected readonly links = computed<readonly NavLink[]>(() => {
    const role = this.session.role();
    if (!role) return [STATUS_LINK];
    const links = NAV_BY_ROLE[role];
    return role === 'principal' && this.outbox.hasValue()
      ? [...links.slice(0, -1), OUTBOX_LINK, ...links.slice(-1)]
      : links;
  });

  protected readonly anonymous = computed(() => this.session.state().status === 'anonymous');

  protected signIn(): void {
    this.session.signIn(this.router.url);
  }

  protected closeAccountOnOutsideClick(event: Event): void {
    if (!this.accountOpen()) return;
    const account = this.host.nativeElement.querySelector('.account');
    if (account && event.target instanceof Node && !account.contains(event.target)) this.accountOpen.set(false);
  }

  protected signOut(): void {
    void this.session.signOut();
  }

  private readonly main = viewChild.required<ElementRef<HTMLElement>>('main');

  /** Moves focus (not only the scroll position) to the page, so the next Tab starts inside it. */
  protected skipToMain(event: Event): void {
    event.preventDefault();
    this.main().nativeElement.focus();
  }

  /** On a narrow screen the drawer covers the page, so picking a link should put it away. */
  protected afterNavigate(): void {
    if (this.narrow()) void this.drawer().close();
  }
}
