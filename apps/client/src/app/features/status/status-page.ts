import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import { formatDuration } from './format-duration';
import { HealthService } from './health.service';

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

  protected readonly summary = computed(() => {
    const h = this.health();
    if (!h) return '';
    if (h.database.status === 'down') return 'The server is running, but it cannot reach its database.';
    return h.status === 'ok' ? 'Everything is working.' : 'The server is running with problems.';
  });

  protected readonly uptime = computed(() => {
    const h = this.health();
    return h ? formatDuration(h.uptimeSeconds) : '';
  });

  protected refresh(): void {
    this.healthService.refresh();
  }
}
