import { HttpClient, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, effect, inject, signal, viewChild } from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { MatIcon } from '@angular/material/icon';
import { MatPaginator } from '@angular/material/paginator';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { MatSelect } from '@angular/material/select';
import { MatSort, MatSortHeader } from '@angular/material/sort';
import {
  MatCell,
  MatCellDef,
  MatColumnDef,
  MatHeaderCell,
  MatHeaderCellDef,
  MatHeaderRow,
  MatHeaderRowDef,
  MatRow,
  MatRowDef,
  MatTable,
  MatTableDataSource,
} from '@angular/material/table';
import type { Person, ProjectList, Role } from '@trabeate/contracts';
import { firstValueFrom } from 'rxjs';
import { errorMessage } from '../../core/auth/api-error';
import { ROLE_LABELS, Session } from '../../core/auth/session';
import { Notice } from '../../core/notice';
import { ConfirmDialog, type ConfirmData } from '../../shared/confirm-dialog/confirm-dialog';
import { InviteDialog, type InviteDialogData } from './invite-dialog';
import { DayPipe, DayTimePipe } from '../../shared/dates/app-dates';
import { StackOnPhone } from '../../shared/stacked-table/stack-on-phone';

/** The most projects the invite dialog offers (the API's largest page). */
export const INVITE_PROJECT_PAGE = 100;

const STATUS_LABELS: Record<Person['status'], string> = {
  active: 'Active',
  invited: 'Invited',
  removed: 'Access removed',
};

/** The firm's people and their access; the principal's page. */
@Component({
  selector: 'tb-people-page',
  imports: [
    StackOnPhone,
    DayPipe,
    DayTimePipe,
    MatButton,
    MatIconButton,
    MatIcon,
    MatOption,
    MatPaginator,
    MatProgressSpinner,
    MatSelect,
    MatSort,
    MatSortHeader,
    MatTable,
    MatColumnDef,
    MatHeaderCell,
    MatHeaderCellDef,
    MatCell,
    MatCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatRow,
    MatRowDef,
  ],
  templateUrl: './people-page.html',
  styleUrls: ['../../shared/page/page.scss', './people-page.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PeoplePage {
  private readonly http = inject(HttpClient);
  private readonly dialog = inject(MatDialog);
  private readonly notice = inject(Notice);
  protected readonly session = inject(Session);

  protected readonly people = httpResource<Person[]>(() => '/api/people');
  private readonly organisations = httpResource<{ id: string; name: string }[]>(() => '/api/client-organisations');
  // The list is paged on the server: ask for one large page of active projects, in reference order.
  private readonly projects = httpResource<ProjectList>(() => ({
    url: '/api/projects',
    params: { pageSize: INVITE_PROJECT_PAGE, sort: 'reference', direction: 'asc', status: 'active' },
  }));

  protected readonly columns = ['displayName', 'role', 'organisation', 'status', 'projects', 'actions'];
  protected readonly roles = Object.entries(ROLE_LABELS) as [Role, string][];
  protected readonly busyId = signal<string | null>(null);

  protected readonly table = new MatTableDataSource<Person>([]);
  private readonly sort = viewChild(MatSort);
  private readonly paginator = viewChild(MatPaginator);

  constructor() {
    this.table.sortingDataAccessor = (p, column) => {
      switch (column) {
        case 'organisation':
          return p.clientOrganisation?.name ?? '';
        case 'projects':
          return p.projects.length;
        default:
          return String(p[column as keyof Person] ?? '').toLowerCase();
      }
    };
    effect(() => {
      this.table.data = this.people.hasValue() ? this.people.value() : [];
    });
    // Sort and paginator appear only once the table renders (after the first answer).
    effect(() => {
      this.table.sort = this.sort() ?? null;
      this.table.paginator = this.paginator() ?? null;
    });
  }

  protected roleLabel(p: Person): string {
    return ROLE_LABELS[p.role];
  }

  protected statusLabel(p: Person): string {
    return STATUS_LABELS[p.status];
  }

  protected isSelf(p: Person): boolean {
    return p.id === this.session.user()?.id;
  }

  protected loadError(err: unknown): string {
    return errorMessage(err);
  }

  protected async invite(): Promise<void> {
    const page = this.projects.hasValue() ? this.projects.value() : null;
    const data: InviteDialogData = {
      organisations: this.organisations.hasValue() ? this.organisations.value() : [],
      projects: page?.items ?? [],
      projectsLeftOut: page ? Math.max(0, page.total - page.items.length) : 0,
    };
    const ref = this.dialog.open(InviteDialog, { data, autoFocus: 'first-tabbable', disableClose: true });
    const created = await firstValueFrom(ref.afterClosed());
    if (created) this.people.reload();
  }

  protected async changeRole(p: Person, role: Role): Promise<void> {
    if (role === p.role) return;
    await this.act(p, 'Role changed.', () =>
      this.http.patch<Person>(`/api/people/${encodeURIComponent(p.id)}`, { role }),
    );
  }

  protected async removeAccess(p: Person): Promise<void> {
    const data: ConfirmData = {
      title: `Remove ${p.displayName}'s access?`,
      message: `${p.displayName} will be signed out everywhere and taken off every project. Their name stays on past work. You can invite them again later.`,
      confirm: 'Remove access',
    };
    const ok = await firstValueFrom(this.dialog.open(ConfirmDialog, { data }).afterClosed());
    if (!ok) return;
    await this.act(p, `${p.displayName} no longer has access.`, () =>
      this.http.delete<void>(`/api/people/${encodeURIComponent(p.id)}/access`),
    );
  }

  private async act(p: Person, done: string, call: () => ReturnType<HttpClient['delete']>): Promise<void> {
    if (this.busyId()) return;
    this.busyId.set(p.id);
    try {
      await firstValueFrom(call());
      this.notice.show(done, 4000);
    } catch (err) {
      const status = (err as { status?: number }).status;
      // 401 and 403 are announced by the interceptor.
      if (status !== 401 && status !== 403) this.notice.show(errorMessage(err));
    } finally {
      this.busyId.set(null);
      // Either way show what the server now holds (a refused change puts the old value back).
      this.people.reload();
    }
  }
}
