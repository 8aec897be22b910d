import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { RouterLink } from '@angular/router';
import { schemeDetailSchema } from '@trabeate/contracts';
import { CAUTION, type SchemeComparison } from '@trabeate/structural';
import { errorMessage } from '../../core/auth/api-error';
import { SEVERITY_LABELS } from './check-labels';
import type { PlanWorkerPort } from './plan-protocol';
import { createPlanWorker } from './plan-worker-factory';
import { PlanView } from './plan-view';
import { schemeUrl } from './schemes-api';
import { StackOnPhone } from '../../shared/stacked-table/stack-on-phone';

const quantity = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 });

/**
 * Two schemes of a project side by side: plan thumbnails, the figures that differ, cost by member
 * type, and the engine's plain sentences on what drives the difference. Route-bound `?a=&b=`.
 */
@Component({
  selector: 'tb-compare-page',
  imports: [MatButton, MatIcon, MatProgressSpinner, PlanView, RouterLink, StackOnPhone],
  templateUrl: './compare-page.html',
  styleUrls: ['../../shared/page/page.scss', './compare-page.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ComparePage {
  readonly projectId = input.required<string>();
  readonly a = input<string>('');
  readonly b = input<string>('');

  protected readonly caution = CAUTION;
  protected readonly severityLabels = SEVERITY_LABELS;
  /** the engine's severities, most serious first */
  protected readonly severities = ['error', 'warning', 'info'] as const;
  // Nothing loads until both are named: one scheme alone has nothing to be compared with.
  private readonly pair = computed(() => (this.a() && this.b() ? [this.a(), this.b()] : null));
  protected readonly first = httpResource(() => this.pairUrl(0), {
    parse: (body) => schemeDetailSchema.parse(body),
  });
  protected readonly second = httpResource(() => this.pairUrl(1), {
    parse: (body) => schemeDetailSchema.parse(body),
  });
  protected readonly both = computed(() =>
    this.first.hasValue() && this.second.hasValue() ? ([this.first.value(), this.second.value()] as const) : null,
  );

  private readonly worker: PlanWorkerPort = createPlanWorker();
  private seq = 0;
  protected readonly comparison = signal<SchemeComparison | null>(null);
  protected readonly fault = signal<string | null>(null);

  constructor() {
    this.worker.onReply = (reply) => {
      if (reply.seq !== this.seq) return;
      if (reply.kind === 'comparison') this.comparison.set(reply.comparison);
      else if (reply.kind === 'failed') this.fault.set(reply.message);
    };
    effect(() => {
      const pair = this.both();
      if (!pair) return;
      this.comparison.set(null);
      this.worker.post({ kind: 'compare', seq: ++this.seq, a: pair[0].document, b: pair[1].document });
    });
    inject(DestroyRef).onDestroy(() => this.worker.terminate());
  }

  private pairUrl(i: 0 | 1): string | undefined {
    const pair = this.pair();
    return pair ? schemeUrl(this.projectId(), pair[i]) : undefined;
  }

  protected money(value: number, currency: string): string {
    try {
      return new Intl.NumberFormat('en-GB', { style: 'currency', currency, maximumFractionDigits: 0 }).format(value);
    } catch {
      return `${quantity.format(value)} ${currency}`; // not an ISO currency code
    }
  }

  protected figure(value: number, unit: string, currency: string): string {
    return unit === currency ? this.money(value, currency) : `${quantity.format(value)} ${unit}`;
  }

  protected signed(value: number, unit: string, currency: string): string {
    if (Math.abs(value) < 1e-9) return 'same';
    return `${value > 0 ? '+' : '−'}${this.figure(Math.abs(value), unit, currency)}`;
  }

  protected loadError(err: unknown): string {
    return errorMessage(err, 'A scheme could not be loaded.');
  }
}
