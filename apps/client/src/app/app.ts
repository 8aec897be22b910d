import { ChangeDetectionStrategy, Component } from '@angular/core';
import { Shell } from './core/shell/shell';

@Component({
  selector: 'tb-root',
  imports: [Shell],
  template: '<tb-shell />',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class App {}
