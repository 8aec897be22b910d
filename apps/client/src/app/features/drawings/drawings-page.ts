import { HttpParams, httpResource } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
  signal,
  viewChild,
} from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatPaginator } from '@angular/material/paginator';
import { MatProgressBar } from '@angular/material/progress-bar';
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
import {
  REVISION_STATES,
  SHEET_SIZES,
  STAGE_KEYS,
  STAGE_TITLES,
  drawingListSchema,
  projectListSchema,
  type DrawingList,
  type DrawingListItem,
  type DrawingListQuery,
  type RevisionState,
  type SheetSize,
  type StageKey,
} from '@trabeate/contracts';
import { errorMessage } from '../../core/auth/api-error';
import { Session } from '../../core/auth/session';
import { DayPipe } from '../../shared/dates/app-dates';
import { EmptyState } from '../../shared/empty-state/empty-state';
import { formErrorFocus } from '../../shared/forms/form-error-focus';
import { StateMarker } from '../../shared/state-marker/state-marker';
import { PAGE_SIZES, addressTable, oneOf, readTableQuery, tableParams } from '../../shared/table-state/address-table';
import { DrawingDetail } from './drawing-detail';
import { DrawingsApi } from './drawings-api';
import { REVISION_STATE_LABELS } from './drawing-labels';
import { TransmittalsPanel } from './transmittals-panel';

type SortKey = NonNullable<DrawingListQuery['sort']>;
const SORTS: readonly SortKey[] = ['number', 'title', 'stage', 'revision', 'date'];

/**
 * The drawing register of one project: every drawing with its current revision, sorted, filtered
 * and paged by the server; a drawing's history and actions beside it; transmittals below. Client
 * contacts get the same page, and the server gives them only what was issued to them.
 */
@Component({
  selector: 'tb-drawings-page',
  imports: [
    RouterLink,
    DayPipe,
    StateMarker,
    DrawingDetail,
    EmptyState,
    ReactiveFormsModule,
    TransmittalsPanel,
    MatButton,
    MatError,
    MatFormField,
    MatLabel,
    MatPrefix,
    MatIcon,
    MatInput,
    MatOption,
    MatPaginator,
    MatProgressBar,
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
  templateUrl: './drawings-page.html',
  styleUrls: ['../../shared/page/page.scss', './drawings.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DrawingsPage {
  protected readonly table = addressTable();
  private readonly showErrors = formErrorFocus();
  private readonly api = inject(DrawingsApi);
  protected readonly session = inject(Session);

  // Route-bound query parameters.
  readonly project = input<string>();
  readonly page = input<string>();
  readonly pageSize = input<string>();
  readonly sort = input<string>();
  readonly direction = input<string>();
  readonly q = input<string>();
  readonly stage = input<string>();
  readonly state = input<string>();
  readonly suitability = input<string>();
  readonly drawing = input<string>();
  readonly transmittal = input<string>();

  protected readonly isClient = computed(() => this.session.role() === 'client');
  protected readonly projects = httpResource(
    () => ({ url: '/api/projects', params: { pageSize: 100, sort: 'reference', direction: 'asc' } }),
    { parse: (x) => projectListSchema.parse(x) },
  );
  /** The chosen project, or the first one the caller can see. */
  protected readonly projectId = computed(() => {
    if (this.project()) return this.project()!;
    return this.projects.hasValue() ? (this.projects.value().items[0]?.id ?? null) : null;
  });

  protected readonly query = computed(() => ({
    ...readTableQuery(
      { page: this.page(), pageSize: this.pageSize(), sort: this.sort(), direction: this.direction(), q: this.q() },
      SORTS,
      { sort: 'number', direction: 'asc' },
    ),
    stage: oneOf(this.stage(), STAGE_KEYS, ''),
    state: oneOf(this.state(), REVISION_STATES, ''),
    suitability: /^(S[0-4]|A\d{1,2}|CR)$/i.test(this.suitability() ?? '') ? this.suitability()!.toUpperCase() : '',
  }));

  protected readonly list = httpResource<DrawingList>(
    () => {
      const id = this.projectId();
      if (!id) return undefined;
      const s = this.query();
      const params = tableParams(s, { stageKey: s.stage, state: s.state, suitability: s.suitability });
      return { url: `/api/projects/${encodeURIComponent(id)}/drawings`, params };
    },
    { parse: (x) => drawingListSchema.parse(x) },
  );
  protected readonly shown = linkedSignal<DrawingList | undefined, DrawingList | undefined>({
    source: () => (this.list.hasValue() ? this.list.value() : undefined),
    computation: (next, previous) => next ?? previous?.value,
  });
  protected readonly filtered = computed(() => {
    const s = this.query();
    return !!(s.q || s.stage || s.state || s.suitability);
  });

  protected readonly columns = ['number', 'title', 'stage', 'sheet', 'revision', 'state', 'suitability', 'date'];
  protected readonly pageSizes = PAGE_SIZES;
  protected readonly stages = STAGE_KEYS;
  protected readonly stageTitles = STAGE_TITLES;
  protected readonly states = REVISION_STATES;
  protected readonly sheetSizes = SHEET_SIZES;
  protected readonly creating = signal(false);
  protected readonly busy = signal(false);
  protected readonly createError = signal<string | null>(null);
  private readonly transmittals = viewChild(TransmittalsPanel);

  protected readonly form = inject(FormBuilder).nonNullable.group({
    number: ['', [Validators.required, Validators.maxLength(60), Validators.pattern(/^[A-Za-z0-9][A-Za-z0-9._-]*$/)]],
    title: ['', [Validators.required, Validators.maxLength(200)]],
    stageKey: ['column_layout' as StageKey, Validators.required],
    sheetSize: ['A1' as SheetSize, Validators.required],
    scale: ['1:100', [Validators.required, Validators.pattern(/^(1:\d{1,5}|NTS|As shown)$/)]],
  });

  protected stageTitle(d: DrawingListItem): string {
    return STAGE_TITLES[d.stageKey];
  }
  protected stateLabel(s: RevisionState): string {
    return REVISION_STATE_LABELS[s].label;
  }
  protected stateMarker(s: RevisionState) {
    return REVISION_STATE_LABELS[s];
  }
  protected message(err: unknown): string {
    return errorMessage(err);
  }
  protected exportUrl(kind: 'csv' | 'pdf'): string {
    const s = this.query();
    const params = new HttpParams({
      fromObject: Object.fromEntries(
        Object.entries({
          sort: s.sort,
          direction: s.direction,
          q: s.q,
          stageKey: s.stage,
          state: s.state,
          suitability: s.suitability,
        }).filter(([, v]) => v),
      ),
    });
    return `/api/projects/${encodeURIComponent(this.projectId() ?? '')}/drawings/export.${kind}?${params.toString()}`;
  }

  protected projectChosen(id: string): void {
    this.table.go({ project: id, page: null, drawing: null, transmittal: null });
  }
  protected filterChosen(key: 'stage' | 'state' | 'suitability', value: string): void {
    this.table.filter(key, value);
  }
  protected open(d: DrawingListItem): void {
    this.table.go({ drawing: d.id });
  }
  protected clearFilters(): void {
    this.table.clear(['stage', 'state', 'suitability']);
  }

  protected async startCreating(): Promise<void> {
    this.creating.set(true);
    this.createError.set(null);
    const id = this.projectId();
    if (!id) return;
    try {
      const proposed = (await this.api.nextNumber(id)).number;
      // A number the engineer typed while the proposal was on its way is theirs: keep it.
      const number = this.form.controls.number;
      if (!number.dirty && !number.value) number.setValue(proposed);
    } catch {
      // The proposal is a convenience; the engineer can type the number.
    }
  }

  protected async create(): Promise<void> {
    const id = this.projectId();
    if (!id || this.busy()) return;
    if (this.form.invalid) {
      this.showErrors(this.form);
      return;
    }
    this.busy.set(true);
    this.createError.set(null);
    try {
      const d = await this.api.createDrawing(id, this.form.getRawValue());
      this.creating.set(false);
      this.form.reset();
      this.list.reload();
      this.table.go({ drawing: d.id });
    } catch (err) {
      this.createError.set(errorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }

  protected registerChanged(): void {
    this.list.reload();
    this.transmittals()?.reload();
  }
}
