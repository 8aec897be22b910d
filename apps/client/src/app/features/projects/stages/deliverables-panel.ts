import { CdkCopyToClipboard } from '@angular/cdk/clipboard';
import { HttpErrorResponse, HttpEventType, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, output, signal } from '@angular/core';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressBar } from '@angular/material/progress-bar';
import type { Deliverable, StageKey } from '@trabeate/contracts';
import { Subscription } from 'rxjs';
import { errorMessage } from '../../../core/auth/api-error';
import { Notice } from '../../../core/notice';
import { formatBytes } from '../project-labels';
import { ProjectsApi, stageUrl } from '../projects-api';
import { DayTimePipe } from '../../../shared/dates/app-dates';
import { StackOnPhone } from '../../../shared/stacked-table/stack-on-phone';

export interface DeliverableGroup {
  readonly fileName: string;
  /** Newest version first. */
  readonly versions: readonly Deliverable[];
}

/** Versions of the same file name together, files in name order, newest version on top. */
export function groupByFileName(items: readonly Deliverable[]): DeliverableGroup[] {
  const groups = new Map<string, Deliverable[]>();
  for (const d of items) (groups.get(d.fileName) ?? groups.set(d.fileName, []).get(d.fileName)!).push(d);
  return [...groups.entries()]
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([fileName, versions]) => ({ fileName, versions: [...versions].sort((a, b) => b.version - a.version) }));
}

/** What to tell the uploader when the server refuses the file or the connection fails. */
export function uploadFailure(err: unknown): string {
  const status = err instanceof HttpErrorResponse ? err.status : -1;
  if (status === 0) return 'The upload stopped: the connection to the server was lost. Try again.';
  // 413 (too large), 415 (a kind we do not take), 422 (content is not what the name says): the
  // server's sentence says which rule refused the file.
  if (status === 413) return errorMessage(err, 'The file is larger than the server accepts.');
  if (status === 415) return errorMessage(err, 'The server does not accept this kind of file.');
  if (status === 422) return errorMessage(err, 'The file’s content does not match its name.');
  return errorMessage(err, 'The upload failed. Try again.');
}

interface Progress {
  readonly fileName: string;
  readonly loaded: number;
  readonly total: number | null;
}

/** A stage's deliverable files: versions, sizes and SHA-256, with a drop area for new ones. */
@Component({
  selector: 'tb-deliverables-panel',
  imports: [StackOnPhone, CdkCopyToClipboard, DayTimePipe, MatButton, MatIconButton, MatIcon, MatProgressBar],
  template: `
    <section aria-labelledby="deliverables-heading" data-testid="deliverables">
      <h3 id="deliverables-heading">Deliverables</h3>
      @if (canUpload()) {
        <div
          class="drop"
          [class.over]="dragging()"
          data-testid="drop-area"
          (dragover)="$event.preventDefault(); dragging.set(true)"
          (dragleave)="dragging.set(false)"
          (drop)="dropped($event)"
        >
          <mat-icon aria-hidden="true">upload_file</mat-icon>
          <span>Drop a file here, or</span>
          <button mat-stroked-button type="button" [disabled]="!!progress()" (click)="picker.click()">
            Choose a file
          </button>
          <input #picker type="file" hidden data-testid="file-input" (change)="picked(picker)" />
          <span class="hint">A file with the same name as an earlier one becomes its next version.</span>
        </div>
        @if (progress(); as p) {
          <div class="progress" role="status" data-testid="upload-progress">
            <span>Uploading {{ p.fileName }} — {{ percent() === null ? size(p.loaded) : percent() + ' %' }}</span>
            <mat-progress-bar
              [mode]="percent() === null ? 'indeterminate' : 'determinate'"
              [value]="percent() ?? 0"
              aria-label="Upload progress"
            />
            <button mat-button type="button" (click)="cancel()">Cancel</button>
          </div>
        }
        @if (failure(); as f) {
          <p class="failure" role="alert" data-testid="upload-error">
            <mat-icon aria-hidden="true">error</mat-icon>
            {{ f }}
          </p>
        }
      }

      @if (list.error(); as err) {
        <p class="failure" role="alert">The files could not be loaded. {{ message(err) }}</p>
      } @else if (!list.hasValue()) {
        <p class="muted" role="status">Loading the files…</p>
      } @else if (groups().length === 0) {
        <p class="muted" data-testid="no-deliverables">No files yet for this stage.</p>
      } @else {
        <ul class="files">
          @for (g of groups(); track g.fileName) {
            <li data-testid="deliverable-group">
              <div class="file-name">
                <mat-icon aria-hidden="true">description</mat-icon><strong>{{ g.fileName }}</strong>
                <span class="muted">{{ g.versions.length === 1 ? '1 version' : g.versions.length + ' versions' }}</span>
              </div>
              <table tbStackOnPhone class="versions">
                <thead>
                  <tr>
                    <th scope="col">Version</th>
                    <th scope="col">Size</th>
                    <th scope="col">SHA-256</th>
                    <th scope="col">Uploaded</th>
                    <th scope="col"><span class="sr-only">Download</span></th>
                  </tr>
                </thead>
                <tbody>
                  @for (d of g.versions; track d.id) {
                    <tr data-testid="deliverable-version">
                      <td>v{{ d.version }}</td>
                      <td>{{ size(d.sizeBytes) }}</td>
                      <td class="hash">
                        <code [title]="d.sha256">{{ d.sha256.slice(0, 12) }}…</code>
                        <button
                          mat-icon-button
                          type="button"
                          [cdkCopyToClipboard]="d.sha256"
                          (cdkCopyToClipboardCopied)="copied()"
                          [attr.aria-label]="'Copy the SHA-256 of ' + g.fileName + ' v' + d.version"
                        >
                          <mat-icon>content_copy</mat-icon>
                        </button>
                      </td>
                      <td>{{ d.uploadedBy.displayName }}, {{ d.uploadedAt | tbDayTime }}</td>
                      <td>
                        <a mat-button [href]="d.downloadUrl" download data-testid="download"
                          ><mat-icon>download</mat-icon>Download</a
                        >
                      </td>
                    </tr>
                  }
                </tbody>
              </table>
            </li>
          }
        </ul>
      }
    </section>
  `,
  styleUrl: './deliverables-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DeliverablesPanel {
  private readonly api = inject(ProjectsApi);
  private readonly notice = inject(Notice);

  readonly projectId = input.required<string>();
  readonly stageKey = input.required<StageKey>();
  readonly canUpload = input(false);
  /** A new version was stored (the page refreshes its counts). */
  readonly uploaded = output<Deliverable>();

  protected readonly list = httpResource<Deliverable[]>(
    () => `${stageUrl(this.projectId(), this.stageKey())}/deliverables`,
  );
  protected readonly groups = computed(() => groupByFileName(this.list.hasValue() ? this.list.value() : []));

  protected readonly dragging = signal(false);
  protected readonly progress = signal<Progress | null>(null);
  protected readonly percent = computed(() => {
    const p = this.progress();
    return p && p.total ? Math.min(100, Math.round((100 * p.loaded) / p.total)) : null;
  });
  protected readonly failure = signal('');
  private running?: Subscription;

  constructor() {
    inject(DestroyRef).onDestroy(() => this.running?.unsubscribe());
  }

  protected size(bytes: number): string {
    return formatBytes(bytes);
  }

  protected message(err: unknown): string {
    return errorMessage(err);
  }

  protected copied(): void {
    this.notice.show('SHA-256 copied.', 2500);
  }

  protected dropped(event: DragEvent): void {
    event.preventDefault();
    this.dragging.set(false);
    const file = event.dataTransfer?.files?.[0];
    if (file) this.upload(file);
  }

  protected picked(picker: HTMLInputElement): void {
    const file = picker.files?.[0];
    // Cleared so that choosing the same file again still fires a change.
    picker.value = '';
    if (file) this.upload(file);
  }

  protected cancel(): void {
    this.running?.unsubscribe();
    this.progress.set(null);
    this.failure.set('The upload was cancelled; nothing was stored.');
  }

  upload(file: File): void {
    if (this.progress()) return;
    this.failure.set('');
    this.progress.set({ fileName: file.name, loaded: 0, total: file.size || null });
    this.running = this.api.upload(this.projectId(), this.stageKey(), file).subscribe({
      next: (event) => {
        if (event.type === HttpEventType.UploadProgress) {
          this.progress.set({ fileName: file.name, loaded: event.loaded, total: event.total ?? (file.size || null) });
        } else if (event.type === HttpEventType.Response && event.body) {
          this.progress.set(null);
          this.notice.show(`${event.body.fileName} stored as version ${event.body.version}.`, 4000);
          this.list.reload();
          this.uploaded.emit(event.body);
        }
      },
      error: (err: unknown) => {
        this.progress.set(null);
        this.failure.set(uploadFailure(err));
      },
    });
  }
}
