import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { MatSelect } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { schemeDetailSchema, type CheckSeverity, type SchemeCheck } from '@trabeate/contracts';
import { CAUTION, type SchemeResult } from '@trabeate/structural';
import { errorMessage } from '../../core/auth/api-error';
import { SEVERITY_LABELS, SOURCE_KIND_LABELS, numbersOf, ruleLabel } from './check-labels';
import type { PlanWorkerPort } from './plan-protocol';
import { createPlanWorker } from './plan-worker-factory';
import { PlanView } from './plan-view';
import { schemeUrl } from './schemes-api';

type SeverityFilter = CheckSeverity | 'all';

/**
 * One scheme on its plan, with the engine's checks beside it. The engine runs in a Web Worker on
 * the scheme as loaded (and, as the editor arrives, on every edit); the server's stored results
 * remain the record.
 */
@Component({
  selector: 'tb-planning-page',
  imports: [MatButton, MatFormField, MatIcon, MatLabel, MatOption, MatProgressSpinner, MatSelect, PlanView, RouterLink],
  templateUrl: './planning-page.html',
  styleUrls: ['../../shared/page/page.scss', './planning-page.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanningPage {
  /** Route-bound `:projectId` and `:schemeId`. */
  readonly projectId = input.required<string>();
  readonly schemeId = input.required<string>();

  protected readonly caution = CAUTION;
  protected readonly severityLabels = SEVERITY_LABELS;
  protected readonly sourceKindLabels = SOURCE_KIND_LABELS;
  protected readonly ruleLabel = ruleLabel;
  protected readonly numbersOf = numbersOf;

  protected readonly scheme = httpResource(() => schemeUrl(this.projectId(), this.schemeId()), {
    parse: (body) => schemeDetailSchema.parse(body),
  });
  protected readonly detail = computed(() => (this.scheme.hasValue() ? this.scheme.value() : undefined));

  private readonly worker: PlanWorkerPort = createPlanWorker();
  private seq = 0;
  protected readonly result = signal<SchemeResult | null>(null);
  protected readonly engineFault = signal<string | null>(null);
  protected readonly checking = signal(false);

  protected readonly severity = signal<SeverityFilter>('all');
  protected readonly rule = signal<string>('all');
  /** index into `failed` of the chosen check */
  protected readonly selected = signal<number | null>(null);

  /** failed checks as the engine lists them (errors first) */
  protected readonly failed = computed<SchemeCheck[]>(() =>
    (this.result()?.checks ?? []).filter((c) => c.status === 'fail'),
  );
  protected readonly rules = computed(() => [...new Set(this.failed().map((c) => c.ruleId))].sort());
  protected readonly shown = computed(() =>
    this.failed()
      .map((check, index) => ({ check, index }))
      .filter(
        ({ check }) =>
          (this.severity() === 'all' || check.severity === this.severity()) &&
          (this.rule() === 'all' || check.ruleId === this.rule()),
      ),
  );
  protected readonly counts = computed(() => {
    const c = { error: 0, warning: 0, info: 0 };
    for (const x of this.failed()) c[x.severity]++;
    return c;
  });
  protected readonly chosen = computed(() => {
    const i = this.selected();
    return i === null ? null : (this.failed()[i] ?? null);
  });

  constructor() {
    this.worker.onReply = (reply) => {
      if (reply.seq !== this.seq) return; // an answer to an older edit
      this.checking.set(false);
      if (reply.kind === 'result') {
        this.engineFault.set(null);
        this.result.set(reply.result);
      } else if (reply.kind === 'failed') this.engineFault.set(reply.message);
    };
    effect(() => {
      const d = this.detail();
      if (!d) return;
      this.selected.set(null);
      this.checking.set(true);
      this.worker.post({ kind: 'analyse', seq: ++this.seq, document: d.document });
    });
    inject(DestroyRef).onDestroy(() => this.worker.terminate());
  }

  protected choose(index: number): void {
    this.selected.set(this.selected() === index ? null : index);
  }

  protected setSeverity(v: SeverityFilter): void {
    this.severity.set(v);
    this.selected.set(null);
  }

  protected setRule(v: string): void {
    this.rule.set(v);
    this.selected.set(null);
  }

  protected loadError(err: unknown): string {
    return errorMessage(err, 'The scheme could not be loaded.');
  }
}
