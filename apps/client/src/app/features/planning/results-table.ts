import { ChangeDetectionStrategy, Component, computed, input, signal } from '@angular/core';
import { DEFAULT_LOCALE } from '@trabeate/dates';
import { StateMarker, type MarkerShape, type MarkerTone } from '../../shared/state-marker/state-marker';
import { StackOnPhone } from '../../shared/stacked-table/stack-on-phone';

/** One column of a schedule: the row key it shows, its heading, and whether it holds figures. */
export interface ScheduleColumn {
  key: string;
  label: string;
  /** figures are right-aligned, sorted as numbers, and shown with `digits` decimals */
  numeric?: boolean;
  digits?: number;
  /** the column holds a state: each value is shown as its marker (shape and words) */
  states?: Record<string, { shape: MarkerShape; tone: MarkerTone; text: string }>;
}

export type ScheduleRow = Record<string, string | number | null>;

/**
 * A schedule: the dense table style, every column sortable by its heading (ascending, then
 * descending), and stacked label–value rows on a phone.
 */
@Component({
  selector: 'tb-results-table',
  imports: [StackOnPhone, StateMarker],
  template: `
    <table tbStackOnPhone class="tb-dense-table schedule" [attr.aria-label]="caption()" [attr.data-testid]="testId()">
      <thead>
        <tr>
          @for (c of columns(); track c.key) {
            <th scope="col" [attr.aria-sort]="ariaSort(c.key)" [class.tb-figure]="c.numeric">
              <button type="button" class="sort" (click)="sortBy(c.key)" [attr.data-testid]="'sort-' + c.key">
                {{ c.label }}
                <span class="dir" aria-hidden="true">{{ arrow(c.key) }}</span>
              </button>
            </th>
          }
        </tr>
      </thead>
      <tbody>
        @for (r of sorted(); track $index) {
          <tr data-testid="schedule-row">
            @for (c of columns(); track c.key) {
              <td [attr.data-label]="c.label" [class.tb-figure]="c.numeric">
                @if (c.states && c.states[$any(r[c.key])]; as st) {
                  <tb-state-marker [shape]="st.shape" [tone]="st.tone">{{ st.text }}</tb-state-marker>
                } @else {
                  {{ show(r[c.key], c) }}
                }
              </td>
            }
          </tr>
        } @empty {
          <tr>
            <td [attr.colspan]="columns().length" class="empty">{{ emptyText() }}</td>
          </tr>
        }
      </tbody>
    </table>
  `,
  styles: `
    :host {
      display: block;
      overflow-x: auto;
    }
    .sort {
      all: unset;
      cursor: pointer;
      display: inline-flex;
      gap: 0.25rem;
    }
    .sort:focus-visible {
      outline: 2px solid currentColor;
      outline-offset: 2px;
    }
    .dir {
      min-width: 0.8em;
    }
    .empty {
      font-style: italic;
    }
    @media (max-width: 600px) {
      thead tr {
        display: flex;
        flex-wrap: wrap;
        gap: 0.25rem 0.75rem;
      }
      th {
        border: 0 !important;
      }
      tbody tr {
        display: block;
        padding: 0.5rem 0;
        border-bottom: 1px solid var(--tb-rule-soft);
      }
      td {
        display: flex;
        gap: 0.75rem;
        border: 0 !important;
        padding: 0.1rem 0;
        text-align: left !important;
      }
      td[data-label]::before {
        content: attr(data-label);
        flex: 0 0 9rem;
        font-size: var(--tb-type-caption);
        font-weight: 700;
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResultsTable {
  readonly columns = input.required<ScheduleColumn[]>();
  readonly rows = input.required<ScheduleRow[]>();
  readonly caption = input.required<string>();
  readonly testId = input<string>('schedule');
  readonly emptyText = input('Nothing to list.');

  protected readonly sortKey = signal<string | null>(null);
  protected readonly descending = signal(false);

  protected readonly sorted = computed(() => {
    const key = this.sortKey();
    const rows = this.rows();
    if (!key) return rows;
    const numeric = this.columns().find((c) => c.key === key)?.numeric;
    const dir = this.descending() ? -1 : 1;
    return [...rows].sort((a, b) => {
      const x = a[key];
      const y = b[key];
      if (x === null || y === null) return x === y ? 0 : x === null ? 1 : -1;
      const c = numeric
        ? Number(x) - Number(y)
        : String(x).localeCompare(String(y), undefined, { numeric: true, sensitivity: 'base' });
      return c * dir;
    });
  });

  protected sortBy(key: string): void {
    if (this.sortKey() === key) this.descending.set(!this.descending());
    else {
      this.sortKey.set(key);
      this.descending.set(false);
    }
  }

  protected ariaSort(key: string): 'ascending' | 'descending' | 'none' {
    if (this.sortKey() !== key) return 'none';
    return this.descending() ? 'descending' : 'ascending';
  }

  protected arrow(key: string): string {
    if (this.sortKey() !== key) return '';
    return this.descending() ? '▼' : '▲';
  }

  protected show(v: string | number | null, c: ScheduleColumn): string {
    if (v === null) return '—';
    if (typeof v === 'number' && c.numeric)
      return v.toLocaleString(DEFAULT_LOCALE, {
        minimumFractionDigits: c.digits ?? 0,
        maximumFractionDigits: c.digits ?? 0,
      });
    return String(v);
  }
}
