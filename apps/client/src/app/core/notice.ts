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
      this.injector.get(MatSnackBar).open(message, 'Dismiss', { duration }),
    );
  }
}
