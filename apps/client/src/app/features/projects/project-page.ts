import { DecimalPipe } from '@angular/common';
import { HttpClient, httpResource } from '@angular/common/http';
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
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { MatSelect } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import type { Person, ProjectPage as ProjectPageData, Stage, StageKey } from '@trabeate/contracts';
import { firstValueFrom } from 'rxjs';
import { errorMessage } from '../../core/auth/api-error';
import { ROLE_LABELS, Session } from '../../core/auth/session';
import { Notice } from '../../core/notice';
import { ConfirmDialog, ConfirmData } from '../../shared/confirm-dialog/confirm-dialog';
import { ActivityLog } from './activity-log';
import { STAGE_ORDER, STATE_LABELS, STATE_MARKERS, codeFamilyLabel } from './project-labels';
import { ProjectsApi, projectUrl } from './projects-api';
import { StagePanel } from './stages/stage-panel';
import { DayPipe, FIRM_DATES, WaitedPipe } from '../../shared/dates/app-dates';
import { StateMarker } from '../../shared/state-marker/state-marker';

/** One project: its facts, its six stages as a row of bays, the chosen stage's panel, and the log. */
@Component({
  selector: 'tb-project-page',
  imports: [
    StateMarker,
    ActivityLog,
    DayPipe,
    WaitedPipe,
    DecimalPipe,
    MatButton,
    MatIconButton,
    MatFormField,
    MatLabel,
    MatIcon,
    MatOption,
    MatProgressSpinner,
    MatSelect,
    RouterLink,
    StagePanel,
  ],
  templateUrl: './project-page.html',
  styleUrls: ['../../shared/page/page.scss', './project-page.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectPage {
  private readonly http = inject(HttpClient);
  private readonly api = inject(ProjectsApi);
  private readonly dialog = inject(MatDialog);
  private readonly notice = inject(Notice);
  private readonly session = inject(Session);
  private readonly router = inject(Router);
  private readonly firmDates = inject(FIRM_DATES);
  /** Schemes are the firm's working files: the link shows for its staff only. */
  protected readonly firmStaff = computed(() => {
    const role = this.session.role();
    return role === 'principal' || role === 'engineer';
  });

  /** Route-bound `:projectId`. */
  readonly projectId = input.required<string>();
  /** Route-bound `?stage=`: the stage whose panel is open, kept in the address. */
  readonly stage = input<string>();

  protected readonly project = httpResource<ProjectPageData>(() => `${projectUrl(this.projectId())}/full`);
  protected readonly data = computed(() => (this.project.hasValue() ? this.project.value() : undefined));
  protected readonly stages = computed(() => {
    const stages = this.data()?.stages ?? [];
    return [...stages].sort((a, b) => STAGE_ORDER.indexOf(a.key) - STAGE_ORDER.indexOf(b.key));
  });
  /**
   * Without a stage in the address: the first one not yet approved (where the work is), picked once
   * per project, so approving it does not move the panel away from under the principal's hand.
   */
  private readonly defaultKey = linkedSignal<{ id: string; key: StageKey | undefined }, StageKey | undefined>({
    source: () => {
      const stages = this.stages();
      return { id: this.projectId(), key: (stages.find((s) => s.state !== 'approved') ?? stages[0])?.key };
    },
    computation: (next, previous) => (previous?.value && previous.source.id === next.id ? previous.value : next.key),
  });
  protected readonly selected = computed<Stage | undefined>(() => {
    const stages = this.stages();
    return stages.find((s) => s.key === this.stage()) ?? stages.find((s) => s.key === this.defaultKey());
  });

  protected readonly stateLabels = STATE_LABELS;
  protected readonly markers = STATE_MARKERS;
  protected readonly familyLabel = codeFamilyLabel;

  /** A unit rate in the project's currency, to the cent (rates per kg are small). */
  protected rate(value: number, currency: string): string {
    return new Intl.NumberFormat(this.firmDates().dateLocale, {
      style: 'currency',
      currency,
      minimumFractionDigits: 2,
    }).format(value);
  }
  protected readonly busy = signal(false);
  private readonly activity = viewChild(ActivityLog);

  /** The firm's people list is asked for only by someone who may manage the project. */
  private readonly people = httpResource<Person[]>(() => (this.data()?.abilities.manage ? '/api/people' : undefined));
  protected readonly candidates = computed(() => {
    const p = this.data();
    const all = this.people.hasValue() ? this.people.value() : [];
    if (!p) return [];
    const on = new Set(p.members.map((m) => m.id));
    // The principal sees every project already; client contacts only join their own organisation's projects.
    return all.filter(
      (x) =>
        x.status !== 'removed' &&
        x.role !== 'principal' &&
        !on.has(x.id) &&
        (x.role !== 'client' || x.clientOrganisation?.id === p.clientOrganisation.id),
    );
  });
  /** The firm's engineers, for stage assignment (the principal only). */
  protected readonly engineers = computed(() =>
    this.people.hasValue()
      ? this.people
          .value()
          .filter((x) => x.role === 'engineer' && x.status !== 'removed')
          .map((x) => ({ id: x.id, displayName: x.displayName }))
      : undefined,
  );
  protected readonly toAdd = signal<string | null>(null);

  protected loadError(err: unknown): string {
    return errorMessage(err, 'The project could not be loaded. Check the connection and try again.');
  }

  protected roleLabel(role: keyof typeof ROLE_LABELS): string {
    return ROLE_LABELS[role];
  }

  protected choose(key: StageKey): void {
    void this.router.navigate([], { queryParams: { stage: key }, queryParamsHandling: 'merge', replaceUrl: true });
  }

  /** After any change on a stage: the stage states, counts and the log all move. */
  protected refresh(): void {
    this.project.reload();
    this.activity()?.reload();
  }

  protected async toggleArchive(): Promise<void> {
    const p = this.data();
    if (!p || this.busy()) return;
    const archive = !p.archivedAt;
    const ref = this.dialog.open<ConfirmDialog, ConfirmData, boolean>(ConfirmDialog, {
      data: archive
        ? {
            title: `Archive ${p.reference}?`,
            message:
              'An archived project leaves the active list and its stages can no longer move. You can bring it back later.',
            confirm: 'Archive',
          }
        : {
            title: `Bring ${p.reference} back?`,
            message: 'The project returns to the active list.',
            confirm: 'Unarchive',
          },
    });
    if (!(await firstValueFrom(ref.afterClosed()))) return;
    await this.guarded(async () => {
      await this.api.setArchived(p.id, archive);
      this.notice.show(archive ? 'Project archived.' : 'Project back in the active list.', 4000);
      this.refresh();
    });
  }

  protected addMember(): Promise<void> {
    const userId = this.toAdd();
    return userId ? this.changeMember('put', userId, 'Added to the project.') : Promise.resolve();
  }

  protected removeMember(userId: string): Promise<void> {
    return this.changeMember('delete', userId, 'Taken off the project.');
  }

  private changeMember(method: 'put' | 'delete', userId: string, done: string): Promise<void> {
    const url = `${projectUrl(this.projectId())}/members/${encodeURIComponent(userId)}`;
    return this.guarded(async () => {
      await firstValueFrom(method === 'put' ? this.http.put(url, {}) : this.http.delete(url));
      this.toAdd.set(null);
      this.notice.show(done, 4000);
      this.refresh();
    });
  }

  private async guarded(work: () => Promise<void>): Promise<void> {
    if (this.busy()) return;
    this.busy.set(true);
    try {
      await work();
    } catch (err) {
      // 401 and 403 are already announced by the interceptor.
      const status = (err as { status?: number }).status;
      if (status !== 401 && status !== 403) this.notice.show(errorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
