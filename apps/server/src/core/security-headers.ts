import type { Request, RequestHandler, Response } from 'express';
import helmet, { type HelmetOptions } from 'helmet';

export const HELMET_OPTIONS: HelmetOptions = {
  contentSecurityPolicy: {
    directives: {
      defaultSrc: ["'self'"],
      // Angular Material sets inline styles; scripts and fonts come only from our own origin.
      styleSrc: ["'self'", "'unsafe-inline'"],
      fontSrc: ["'self'"],
      imgSrc: ["'self'", 'data:'],
      connectSrc: ["'self'"],
      formAction: ["'self'"],
    },
  },
};

/**
 * Helmet's security headers, worked out by helmet once at start-up and then set on every
 * response. Our settings have no per-request parts (no nonces), so every response gets the same
 * headers helmet would give it, without running its thirteen middlewares each time.
 */
export function securityHeaders(options: HelmetOptions = HELMET_OPTIONS): RequestHandler {
  const set: Array<[string, string | number | readonly string[]]> = [];
  const removed: string[] = [];
  const recorder = {
    setHeader: (name: string, value: string | number | readonly string[]) => void set.push([name, value]),
    removeHeader: (name: string) => void removed.push(name),
  };
  let error: unknown;
  helmet(options)({ method: 'GET', headers: {} } as Request, recorder as unknown as Response, (err?: unknown) => {
    error = err;
  });
  if (error) throw error;
  return (_req, res, next) => {
    for (const [name, value] of set) res.setHeader(name, value);
    for (const name of removed) res.removeHeader(name);
    next();
  };
}
