import { inject } from '@angular/core';
import { CanActivateFn, RedirectCommand, Router } from '@angular/router';
import type { Role } from '@trabeate/contracts';
import { Session, safeReturnTo } from './session';

// Guards shape navigation only; the server checks the same rules on every request.

/** Signed in with access; otherwise the sign-in page (coming back here) or the no-access page. */
export const signedInGuard: CanActivateFn = async (_route, state) => {
  const session = inject(Session);
  const router = inject(Router);
  await session.load();
  const s = session.state();
  if (s.status === 'granted') return true;
  if (s.status === 'none') return router.createUrlTree(['/no-access']);
  return router.createUrlTree(['/sign-in'], { queryParams: { returnTo: safeReturnTo(state.url) } });
};

/** Only for these roles; others see a page that says so (run after signedInGuard). */
export function roleGuard(...roles: Role[]): CanActivateFn {
  return async (_route, state) => {
    const session = inject(Session);
    const router = inject(Router);
    await session.load();
    const role = session.role();
    if (role && roles.includes(role)) return true;
    if (!role) return router.createUrlTree(['/sign-in'], { queryParams: { returnTo: safeReturnTo(state.url) } });
    // Keep the address the user typed, show why it did not open.
    return new RedirectCommand(router.parseUrl('/not-permitted'), { skipLocationChange: true });
  };
}

/** The sign-in page is for the signed-out; someone signed in goes on to where they were heading. */
export const signedOutGuard: CanActivateFn = async (route) => {
  const session = inject(Session);
  const router = inject(Router);
  await session.load();
  const s = session.state();
  if (s.status === 'granted') {
    const returnTo = safeReturnTo(route.queryParamMap.get('returnTo'));
    return router.parseUrl(returnTo === '/' ? '/projects' : returnTo);
  }
  if (s.status === 'none') return router.createUrlTree(['/no-access']);
  return true;
};

/** The "no access yet" page is only for someone signed in without an invitation. */
export const noAccessGuard: CanActivateFn = async () => {
  const session = inject(Session);
  const router = inject(Router);
  await session.load();
  const s = session.state();
  if (s.status === 'none') return true;
  if (s.status === 'granted') return router.createUrlTree(['/projects']);
  return router.createUrlTree(['/sign-in']);
};
