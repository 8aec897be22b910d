import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { SchemeOutputs } from '../../planning/scheme-outputs';
import { RouterLink } from '@angular/router';
import {
  checkKey,
  stageSubmissionListSchema,
  type CheckJustification,
  type StageKey,
  type StageSubmission,
} from '@trabeate/contracts';
import { DayTimePipe } from '../../../shared/dates/app-dates';
import { StateMarker } from '../../../shared/state-marker/state-marker';
import { stageUrl } from '../projects-api';
import { formatMinor } from '../../fees/money';
import { StackOnPhone } from '../../../shared/stacked-table/stack-on-phone';

/**
 * The review of a stage's latest submission, for the firm: the scheme version it rests on (and
 * whether the scheme was saved again since), its check summary per rule, each error-level check
 * with the engineer's justification beside it, the decision taken on it and the draft invoice that
 * approval offered. Earlier submissions are listed below it. Clients never reach this (the API
 * answers them 403), so the stage panel shows it only to the firm.
 */
@Component({
  selector: 'tb-stage-review',
  imports: [DayTimePipe, MatButton, RouterLink, SchemeOutputs, StackOnPhone, StateMarker],
  templateUrl: './stage-review.html',
  styleUrl: './stage-review.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StageReview {
  readonly projectId = input.required<string>();
  readonly stageKey = input.required<StageKey>();
  /** Changes whenever the stage moves (its state and dates), so the review is read again. */
  readonly revision = input<string>('');
  /** The principal may open the Fees page, where the offered draft waits. */
  readonly canBill = input(false);
  /** the report and plan sheet panel (tb-scheme-outputs), opened on demand */
  protected readonly outputsOpen = signal(false);

  protected readonly submissions = httpResource(
    () => {
      this.revision();
      return `${stageUrl(this.projectId(), this.stageKey())}/submissions`;
    },
    { parse: (v) => stageSubmissionListSchema.parse(v) },
  );
  protected readonly latest = computed<StageSubmission | null>(() => this.submissions.value()?.items[0] ?? null);
  protected readonly earlier = computed(() => this.submissions.value()?.items.slice(1) ?? []);
  protected readonly errors = computed(
    () => this.latest()?.checks?.failing.filter((c) => c.severity === 'error') ?? [],
  );

  protected justificationFor(c: { ruleId: string; elements: string[] }): CheckJustification | undefined {
    const k = checkKey(c);
    return this.latest()?.justifications.find((j) => checkKey(j) === k);
  }

  protected readonly money = formatMinor;
}
