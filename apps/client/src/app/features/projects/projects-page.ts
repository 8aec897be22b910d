import { ChangeDetectionStrategy, Component } from '@angular/core';
import { EmptyState } from '../../shared/empty-state/empty-state';

@Component({
  selector: 'tb-projects-page',
  imports: [EmptyState],
  template: `
    <h1 class="page-title">Projects</h1>
    <tb-empty-state
      icon="apartment"
      heading="Projects are being built next"
      lead="This will be where each building job lives, from the architect's plans to the approved foundations."
      [coming]="coming"
    />
  `,
  styles: `
    .page-title {
      font: var(--mat-sys-headline-medium);
      margin: 0 0 1rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProjectsPage {
  protected readonly coming = [
    'A project for each building, with its client, site, description and design basis.',
    'Stages in order: Design basis, Column layout, Beam framing, Slab panels, Stairs, Foundations.',
    'For each stage: the engineer in charge, a due date, deliverables, comments and review by the principal.',
    'Structural schemes laid out, checked and compared side by side.',
    'Clients see their own projects only.',
  ] as const;
}
