import { HttpContext, HttpContextToken } from '@angular/common/http';

/**
 * Marks a request whose 401 is an expected answer (who am I, a public invitation), so the
 * interceptor does not send the user off to sign in because of it.
 */
export const ANONYMOUS_OK = new HttpContextToken<boolean>(() => false);

export const anonymousOk = (): HttpContext => new HttpContext().set(ANONYMOUS_OK, true);
