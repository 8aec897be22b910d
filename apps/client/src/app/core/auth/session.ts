import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import type { LogoutResponse, Me, Role } from '@trabeate/contracts';
import { firstValueFrom } from 'rxjs';
import { anonymousOk } from './auth-context';
import { errorMessage } from './api-error';
import { PageLocation } from './page-location';

export type MeGranted = Extract<Me, { access: 'granted' }>;
export type MeNoAccess = Extract<Me, { access: 'none' }>;

export type SessionState =
  | { readonly status: 'loading' }
  | { readonly status: 'anonymous' }
  | { readonly status: 'granted'; readonly me: MeGranted }
  | { readonly status: 'none'; readonly me: MeNoAccess }
  /** The server did not answer in our shape: say so rather than pretend the user is signed out. */
  | { readonly status: 'unreachable'; readonly message: string };

export const ROLE_LABELS: Readonly<Record<Role, string>> = {
  principal: 'Principal',
  engineer: 'Engineer',
  client: 'Client contact',
};

/** Only paths inside this app may be a return address; anything else would be an open redirect. */
export function safeReturnTo(url: string | null | undefined): string {
  if (!url || !url.startsWith('/') || url.startsWith('//') || url.startsWith('/\\')) return '/';
  // Returning to the sign-in page itself would loop.
  if (url.startsWith('/sign-in')) return '/';
  return url;
}

/**
 * Who is signed in, read once from `/api/me` at start. The server decides every permission; this
 * only shapes what the screens offer.
 */
@Injectable({ providedIn: 'root' })
export class Session {
  private readonly http = inject(HttpClient);
  private readonly location = inject(PageLocation);
  private loading?: Promise<void>;

  private readonly stateSignal = signal<SessionState>({ status: 'loading' });
  readonly state = this.stateSignal.asReadonly();
  readonly user = computed(() => {
    const s = this.state();
    return s.status === 'granted' ? s.me.user : null;
  });
  readonly firm = computed(() => {
    const s = this.state();
    return s.status === 'granted' ? s.me.firm : null;
  });
  readonly role = computed<Role | null>(() => this.user()?.role ?? null);
  readonly roleLabel = computed(() => {
    const role = this.role();
    return role ? ROLE_LABELS[role] : '';
  });
  readonly isPrincipal = computed(() => this.role() === 'principal');
  readonly signingOut = signal(false);

  /** Reads `/api/me` once; later calls wait for the same answer. */
  load(): Promise<void> {
    this.loading ??= this.fetchMe();
    return this.loading;
  }

  /** Reads `/api/me` again (after an access change, or to retry when the server was away). */
  reload(): Promise<void> {
    this.loading = this.fetchMe();
    return this.loading;
  }

  /** The server said the session is gone (401 on some request). */
  markSignedOut(): void {
    this.stateSignal.set({ status: 'anonymous' });
    this.loading = Promise.resolve();
  }

  /** Full-page trip to the provider; the server brings the browser back to `returnTo`. */
  signIn(returnTo: string): void {
    this.location.assign(`/api/auth/login?returnTo=${encodeURIComponent(safeReturnTo(returnTo))}`);
  }

  /** Ends our session, then the provider's (when it has a sign-out address). */
  async signOut(): Promise<void> {
    if (this.signingOut()) return;
    this.signingOut.set(true);
    let target = '/';
    try {
      const res = await firstValueFrom(
        this.http.post<LogoutResponse>('/api/auth/logout', {}, { context: anonymousOk() }),
      );
      target = res?.endSessionUrl ?? '/';
    } catch {
      // Already signed out on the server, or it is away: either way leave the signed-in screens.
    }
    this.stateSignal.set({ status: 'anonymous' });
    this.location.assign(target);
  }

  private async fetchMe(): Promise<void> {
    try {
      const me = await firstValueFrom(this.http.get<Me>('/api/me', { context: anonymousOk() }));
      this.stateSignal.set(me.access === 'granted' ? { status: 'granted', me } : { status: 'none', me });
    } catch (err) {
      if (err instanceof HttpErrorResponse && err.status === 401) this.stateSignal.set({ status: 'anonymous' });
      else this.stateSignal.set({ status: 'unreachable', message: errorMessage(err) });
    }
  }
}
