import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, inject, viewChild } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatListItem, MatListItemIcon, MatListItemLine, MatListItemTitle, MatNavList } from '@angular/material/list';
import { MatSidenav, MatSidenavContainer, MatSidenavContent } from '@angular/material/sidenav';
import { MatToolbar } from '@angular/material/toolbar';
import { RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { map } from 'rxjs';

export interface NavLink {
  readonly path: string;
  readonly label: string;
  readonly hint: string;
  readonly icon: string;
}

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
    MatNavList,
    MatListItem,
    MatListItemIcon,
    MatListItemTitle,
    MatListItemLine,
    RouterLink,
    RouterLinkActive,
    RouterOutlet,
  ],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Shell {
  private readonly drawer = viewChild.required<MatSidenav>('drawer');

  protected readonly narrow = toSignal(
    inject(BreakpointObserver)
      .observe(NARROW_QUERY)
      .pipe(map((state) => state.matches)),
    { initialValue: false },
  );

  protected readonly links: readonly NavLink[] = [
    { path: '/projects', label: 'Projects', hint: 'Buildings, stages, schemes', icon: 'apartment' },
    { path: '/drawings', label: 'Drawings', hint: 'Revisions and transmittals', icon: 'architecture' },
    { path: '/fees', label: 'Fees', hint: 'Agreements and invoices', icon: 'receipt_long' },
    { path: '/status', label: 'System status', hint: 'Server and database', icon: 'monitor_heart' },
  ];

  /** On a narrow screen the drawer covers the page, so picking a link should put it away. */
  protected afterNavigate(): void {
    if (this.narrow()) void this.drawer().close();
  }
}
