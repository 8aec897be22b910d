import { HttpErrorResponse, HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { Router } from '@angular/router';
import { catchError, throwError } from 'rxjs';
import { Notice } from '../notice';
import { ANONYMOUS_OK } from './auth-context';
import { apiError } from './api-error';
import { Session, safeReturnTo } from './session';

/**
 * One place for the answers that concern the session. 401: the session is gone, so go to the
 * sign-in page and come back to the same address afterwards. 403: say why, in the server's words.
 * The error still reaches the caller, which shows its own error state; hiding controls is a
 * courtesy, the server enforces every rule.
 */
export const authInterceptor: HttpInterceptorFn = (req, next) => {
  const session = inject(Session);
  const router = inject(Router);
  const notice = inject(Notice);
  return next(req).pipe(
    catchError((err: unknown) => {
      if (err instanceof HttpErrorResponse && !req.context.get(ANONYMOUS_OK)) {
        if (err.status === 401) {
          session.markSignedOut();
          // During a navigation the address the user asked for is the one to come back to.
          const pending = router.currentNavigation()?.finalUrl;
          const returnTo = safeReturnTo(pending ? router.serializeUrl(pending) : router.url);
          const expired = apiError(err)?.code === 'session_expired';
          void router.navigate(['/sign-in'], { queryParams: { returnTo, ...(expired ? { reason: 'expired' } : {}) } });
        } else if (err.status === 403) {
          notice.show(
            apiError(err)?.message ?? 'Your role does not allow this. Ask the firm’s principal if you need it.',
          );
        }
      }
      return throwError(() => err);
    }),
  );
};
