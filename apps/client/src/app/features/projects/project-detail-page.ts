import { DecimalPipe } from '@angular/common';
import { HttpClient, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { MatOption, MatSelect } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import type { Person, ProjectDetail } from '@trabeate/contracts';
import { firstValueFrom } from 'rxjs';
import { errorMessage } from '../../core/auth/api-error';
import { ROLE_LABELS } from '../../core/auth/session';
import { Notice } from '../../core/notice';

/** One project: what it is, who is on it, and (for those who may see money) its estimated cost. */
@Component({
  selector: 'tb-project-detail-page',
  imports: [
    DecimalPipe,
    FormsModule,
    MatButton,
    MatIconButton,
    MatFormField,
    MatLabel,
    MatIcon,
    MatProgressSpinner,
    MatSelect,
    MatOption,
    RouterLink,
  ],
  template: `
    <p><a routerLink="/projects">← All projects</a></p>
    @if (project.isLoading() && !project.hasValue()) {
      <div class="state" role="status"><mat-progress-spinner mode="indeterminate" diameter="28" /> Loading the project…</div>
    } @else if (project.error(); as err) {
      <div class="state error" role="alert" data-testid="project-error">
        <mat-icon aria-hidden="true">error</mat-icon>
        <span>{{ loadError(err) }}</span>
      </div>
    } @else if (detail(); as p) {
      <div class="page-head">
        <div>
          <h1 class="page-title">{{ p.name }}</h1>
          <p class="page-lead"><span class="mono">{{ p.reference }}</span> · {{ p.clientOrganisation.name }}</p>
        </div>
      </div>
      <section class="card" aria-labelledby="summary-heading">
        <h2 id="summary-heading">Building</h2>
        <dl>
          <dt>Site</dt>
          <dd>{{ p.siteAddress }}</dd>
          <dt>Use</dt>
          <dd>{{ p.buildingUse }}</dd>
          <dt>Storeys</dt>
          <dd>{{ p.storeys }} at {{ p.storeyHeightM | number: '1.2-2' }} m</dd>
          <dt>Floor area</dt>
          <dd>{{ p.floorAreaM2 === null ? 'not recorded' : (p.floorAreaM2 | number: '1.0-0') + ' m²' }}</dd>
        </dl>
      </section>
      @if (p.finance; as f) {
        <section class="card" aria-labelledby="finance-heading" data-testid="project-finance">
          <h2 id="finance-heading">Finance</h2>
          <dl>
            <dt>Estimated construction cost</dt>
            <dd>{{ f.estimatedCost === null ? 'not estimated yet' : (f.estimatedCost | number: '1.0-0') + ' ' + f.currency }}</dd>
          </dl>
        </section>
      }
      <section class="card" aria-labelledby="members-heading" data-testid="project-members">
        <h2 id="members-heading">People on this project</h2>
        @if (p.members.length === 0) {
          <p>Nobody has been added yet.</p>
        } @else {
          <ul class="members">
            @for (m of p.members; track m.id) {
              <li>
                <span>{{ m.displayName }}</span>
                <span class="role">{{ roleLabel(m.role) }}</span>
                @if (p.abilities.manage) {
                  <button
                    mat-icon-button
                    type="button"
                    [attr.aria-label]="'Take ' + m.displayName + ' off this project'"
                    [disabled]="busy()"
                    (click)="removeMember(m.id)"
                  >
                    <mat-icon>person_remove</mat-icon>
                  </button>
                }
              </li>
            }
          </ul>
        }
        @if (p.abilities.manage) {
          <form class="add" data-testid="manage-members" (submit)="$event.preventDefault(); addMember()">
            <mat-form-field subscriptSizing="dynamic">
              <mat-label>Add a person</mat-label>
              <mat-select [(ngModel)]="toAdd" name="toAdd">
                @for (person of candidates(); track person.id) {
                  <mat-option [value]="person.id">{{ person.displayName }} ({{ roleLabel(person.role) }})</mat-option>
                }
              </mat-select>
            </mat-form-field>
            <button mat-stroked-button type="submit" [disabled]="!toAdd() || busy()">Add</button>
          </form>
        }
      </section>
    }
  `,
  styleUrl: '../../shared/page/page.scss',
  styles: `
    .card {
      padding: 1rem 1.25rem;
      margin-bottom: 1rem;
      border: 1px solid var(--mat-sys-outline-variant);
      background: var(--mat-sys-surface-container-lowest);
    }
    h2 {
      font: var(--mat-sys-title-medium);
      margin: 0 0 0.75rem;
    }
    dl {
      display: grid;
      grid-template-columns: max-content 1fr;
      gap: 0.35rem 1.25rem;
      margin: 0;
    }
    dt {
      color: var(--mat-sys-on-surface-variant);
    }
    dd {
      margin: 0;
    }
    .members {
      list-style: none;
      padding: 0;
      margin: 0 0 0.75rem;
      li {
        display: flex;
        align-items: center;
        gap: 0.75rem;
        min-height: 40px;
        border-bottom: 1px solid var(--mat-sys-outline-variant);
      }
    }
    .role {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
      flex: 1;
    }
    .add {
      display: flex;
      gap: 0.75rem;
      align-items: center;
      flex-wrap: wrap;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectDetailPage {
  private readonly http = inject(HttpClient);
  private readonly notice = inject(Notice);
  /** Route-bound `:projectId`. */
  readonly projectId = input.required<string>();

  protected readonly project = httpResource<ProjectDetail>(() => `/api/projects/${encodeURIComponent(this.projectId())}`);
  protected readonly detail = computed(() => (this.project.hasValue() ? this.project.value() : undefined));
  /** The firm's people list is asked for only by someone who may manage the project. */
  private readonly people = httpResource<Person[]>(() => (this.detail()?.abilities.manage ? '/api/people' : undefined));
  protected readonly candidates = computed(() => {
    const p = this.detail();
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
  protected readonly toAdd = signal<string | null>(null);
  protected readonly busy = signal(false);

  protected roleLabel(role: keyof typeof ROLE_LABELS): string {
    return ROLE_LABELS[role];
  }

  protected loadError(err: unknown): string {
    return errorMessage(err, 'The project could not be loaded. Check the connection and try again.');
  }

  protected addMember(): Promise<void> {
    const userId = this.toAdd();
    return userId ? this.change('put', userId, 'Added to the project.') : Promise.resolve();
  }

  protected removeMember(userId: string): Promise<void> {
    return this.change('delete', userId, 'Taken off the project.');
  }

  private async change(method: 'put' | 'delete', userId: string, done: string): Promise<void> {
    if (this.busy()) return;
    this.busy.set(true);
    const url = `/api/projects/${encodeURIComponent(this.projectId())}/members/${encodeURIComponent(userId)}`;
    try {
      await firstValueFrom(method === 'put' ? this.http.put(url, {}) : this.http.delete(url));
      this.toAdd.set(null);
      this.notice.show(done, 4000);
      this.project.reload();
    } catch (err) {
      // 401 and 403 are already announced by the interceptor.
      const status = (err as { status?: number }).status;
      if (status !== 401 && status !== 403) this.notice.show(errorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
