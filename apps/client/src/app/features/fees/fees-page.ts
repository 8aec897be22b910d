import { ChangeDetectionStrategy, Component } from '@angular/core';
import { EmptyState } from '../../shared/empty-state/empty-state';

@Component({
  selector: 'tb-fees-page',
  imports: [EmptyState],
  template: `
    <h1 class="page-title">Fees</h1>
    <tb-empty-state
      icon="receipt_long"
      heading="Fees and invoices are coming soon"
      lead="Billing will follow the design work itself, so invoices no longer trail behind approved stages."
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
export class FeesPage {
  protected readonly coming = [
    'A fee agreement per project: a lump sum or a share of the estimated construction cost.',
    'The fee split over the stages, adding up to 100 %.',
    'A draft invoice offered as soon as a stage is approved.',
    'Invoices with tax, due dates and PDFs; clients pay online.',
    'Money owed, sorted by how long it has been waiting.',
  ] as const;
}
