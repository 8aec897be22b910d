import { DOCUMENT, Injectable, inject } from '@angular/core';

/**
 * Full-page navigation (to the sign-in redirect, the provider's sign-out). Kept behind a service
 * so tests can see where the app would go without leaving the test page.
 */
@Injectable({ providedIn: 'root' })
export class PageLocation {
  private readonly document = inject(DOCUMENT);

  assign(url: string): void {
    this.document.location.assign(url);
  }
}
