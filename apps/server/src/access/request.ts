import type { Caller } from './policy';
import type { CallerRow } from '../auth/caller.repository';
import type { RequestSession } from '../auth/session';
import type { Logger } from '../core/logger';

/** The signed-in identity kept in the session (set at the sign-in callback). */
export interface SessionAuth {
  /** Trabeate's user id, or null for someone the provider knows but Trabeate has not invited. */
  userId: string | null;
  issuer: string;
  subject: string;
  email: string | null;
  name: string | null;
  signedInAt: number;
  idToken: string;
}

/** A sign-in in progress: the checks the callback must see again. */
export interface PendingSignIn {
  state: string;
  nonce: string;
  codeVerifier: string;
  returnTo: string;
  startedAt: number;
}

export interface VisibleProject {
  id: string;
  firm_id: string;
  client_organisation_id: string;
}

declare module 'express-serve-static-core' {
  interface Request {
    /** The request's id (X-Request-Id); see core/request-log.ts. */
    id: string;
    /** A logger whose lines carry the request's id, method and path. */
    log: Logger;
    /** This request's session (a new, empty one when no live session came with it); see auth/session.ts. */
    session: RequestSession;
    /** The person with access making this request (set by the session middleware). */
    caller?: Caller;
    /** The project named by :projectId, loaded by the access guard once visibility is checked. */
    project?: VisibleProject;
    /** The person the session names, read with the session (null: none active); see session.ts. */
    preloadedCaller?: CallerRow | null;
    /** Why a session cookie came with no live session (for the 401 message). */
    sessionProblem?: 'expired';
  }
}

export {};
