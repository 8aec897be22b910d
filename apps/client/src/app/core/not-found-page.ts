import { ChangeDetectionStrategy, Component } from '@angular/core';
import { EmptyState } from '../shared/empty-state/empty-state';

@Component({
  selector: 'tb-not-found-page',
  imports: [EmptyState],
  template: `
    <tb-empty-state
      icon="wrong_location"
      heading="There is no page at this address"
      lead="The link may be mistyped or out of date. Use the navigation to find what you were after."
    />
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NotFoundPage {}
