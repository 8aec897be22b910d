import type { DependencyHealth, Health } from '@trabeate/contracts';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { formatDuration } from './format-duration';
import { HealthService } from './health.service';

type DependencyName = keyof Health['dependencies'];

/** How each dependency is named on the page, and what stops working without it. */
const DEPENDENCY_ROWS: ReadonlyArray<{ name: DependencyName; label: string; icon: string; without: string }> = [
  { name: 'database', label: 'Database', icon: 'database', without: 'Nothing works without it.' },
  {
    name: 'jobQueue',
    label: 'Job queue',
    icon: 'pending_actions',
    without: 'Changes that send notices wait for it.',
  },
  {
    name: 'objectStorage',
    label: 'File storage',
    icon: 'inventory_2',
    without: 'Without it, files cannot be uploaded or downloaded; the rest keeps working.',
  },
  {
    name: 'mailRelay',
    label: 'Mail relay',
    icon: 'outgoing_mail',
    without: 'Without it, notices wait in the queue and go out once it answers.',
  },
];

const STATE_WORDS: Record<DependencyHealth['status'], string> = {
  up: 'up',
  down: 'down',
  not_configured: 'not set up',
};

@Component({
  selector: 'tb-status-page',
  imports: [MatButton, MatIcon, MatProgressBar],
  providers: [HealthService],
  templateUrl: './status-page.html',
  styleUrl: './status-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StatusPage {
  private readonly healthService = inject(HealthService);

  protected readonly view = this.healthService.view;
  protected readonly busy = this.healthService.busy;

  protected readonly health = computed(() => {
    const v = this.view();
    return v.kind === 'ready' ? v.health : null;
  });

  protected readonly problem = computed(() => {
    const v = this.view();
    return v.kind === 'error' ? v.message : '';
  });

  /** One row per dependency, in a fixed order, with its words ready for the template. */
  protected readonly rows = computed(() => {
    const h = this.health();
    if (!h) return [];
    return DEPENDENCY_ROWS.map((row) => {
      const d = h.dependencies[row.name];
      return { ...row, health: d, word: STATE_WORDS[d.status] };
    });
  });

  protected readonly summary = computed(() => {
    const h = this.health();
    if (!h) return '';
    const down = this.rows()
      .filter((r) => r.health.status === 'down')
      .map((r) => r.label.toLowerCase());
    if (h.status === 'down') return `The server cannot work: it cannot reach its ${listOf(down)}.`;
    if (h.status === 'degraded') return `The server is working, but it cannot reach its ${listOf(down)}.`;
    return 'Everything is working.';
  });

  protected readonly uptime = computed(() => {
    const h = this.health();
    return h ? formatDuration(h.uptimeSeconds) : '';
  });

  protected refresh(): void {
    this.healthService.refresh();
  }
}

/** "a", "a and b", "a, b and c". */
function listOf(items: string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}
