import { Injectable, Injector, inject } from '@angular/core';

/**
 * Short messages at the foot of the screen. The snack bar (and its overlay code) loads on first
 * use, keeping it out of the first download.
 */
@Injectable({ providedIn: 'root' })
export class Notice {
  private readonly injector = inject(Injector);

  show(message: string, duration = 8000): void {
    void import('@angular/material/snack-bar').then(({ MatSnackBar }) =>
      // Top right, under the bar: errors and buttons sit low on a page, and a toast at the foot
      // used to cover the very error it reported.
      this.injector.get(MatSnackBar).open(message, 'Dismiss', {
        duration,
        verticalPosition: 'top',
        horizontalPosition: 'end',
      }),
    );
  }
}
