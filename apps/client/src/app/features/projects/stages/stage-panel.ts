import { HttpErrorResponse } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
  output,
  signal,
  viewChild,
} from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { MatDatepicker, MatDatepickerInput, MatDatepickerToggle } from '@angular/material/datepicker';
import { MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatSelect } from '@angular/material/select';
import {
  isSchemeStage,
  type ProjectPage,
  type Stage,
  type StageAction,
  type StageTransition,
} from '@trabeate/contracts';
import { firstValueFrom } from 'rxjs';
import { errorMessage } from '../../../core/auth/api-error';
import { Notice } from '../../../core/notice';
import { ACTION_LABELS, STATE_LABELS, STATE_MARKERS } from '../project-labels';
import { ProjectsApi } from '../projects-api';
import { DeliverablesPanel } from './deliverables-panel';
import { ConfirmDialog, type ConfirmData } from '../../../shared/confirm-dialog/confirm-dialog';
import { StageActionDialog, StageActionDialogData } from './stage-action-dialog';
import { StageComments } from './stage-comments';
import { StageReview } from './stage-review';
import { StageSubmitDialog, type StageSubmitDialogData } from './stage-submit-dialog';
import { fromIsoDay, toIsoDay } from '../../../shared/dates/firm-date-adapter';
import { DayPipe, DayTimePipe, WaitedPipe } from '../../../shared/dates/app-dates';
import { StateMarker } from '../../../shared/state-marker/state-marker';

const ACTION_ORDER: readonly StageAction[] = ['start', 'submit', 'approve', 'return', 'reopen'];
const DONE: Readonly<Record<StageAction, string>> = {
  start: 'Work started.',
  submit: 'Submitted for review; the principal is told by e-mail.',
  approve: 'Stage approved; the engineer is told by e-mail.',
  return: 'Stage returned with your comment; the engineer is told by e-mail.',
  reopen: 'Stage reopened.',
};

/** One stage: what the caller may do with it now, who has it and by when, its files and its thread. */
@Component({
  selector: 'tb-stage-panel',
  imports: [
    StateMarker,
    DayPipe,
    DayTimePipe,
    WaitedPipe,
    DeliverablesPanel,
    MatButton,
    MatDatepicker,
    MatDatepickerInput,
    MatDatepickerToggle,
    MatFormField,
    MatHint,
    MatSuffix,
    MatIcon,
    MatInput,
    MatLabel,
    MatOption,
    MatSelect,
    StageComments,
    StageReview,
  ],
  templateUrl: './stage-panel.html',
  styleUrl: './stage-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StagePanel {
  private readonly api = inject(ProjectsApi);
  private readonly dialog = inject(MatDialog);
  private readonly notice = inject(Notice);

  readonly project = input.required<ProjectPage>();
  readonly stage = input.required<Stage>();
  /** Something about the stage changed on the server; the page reads the project again. */
  readonly changed = output<void>();

  private readonly comments = viewChild(StageComments);

  protected readonly stateLabels = STATE_LABELS;
  protected readonly markers = STATE_MARKERS;
  protected readonly actions = computed(() => ACTION_ORDER.filter((a) => this.stage().allowedActions.includes(a)));
  protected readonly manage = computed(() => this.project().abilities.manage);
  protected readonly work = computed(() => this.project().abilities.work);
  /** Working files and the review thread are the firm's; a client contact sees neither. */
  protected readonly seeInternal = computed(() => this.project().abilities.seeInternal);
  /**
   * Who can carry a stage: the firm's engineers (the server adds one to the project team when
   * assigned). Without the firm's list, the engineers already on the project.
   */
  readonly engineers = input<readonly { id: string; displayName: string }[] | undefined>();
  protected readonly staff = computed(
    () => this.engineers() ?? this.project().members.filter((m) => m.role === 'engineer'),
  );
  /** Column layout, Beam framing and Foundations are submitted with a scheme version and reviewed with its checks. */
  protected readonly schemeStage = computed(() => isSchemeStage(this.stage().key));
  /** Read the review again whenever the stage moves. */
  protected readonly reviewRevision = computed(() => {
    const s = this.stage();
    return `${s.state}|${s.submittedAt ?? ''}|${s.approvedAt ?? ''}`;
  });
  /** Files change only while the work is open: not under review, not once approved. */
  protected readonly canUpload = computed(
    () => this.work() && this.stage().state !== 'under_review' && this.stage().state !== 'approved',
  );

  protected readonly assigneeId = linkedSignal(() => this.stage().assignee?.id ?? '');
  protected readonly dueDate = linkedSignal(() => this.stage().dueDate ?? '');
  protected readonly dueDateValue = computed(() => fromIsoDay(this.dueDate()));
  protected readonly toIsoDay = toIsoDay;
  protected readonly assignmentChanged = computed(
    () => this.assigneeId() !== (this.stage().assignee?.id ?? '') || this.dueDate() !== (this.stage().dueDate ?? ''),
  );

  protected readonly busy = signal(false);
  /** Cleared whenever another stage is shown. */
  protected readonly actionError = linkedSignal<Stage, string>({ source: this.stage, computation: () => '' });

  protected label(action: StageAction): string {
    return ACTION_LABELS[action];
  }

  protected async act(action: StageAction): Promise<void> {
    if (this.busy()) return;
    let body: StageTransition;
    if (action === 'submit' && this.schemeStage()) {
      // The dialog names the scheme version, answers its error-level checks and submits itself.
      const ref = this.dialog.open<StageSubmitDialog, StageSubmitDialogData, Stage>(StageSubmitDialog, {
        data: { projectId: this.project().id, stageKey: this.stage().key, stageTitle: this.stage().title },
        autoFocus: 'first-heading',
      });
      const submitted = await firstValueFrom(ref.afterClosed());
      if (!submitted) return;
      this.notice.show(DONE.submit, 5000);
      this.comments()?.reload();
      this.changed.emit();
      return;
    }
    if (action === 'return' || action === 'reopen') {
      const ref = this.dialog.open<StageActionDialog, StageActionDialogData, string>(StageActionDialog, {
        data: { action, stageTitle: this.stage().title },
      });
      const text = await firstValueFrom(ref.afterClosed());
      if (!text) return;
      body = action === 'return' ? { action, comment: text } : { action, reason: text };
    } else if (action === 'approve') {
      // Approving tells the engineer and closes the stage's files: ask once, naming what happens.
      const ref = this.dialog.open<ConfirmDialog, ConfirmData, boolean>(ConfirmDialog, {
        data: {
          title: `Approve ${this.stage().title}?`,
          message:
            'The stage is marked approved, its files can no longer change and the engineer is told by e-mail. If the stage carries a share of the fee, a draft invoice for it is prepared in Fees. You can reopen it later, giving a reason.',
          confirm: 'Approve stage',
          danger: false,
        },
      });
      if (!(await firstValueFrom(ref.afterClosed()))) return;
      body = { action };
    } else {
      body = { action };
    }
    await this.run(async () => {
      await this.api.transition(this.project().id, this.stage().key, body);
      this.notice.show(DONE[action], 5000);
    });
  }

  protected async saveAssignment(): Promise<void> {
    await this.run(async () => {
      await this.api.patchStage(this.project().id, this.stage().key, {
        assigneeId: this.assigneeId() || null,
        dueDate: this.dueDate() || null,
      });
      this.notice.show('Assignment saved.', 4000);
    });
  }

  protected refreshed(): void {
    this.changed.emit();
  }

  private async run(work: () => Promise<void>): Promise<void> {
    if (this.busy()) return;
    this.busy.set(true);
    this.actionError.set('');
    try {
      await work();
      this.comments()?.reload();
      this.changed.emit();
    } catch (err) {
      const status = err instanceof HttpErrorResponse ? err.status : 0;
      // 409: the stage moved on meanwhile (someone else acted); the server says how it stands.
      if (status === 409) this.changed.emit();
      if (status !== 401) this.actionError.set(errorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
