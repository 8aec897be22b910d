import { HttpParams, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, OnDestroy, computed, inject, input, linkedSignal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatPaginator, PageEvent } from '@angular/material/paginator';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { MatSelect } from '@angular/material/select';
import { MatSort, MatSortHeader, Sort } from '@angular/material/sort';
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
import { Router, RouterLink } from '@angular/router';
import type { ProjectList, ProjectListQuery, StageState } from '@trabeate/contracts';
import { errorMessage } from '../../core/auth/api-error';
import { Session } from '../../core/auth/session';
import { EmptyState } from '../../shared/empty-state/empty-state';
import { STATE_LABELS, STATE_MARKERS } from './project-labels';
import { DayTimePipe } from '../../shared/dates/app-dates';
import { StateMarker } from '../../shared/state-marker/state-marker';

type SortKey = NonNullable<ProjectListQuery['sort']>;
type Status = NonNullable<ProjectListQuery['status']>;
const SORTS: readonly SortKey[] = ['reference', 'name', 'client', 'updatedAt', 'storeys'];
const STATUSES: readonly Status[] = ['active', 'archived', 'all'];
export const PAGE_SIZES = [10, 25, 50, 100];
const DEFAULT_PAGE_SIZE = 25;
const SEARCH_DELAY_MS = 300;

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

const positive = (v: string | undefined, fallback: number, max = Infinity) => {
  const n = Number(v);
  return Number.isInteger(n) && n >= 1 ? Math.min(n, max) : fallback;
};

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
export class ProjectsPage implements OnDestroy {
  private readonly router = inject(Router);
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
    page: positive(this.page(), 1),
    pageSize: positive(this.pageSize(), DEFAULT_PAGE_SIZE, 100),
    sort: SORTS.includes(this.sort() as SortKey) ? (this.sort() as SortKey) : 'reference',
    direction: this.direction() === 'asc' ? 'asc' : 'desc',
    q: (this.q() ?? '').trim().slice(0, 100),
    client: this.client() ?? '',
    status: STATUSES.includes(this.status() as Status) ? (this.status() as Status) : 'active',
  }));

  protected readonly list = httpResource<ProjectList>(() => {
    const s = this.state();
    let params = new HttpParams()
      .set('page', s.page)
      .set('pageSize', s.pageSize)
      .set('sort', s.sort)
      .set('direction', s.direction)
      .set('status', s.status);
    if (s.q) params = params.set('q', s.q);
    if (s.client) params = params.set('clientOrganisationId', s.client);
    return { url: '/api/projects', params };
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

  private searchTimer?: ReturnType<typeof setTimeout>;

  protected marker(state: StageState) {
    return STATE_MARKERS[state];
  }

  protected stateLabel(state: StageState): string {
    return STATE_LABELS[state];
  }

  protected message(err: unknown): string {
    return errorMessage(err);
  }

  /** Typing waits for a pause before asking the server, and starts again from page 1. */
  protected searchTyped(value: string): void {
    clearTimeout(this.searchTimer);
    this.searchTimer = setTimeout(() => this.go({ q: value.trim() || null, page: null }), SEARCH_DELAY_MS);
  }

  protected clientChosen(id: string): void {
    this.go({ client: id || null, page: null });
  }

  protected statusChosen(status: Status): void {
    this.go({ status: status === 'active' ? null : status, page: null });
  }

  protected sorted(sort: Sort): void {
    // Material offers a third "no sort" click; the server always sorts, so that means the default.
    if (!sort.direction) this.go({ sort: null, direction: null, page: null });
    else this.go({ sort: sort.active, direction: sort.direction, page: null });
  }

  protected paged(event: PageEvent): void {
    this.go({
      page: event.pageIndex === 0 ? null : event.pageIndex + 1,
      pageSize: event.pageSize === DEFAULT_PAGE_SIZE ? null : event.pageSize,
    });
  }

  protected clearFilters(): void {
    this.go({ q: null, client: null, status: null, page: null });
  }

  ngOnDestroy(): void {
    clearTimeout(this.searchTimer);
  }

  private go(queryParams: Record<string, string | number | null>): void {
    void this.router.navigate([], { queryParams, queryParamsHandling: 'merge' });
  }
}
