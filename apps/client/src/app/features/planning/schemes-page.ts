import { HttpParams, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, ElementRef, computed, inject, input, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatPaginator, type PageEvent } from '@angular/material/paginator';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { MatSelect } from '@angular/material/select';
import { MatSort, MatSortHeader, type Sort } from '@angular/material/sort';
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
import { schemeListSchema, type SchemeListItem, type SchemeListQuery } from '@trabeate/contracts';
import { errorMessage } from '../../core/auth/api-error';
import { Notice } from '../../core/notice';
import { asYouType, fieldErrorText } from '../../shared/forms/field-errors';
import { formErrorFocus } from '../../shared/forms/form-error-focus';
import { DayTimePipe } from '../../shared/dates/app-dates';
import { SchemesApi, schemesUrl } from './schemes-api';
import { StackOnPhone } from '../../shared/stacked-table/stack-on-phone';

type SortKey = NonNullable<SchemeListQuery['sort']>;
type Status = NonNullable<SchemeListQuery['status']>;

const notBlank = (c: { value: string }) => (c.value && !c.value.trim() ? { whitespace: true } : null);
const nameControl = (value = '') =>
  new FormControl(value, { nonNullable: true, validators: [Validators.required, Validators.maxLength(200), notBlank] });

/** A project's schemes: sorted and paged by the server; engineers create, copy, rename and archive. */
@Component({
  selector: 'tb-schemes-page',
  imports: [
    StackOnPhone,
    DayTimePipe,
    MatButton,
    MatCell,
    MatCellDef,
    MatColumnDef,
    MatError,
    MatFormField,
    MatHeaderCell,
    MatHeaderCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatIcon,
    MatInput,
    MatLabel,
    MatOption,
    MatPaginator,
    MatProgressSpinner,
    MatRow,
    MatRowDef,
    MatSelect,
    MatSort,
    MatSortHeader,
    MatTable,
    ReactiveFormsModule,
    RouterLink,
  ],
  templateUrl: './schemes-page.html',
  styleUrls: ['../../shared/page/page.scss', './schemes-page.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SchemesPage {
  private readonly api = inject(SchemesApi);
  private readonly notice = inject(Notice);
  private readonly router = inject(Router);

  /** Route-bound `:projectId`. */
  readonly projectId = input.required<string>();

  protected readonly page = signal(1);
  protected readonly pageSize = signal(25);
  protected readonly sort = signal<SortKey>('updatedAt');
  protected readonly direction = signal<'asc' | 'desc'>('desc');
  protected readonly status = signal<Status>('active');

  protected readonly list = httpResource(
    () => ({
      url: schemesUrl(this.projectId()),
      params: new HttpParams({
        fromObject: {
          page: this.page(),
          pageSize: this.pageSize(),
          sort: this.sort(),
          direction: this.direction(),
          status: this.status(),
        },
      }),
    }),
    { parse: (body) => schemeListSchema.parse(body) },
  );
  protected readonly data = computed(() => (this.list.hasValue() ? this.list.value() : undefined));
  protected readonly columns = ['name', 'version', 'columns', 'checks', 'updatedAt', 'actions'];

  protected readonly newName = nameControl();
  protected readonly createForm = new FormGroup({ name: this.newName });
  protected readonly renaming = signal<string | null>(null);
  protected readonly renameName = nameControl();
  protected readonly renameForm = new FormGroup({ name: this.renameName });
  protected readonly busy = signal(false);
  private readonly host = inject(ElementRef<HTMLElement>).nativeElement as HTMLElement;
  private readonly reportInvalid = formErrorFocus();
  protected readonly errorText = fieldErrorText;
  protected readonly asYouType = asYouType;

  /** Up to two schemes picked for the side-by-side comparison, oldest pick first. */
  protected readonly picked = signal<readonly string[]>([]);

  protected pick(id: string): void {
    const now = this.picked();
    this.picked.set(now.includes(id) ? now.filter((x) => x !== id) : [...now, id].slice(-2));
  }

  protected sorted(s: Sort): void {
    this.sort.set(s.active as SortKey);
    this.direction.set(s.direction === 'asc' ? 'asc' : 'desc');
    this.page.set(1);
  }

  protected paged(e: PageEvent): void {
    this.pageSize.set(e.pageSize);
    this.page.set(e.pageIndex + 1);
  }

  protected setStatus(s: Status): void {
    this.status.set(s);
    this.page.set(1);
  }

  /** Runs one write at a time (a second click while one is on its way does nothing). */
  private async write<T>(what: () => Promise<T>, failure: string): Promise<T | undefined> {
    if (this.busy()) return undefined;
    this.busy.set(true);
    try {
      return await what();
    } catch (err) {
      this.notice.show(errorMessage(err, failure));
      return undefined;
    } finally {
      this.busy.set(false);
    }
  }

  protected async create(): Promise<void> {
    if (this.newName.invalid) {
      // Focus goes to the name and the count is announced, rather than staying on the button.
      this.reportInvalid(this.createForm, this.host.querySelector('[data-testid="create-form"]'));
      return;
    }
    const created = await this.write(
      () => this.api.create(this.projectId(), { name: this.newName.value.trim() }),
      'The scheme could not be created.',
    );
    if (created) await this.router.navigate(['/projects', this.projectId(), 'schemes', created.id]);
  }

  protected async duplicate(s: SchemeListItem): Promise<void> {
    const copy = await this.write(() => this.api.duplicate(this.projectId(), s.id), 'The scheme could not be copied.');
    if (copy) {
      this.notice.show(`Copied as “${copy.name}”.`);
      this.list.reload();
    }
  }

  protected startRename(s: SchemeListItem): void {
    this.renameName.setValue(s.name);
    this.renaming.set(s.id);
  }

  protected async rename(s: SchemeListItem): Promise<void> {
    if (this.renameName.invalid) {
      this.reportInvalid(this.renameForm, this.host.querySelector('form.rename'));
      return;
    }
    const done = await this.write(
      () => this.api.rename(this.projectId(), s.id, this.renameName.value.trim()),
      'The scheme could not be renamed.',
    );
    if (done) {
      this.renaming.set(null);
      this.list.reload();
    }
  }

  protected async setArchived(s: SchemeListItem, archived: boolean): Promise<void> {
    const done = await this.write(
      () => this.api.setArchived(this.projectId(), s.id, archived),
      archived ? 'The scheme could not be archived.' : 'The scheme could not be brought back.',
    );
    if (done) this.list.reload();
  }

  protected loadError(err: unknown): string {
    return errorMessage(err, 'The schemes could not be loaded.');
  }
}
