import { HttpParams, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, input, linkedSignal, signal } from '@angular/core';
import { MatOption } from '@angular/material/core';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatPaginator, PageEvent } from '@angular/material/paginator';
import { MatSelect } from '@angular/material/select';
import type { Activity, StageKey } from '@trabeate/contracts';
import { errorMessage } from '../../core/auth/api-error';
import { ACTIVITY_TYPES, ActivityObjectType, STAGE_ORDER, STAGE_TITLES } from './project-labels';
import { projectUrl } from './projects-api';
import { DayTimePipe } from '../../shared/dates/app-dates';

interface ActivityPage {
  readonly items: Activity[];
  readonly total: number;
  readonly page: number;
  readonly pageSize: number;
}

/** Everything that happened on the project, newest first, filterable by kind and stage. */
@Component({
  selector: 'tb-activity-log',
  imports: [DayTimePipe, MatFormField, MatLabel, MatOption, MatPaginator, MatSelect],
  template: `
    <section aria-labelledby="activity-heading" data-testid="activity">
      <div class="head">
        <h2 id="activity-heading">Activity</h2>
        <mat-form-field subscriptSizing="dynamic">
          <mat-label>What</mat-label>
          <mat-select
            data-testid="activity-type"
            [value]="objectType()"
            (selectionChange)="objectType.set($event.value); page.set(1)"
          >
            <mat-option value="">Everything</mat-option>
            @for (t of types; track t.value) {
              <mat-option [value]="t.value">{{ t.label }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <mat-form-field subscriptSizing="dynamic">
          <mat-label>Stage</mat-label>
          <mat-select
            data-testid="activity-stage"
            [value]="stageKey()"
            (selectionChange)="stageKey.set($event.value); page.set(1)"
          >
            <mat-option value="">All stages</mat-option>
            @for (k of stages; track k) {
              <mat-option [value]="k">{{ titles[k] }}</mat-option>
            }
          </mat-select>
        </mat-form-field>
      </div>
      @if (log.error(); as err) {
        <p class="failure" role="alert">The activity could not be loaded. {{ message(err) }}</p>
      } @else if (shown(); as data) {
        @if (data.items.length === 0) {
          <p class="muted">Nothing recorded{{ objectType() || stageKey() ? ' for this filter' : ' yet' }}.</p>
        } @else {
          <ol class="log">
            @for (a of data.items; track a.id) {
              <li data-testid="activity-entry">
                <time [attr.datetime]="a.at">{{ a.at | tbDayTime }}</time>
                <span>{{ a.summary }}</span>
              </li>
            }
          </ol>
          <mat-paginator
            [length]="data.total"
            [pageIndex]="page() - 1"
            [pageSize]="pageSize()"
            [pageSizeOptions]="[20, 50, 100]"
            (page)="paged($event)"
            aria-label="Pages of activity"
          />
        }
      } @else {
        <p class="muted" role="status">Loading the activity…</p>
      }
    </section>
  `,
  styles: `
    .head {
      display: flex;
      flex-wrap: wrap;
      gap: 0.75rem;
      align-items: center;
      margin-bottom: 0.5rem;
    }
    h2 {
      font: var(--mat-sys-title-medium);
      margin: 0;
      flex: 1;
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
    }
    .log {
      list-style: none;
      margin: 0;
      padding: 0;
    }
    .log li {
      display: grid;
      grid-template-columns: 10rem 1fr;
      gap: 1rem;
      padding: 0.4rem 0;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    time {
      color: var(--mat-sys-on-surface-variant);
      font-family: var(--tb-font-numbers);
      font-size: 0.85em;
    }
    .failure {
      padding: 0.5rem 0.75rem;
      border-left: 4px solid var(--mat-sys-error);
      background: var(--mat-sys-error-container);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ActivityLog {
  readonly projectId = input.required<string>();

  protected readonly types = ACTIVITY_TYPES;
  protected readonly stages = STAGE_ORDER;
  protected readonly titles = STAGE_TITLES;
  protected readonly objectType = signal<ActivityObjectType | ''>('');
  protected readonly stageKey = signal<StageKey | ''>('');
  protected readonly page = signal(1);
  protected readonly pageSize = signal(20);

  protected readonly log = httpResource<ActivityPage>(() => {
    let params = new HttpParams().set('page', this.page()).set('pageSize', this.pageSize());
    if (this.objectType()) params = params.set('objectType', this.objectType());
    if (this.stageKey()) params = params.set('stageKey', this.stageKey());
    return { url: `${projectUrl(this.projectId())}/activity`, params };
  });
  protected readonly shown = linkedSignal<ActivityPage | undefined, ActivityPage | undefined>({
    source: () => (this.log.hasValue() ? this.log.value() : undefined),
    computation: (next, previous) => next ?? previous?.value,
  });

  reload(): void {
    this.log.reload();
  }

  protected paged(e: PageEvent): void {
    this.pageSize.set(e.pageSize);
    this.page.set(e.pageIndex + 1);
  }

  protected message(err: unknown): string {
    return errorMessage(err);
  }
}
