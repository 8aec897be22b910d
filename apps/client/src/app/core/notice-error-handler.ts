import { ErrorHandler, Injectable, Injector, inject } from '@angular/core';

/**
 * Last stop for errors nobody handled: log them for the developer and tell the user in plain
 * words, instead of leaving a screen that silently stopped working.
 */
@Injectable()
export class NoticeErrorHandler implements ErrorHandler {
  private readonly injector = inject(Injector);
  private noticeOpen = false;

  handleError(error: unknown): void {
    console.error(error);
    // One notice at a time: a failing loop must not stack hundreds of them.
    if (this.noticeOpen) return;
    this.noticeOpen = true;
    // The snack bar (and its overlay code) loads only when an error happens, keeping it out of
    // the first download.
    import('@angular/material/snack-bar')
      .then(({ MatSnackBar }) => {
        const ref = this.injector
          .get(MatSnackBar)
          .open('Something went wrong on this page. If it keeps happening, reload it.', 'Dismiss', {
            duration: 10000,
          });
        ref.afterDismissed().subscribe(() => (this.noticeOpen = false));
      })
      .catch(() => (this.noticeOpen = false));
  }
}
