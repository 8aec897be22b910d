import { ChangeDetectionStrategy, Component } from '@angular/core';
import { EmptyState } from '../../shared/empty-state/empty-state';

@Component({
  selector: 'tb-drawings-page',
  imports: [EmptyState],
  template: `
    <h1 class="page-title">Drawings</h1>
    <tb-empty-state
      icon="architecture"
      heading="The drawing register is on its way"
      lead="Soon every sheet the office produces will be listed here, with the revision the site actually holds."
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
export class DrawingsPage {
  protected readonly coming = [
    'Each drawing with its number, title, stage, sheet size and scale.',
    'Revisions with a purpose of issue, who drew, checked and approved them, and their PDF.',
    'Issued revisions locked for good; a new revision supersedes the old one.',
    'Transmittals recording which revisions went to whom, when and why, with download records.',
  ] as const;
}
