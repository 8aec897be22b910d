import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import {
  MatCell,
  MatCellDef,
  MatColumnDef,
  MatHeaderCell,
  MatHeaderCellDef,
  MatHeaderRow,
  MatHeaderRowDef,
  MatRow,
  MatRowDef,
  MatTable,
} from '@angular/material/table';
import { RouterLink } from '@angular/router';
import type { ProjectSummary } from '@trabeate/contracts';
import { errorMessage } from '../../core/auth/api-error';
import { EmptyState } from '../../shared/empty-state/empty-state';

/** The projects the signed-in person may see; the server filters them by role and membership. */
@Component({
  selector: 'tb-projects-page',
  imports: [
    EmptyState,
    MatButton,
    MatIcon,
    MatProgressSpinner,
    MatTable,
    MatColumnDef,
    MatHeaderCell,
    MatHeaderCellDef,
    MatCell,
    MatCellDef,
    MatHeaderRow,
    MatHeaderRowDef,
    MatRow,
    MatRowDef,
    RouterLink,
  ],
  template: `
    <h1 class="page-title">Projects</h1>
    <p class="page-lead">The buildings you work on or commissioned, newest reference first.</p>
    @if (projects.isLoading() && !projects.hasValue()) {
      <div class="state" role="status"><mat-progress-spinner mode="indeterminate" diameter="28" /> Loading projects…</div>
    } @else if (projects.error(); as err) {
      <div class="state error" role="alert" data-testid="projects-error">
        <mat-icon aria-hidden="true">error</mat-icon>
        <span>Projects could not be loaded. {{ message(err) }}</span>
        <button mat-stroked-button type="button" (click)="projects.reload()">Try again</button>
      </div>
    } @else if (rows().length === 0) {
      <tb-empty-state
        icon="apartment"
        heading="No projects to show yet"
        lead="When the firm adds you to a project, it appears here."
      />
    } @else {
      <div class="table-wrap">
        <table mat-table [dataSource]="rows()" aria-label="Projects" data-testid="projects-table">
          <ng-container matColumnDef="reference">
            <th mat-header-cell *matHeaderCellDef>Reference</th>
            <td mat-cell *matCellDef="let p" class="mono">{{ p.reference }}</td>
          </ng-container>
          <ng-container matColumnDef="name">
            <th mat-header-cell *matHeaderCellDef>Project</th>
            <td mat-cell *matCellDef="let p"><a [routerLink]="['/projects', p.id]">{{ p.name }}</a></td>
          </ng-container>
          <ng-container matColumnDef="client">
            <th mat-header-cell *matHeaderCellDef>Client</th>
            <td mat-cell *matCellDef="let p">{{ p.clientOrganisation.name }}</td>
          </ng-container>
          <ng-container matColumnDef="site">
            <th mat-header-cell *matHeaderCellDef>Site</th>
            <td mat-cell *matCellDef="let p">{{ p.siteAddress }}</td>
          </ng-container>
          <ng-container matColumnDef="storeys">
            <th mat-header-cell *matHeaderCellDef>Storeys</th>
            <td mat-cell *matCellDef="let p">{{ p.storeys }}</td>
          </ng-container>
          <tr mat-header-row *matHeaderRowDef="columns"></tr>
          <tr mat-row *matRowDef="let row; columns: columns"></tr>
        </table>
      </div>
    }
  `,
  styleUrl: '../../shared/page/page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectsPage {
  protected readonly columns = ['reference', 'name', 'client', 'site', 'storeys'];
  protected readonly projects = httpResource<ProjectSummary[]>(() => '/api/projects');
  protected readonly rows = computed(() =>
    [...(this.projects.hasValue() ? this.projects.value() : [])].sort((a, b) => b.reference.localeCompare(a.reference)),
  );
  protected readonly message = (err: unknown) => errorMessage(err);
}
