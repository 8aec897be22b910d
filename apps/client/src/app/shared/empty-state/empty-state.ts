import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';

/** A designed "nothing here yet" panel, so that no page is ever just blank. */
@Component({
  selector: 'tb-empty-state',
  imports: [MatIcon],
  template: `
    <section class="empty" [attr.aria-labelledby]="headingId">
      <mat-icon class="mark" aria-hidden="true">{{ icon() }}</mat-icon>
      <h2 [id]="headingId">{{ heading() }}</h2>
      <p class="lead">{{ lead() }}</p>
      @if (coming().length) {
        <h3>What is coming</h3>
        <ul>
          @for (item of coming(); track item) {
            <li>{{ item }}</li>
          }
        </ul>
      }
      <ng-content />
    </section>
  `,
  styles: `
    .empty {
      max-width: 40rem;
      margin: 3rem auto;
      padding: 2rem;
      border: 1px dashed var(--mat-sys-outline);
      border-radius: 12px;
      background: var(--mat-sys-surface-container-low);
    }
    .mark {
      font-size: 48px;
      width: 48px;
      height: 48px;
      color: var(--mat-sys-primary);
    }
    h2 {
      font: var(--mat-sys-headline-small);
      margin: 0.75rem 0 0.5rem;
    }
    .lead {
      font: var(--mat-sys-body-large);
      color: var(--mat-sys-on-surface-variant);
      margin: 0 0 1rem;
    }
    h3 {
      font: var(--mat-sys-title-small);
      margin: 1.25rem 0 0.25rem;
    }
    ul {
      margin: 0;
      padding-left: 1.25rem;
      line-height: 1.6;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class EmptyState {
  private static nextId = 0;
  readonly icon = input.required<string>();
  readonly heading = input.required<string>();
  readonly lead = input.required<string>();
  readonly coming = input<readonly string[]>([]);
  protected readonly headingId = `tb-empty-state-${EmptyState.nextId++}`;
}
