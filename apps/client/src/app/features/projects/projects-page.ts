import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatPaginator } from '@angular/material/paginator';
import { MatProgressBar } from '@angular/material/progress-bar';
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
} from '@angular/material/table';
import { RouterLink } from '@angular/router';
import type { ProjectList, ProjectListQuery, StageState } from '@trabeate/contracts';
import { errorMessage } from '../../core/auth/api-error';
import { Session } from '../../core/auth/session';
import { EmptyState } from '../../shared/empty-state/empty-state';
import { STATE_LABELS, STATE_MARKERS } from './project-labels';
import { DayTimePipe } from '../../shared/dates/app-dates';
import { StateMarker } from '../../shared/state-marker/state-marker';
import { PAGE_SIZES, addressTable, oneOf, readTableQuery, tableParams } from '../../shared/table-state/address-table';

type SortKey = NonNullable<ProjectListQuery['sort']>;
type Status = NonNullable<ProjectListQuery['status']>;
const SORTS: readonly SortKey[] = ['reference', 'name', 'client', 'updatedAt', 'storeys'];
const STATUSES: readonly Status[] = ['active', 'archived', 'all'];

/** The list state as it is in the address, so reload and back return to the same view. */
export interface ListState {
  readonly page: number;
  readonly pageSize: number;
  readonly sort: SortKey;
  readonly direction: 'asc' | 'desc';
  readonly q: string;
  readonly client: string;
  readonly status: Status;
}

/**
 * The firm's projects: sorted, filtered and paged by the server (a firm with years of jobs should
 * not send them all to the browser). The server shows each person only the projects they may see.
 */
@Component({
  selector: 'tb-projects-page',
  imports: [
    StateMarker,
    DayTimePipe,
    EmptyState,
    MatButton,
    MatFormField,
    MatLabel,
    MatPrefix,
    MatIcon,
    MatInput,
    MatOption,
    MatPaginator,
    MatProgressBar,
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
    RouterLink,
  ],
  templateUrl: './projects-page.html',
  styleUrls: ['../../shared/page/page.scss', './projects-page.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectsPage {
  protected readonly table = addressTable();
  protected readonly session = inject(Session);

  // Route-bound query parameters (strings as they stand in the address).
  readonly page = input<string>();
  readonly pageSize = input<string>();
  readonly sort = input<string>();
  readonly direction = input<string>();
  readonly q = input<string>();
  readonly client = input<string>();
  readonly status = input<string>();

  protected readonly state = computed<ListState>(() => ({
    ...readTableQuery(
      { page: this.page(), pageSize: this.pageSize(), sort: this.sort(), direction: this.direction(), q: this.q() },
      SORTS,
      { sort: 'reference', direction: 'desc' },
    ),
    client: this.client() ?? '',
    status: oneOf(this.status(), STATUSES, 'active'),
  }));

  protected readonly list = httpResource<ProjectList>(() => {
    const s = this.state();
    return {
      url: '/api/projects',
      params: tableParams(s, { status: s.status, clientOrganisationId: s.client }),
    };
  });
  /** The last answer stays on screen while the next page loads, so the table does not jump. */
  protected readonly shown = linkedSignal<ProjectList | undefined, ProjectList | undefined>({
    source: () => (this.list.hasValue() ? this.list.value() : undefined),
    computation: (next, previous) => next ?? previous?.value,
  });

  /** Only the principal may list client organisations; others see their own projects anyway. */
  protected readonly organisations = httpResource<{ id: string; name: string }[]>(() =>
    this.session.isPrincipal() ? '/api/client-organisations' : undefined,
  );

  protected readonly columns = ['reference', 'name', 'client', 'stage', 'late', 'updatedAt'];
  protected readonly pageSizes = PAGE_SIZES;
  protected readonly filtered = computed(() => {
    const s = this.state();
    return !!s.q || !!s.client || s.status !== 'active';
  });

  protected marker(state: StageState) {
    return STATE_MARKERS[state];
  }

  protected stateLabel(state: StageState): string {
    return STATE_LABELS[state];
  }

  protected message(err: unknown): string {
    return errorMessage(err);
  }

  protected clientChosen(id: string): void {
    this.table.filter('client', id);
  }

  protected statusChosen(status: Status): void {
    this.table.filter('status', status === 'active' ? null : status);
  }

  protected clearFilters(): void {
    this.table.clear(['client', 'status']);
  }
}
