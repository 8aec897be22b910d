import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatFormField, MatLabel, MatPrefix } from '@angular/material/form-field';
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
import {
  AGE_BAND_LABELS,
  AGE_BANDS,
  invoiceListSchema,
  projectListSchema,
  receivablesSchema,
  type InvoiceListQuery,
  type InvoiceSummary,
} from '@trabeate/contracts';
import { errorMessage } from '../../core/auth/api-error';
import { PageLocation } from '../../core/auth/page-location';
import { Session } from '../../core/auth/session';
import { DayPipe } from '../../shared/dates/app-dates';
import { EmptyState } from '../../shared/empty-state/empty-state';
import { PAGE_SIZES, addressTable, oneOf, readTableQuery, tableParams } from '../../shared/table-state/address-table';
import { FeeAgreementForm } from './fee-agreement-form';
import { CHECKOUT_KEY, FeesApi, invoiceUrl } from './fees-api';
import { InvoicePanel } from './invoice-panel';
import { INVOICE_STATE_LABELS, InvoiceStateTag } from './invoice-state';
import { ReceivablesChart } from './receivables-chart';
import { formatMinor } from './money';
import { StackOnPhone } from '../../shared/stacked-table/stack-on-phone';

type SortKey = NonNullable<InvoiceListQuery['sort']>;
type StateFilter = NonNullable<InvoiceListQuery['state']>;
const SORTS: readonly SortKey[] = ['number', 'issuedOn', 'dueOn', 'total', 'due', 'client', 'project', 'state'];
const STATES: readonly StateFilter[] = ['draft', 'issued', 'part_paid', 'paid', 'void', 'overdue'];

/**
 * Fees. The principal: every invoice across projects (sorted, filtered and paged by the server),
 * what clients owe by age, and each project's fee agreement. A client: their organisation's
 * invoices, each with its PDF and, while money is owed, Pay.
 */
@Component({
  selector: 'tb-fees-page',
  imports: [
    StackOnPhone,
    DayPipe,
    EmptyState,
    FeeAgreementForm,
    InvoicePanel,
    InvoiceStateTag,
    ReceivablesChart,
    MatButton,
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
  templateUrl: './fees-page.html',
  styleUrls: ['../../shared/page/page.scss', './fees-page.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FeesPage {
  protected readonly table = addressTable();
  private readonly api = inject(FeesApi);
  private readonly location = inject(PageLocation);
  protected readonly session = inject(Session);

  // Route-bound query parameters.
  readonly page = input<string>();
  readonly pageSize = input<string>();
  readonly sort = input<string>();
  readonly direction = input<string>();
  readonly q = input<string>();
  readonly state = input<string>();
  readonly client = input<string>();
  readonly project = input<string>();

  protected readonly list$ = computed(() => ({
    ...readTableQuery(
      { page: this.page(), pageSize: this.pageSize(), sort: this.sort(), direction: this.direction(), q: this.q() },
      SORTS,
      { sort: 'issuedOn', direction: 'desc' },
    ),
    state: oneOf(this.state(), STATES, ''),
    client: this.client() ?? '',
    project: this.project() ?? '',
  }));

  protected readonly invoices = httpResource(
    () => {
      const s = this.list$();
      return {
        url: '/api/invoices',
        params: tableParams(s, { state: s.state, clientId: s.client, projectId: s.project }),
      };
    },
    { parse: (v) => invoiceListSchema.parse(v) },
  );
  protected readonly shown = linkedSignal({
    source: () => (this.invoices.hasValue() ? this.invoices.value() : undefined),
    computation: (next, previous?: { value: ReturnType<typeof invoiceListSchema.parse> | undefined }) =>
      next ?? previous?.value,
  });

  protected readonly receivables = httpResource(() => (this.session.isPrincipal() ? '/api/receivables' : undefined), {
    parse: (v) => receivablesSchema.parse(v),
  });
  protected readonly organisations = httpResource<{ id: string; name: string }[]>(() =>
    this.session.isPrincipal() ? '/api/client-organisations' : undefined,
  );
  protected readonly projects = httpResource(
    () =>
      this.session.isPrincipal() ? { url: '/api/projects', params: { pageSize: 100, status: 'active' } } : undefined,
    { parse: (v) => projectListSchema.parse(v) },
  );

  protected readonly columns = computed(() =>
    this.session.isPrincipal()
      ? ['number', 'project', 'client', 'state', 'total', 'due', 'dueOn']
      : ['number', 'project', 'state', 'total', 'due', 'dueOn', 'actions'],
  );
  protected readonly pageSizes = PAGE_SIZES;
  protected readonly bands = AGE_BANDS.map((b) => ({ key: b, label: AGE_BAND_LABELS[b] }));
  protected readonly stateOptions = STATES.map((s) => ({ value: s, label: INVOICE_STATE_LABELS[s].text }));
  protected readonly selected = signal<InvoiceSummary | null>(null);
  protected readonly agreementProject = signal<string>('');
  protected readonly paying = signal<string | null>(null);
  protected readonly payError = signal<{ id: string; message: string } | null>(null);
  protected readonly filtered = computed(() => {
    const s = this.list$();
    return !!(s.q || s.state || s.client || s.project);
  });

  protected money(minor: number, currency: string): string {
    return formatMinor(minor, currency);
  }
  protected message(err: unknown): string {
    return errorMessage(err);
  }
  protected pdfUrl(i: InvoiceSummary): string {
    return `${invoiceUrl(i.project.id, i.id)}/pdf`;
  }
  protected canPay(i: InvoiceSummary): boolean {
    return i.kind === 'invoice' && (i.state === 'issued' || i.state === 'part_paid') && i.dueMinor > 0;
  }

  /** Pay: the server opens a payment page for what is owed now, and the browser goes there. */
  protected async pay(i: InvoiceSummary): Promise<void> {
    if (this.paying()) return;
    this.paying.set(i.id);
    this.payError.set(null);
    try {
      const start = await this.api.checkout(i.project.id, i.id);
      sessionStorage.setItem(CHECKOUT_KEY(i.id), start.sessionId);
      this.location.assign(start.url);
    } catch (err) {
      this.payError.set({ id: i.id, message: errorMessage(err) });
      this.paying.set(null);
    }
  }

  protected select(i: InvoiceSummary): void {
    if (!this.session.isPrincipal()) return;
    this.selected.set(this.selected()?.id === i.id ? null : i);
  }
  protected changed(): void {
    this.invoices.reload();
    this.receivables.reload();
  }

  protected clearFilters(): void {
    this.table.clear(['state', 'client', 'project']);
  }
}
