import type { Express, Request, RequestHandler, Response } from 'express';
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
 * The headers a JSON reply carries: those the OWASP REST Security Cheat Sheet ("Security
 * Headers") lists for every API response (Content-Type and Cache-Control are the routes' own),
 * with Cross-Origin-Resource-Policy so no other origin can load a reply into its page. A JSON
 * reply loads, runs and frames nothing, so its policy allows nothing; helmet's other headers steer
 * how a browser treats a page (prefetching, opener, referrer, legacy filters) and say nothing to
 * a JSON body.
 */
export const JSON_REPLY_HEADERS: ReadonlyArray<readonly [string, string]> = [
  ['Content-Security-Policy', "default-src 'none'; frame-ancestors 'none'"],
  ['Cross-Origin-Resource-Policy', 'same-origin'],
  ['Strict-Transport-Security', 'max-age=31536000; includeSubDomains'],
  ['X-Content-Type-Options', 'nosniff'],
  ['X-Frame-Options', 'DENY'],
];

const isJson = (contentType: unknown): boolean =>
  typeof contentType === 'string' && contentType.startsWith('application/json');

/** Helmet's headers for our settings, worked out by helmet once: they have no per-request parts. */
function helmetHeaders(options: HelmetOptions): {
  set: Array<[string, string | number | readonly string[]]>;
  removed: string[];
} {
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
  return { set, removed };
}

/**
 * Security headers for every response of `app`. A JSON reply (most of the traffic: every API
 * read) carries JSON_REPLY_HEADERS; anything else — the client's pages and bundles, and every
 * file the API sends (PDFs, drawings, deliverables, ZIPs, exports, SVG sheets) — carries exactly
 * helmet's headers with our settings, as helmet itself would set them.
 *
 * The reply's kind is known only when its headers go out, so the JSON set is put on at the start
 * and `app`'s response prototype (Express's documented `app.response`) completes the set for
 * anything that is not JSON at writeHead, which Node calls for every response, explicit or implied.
 */
export function securityHeaders(app: Express, options: HelmetOptions = HELMET_OPTIONS): RequestHandler {
  const full = helmetHeaders(options);
  const proto = app.response as Response & { writeHead: Response['writeHead'] };
  const writeHead = proto.writeHead;
  proto.writeHead = function (this: Response, ...args: unknown[]) {
    // A content type given to writeHead itself goes out with it; every path here sets it first.
    if (!isJson(this.getHeader('Content-Type'))) {
      for (const [name, value] of full.set) this.setHeader(name, value);
      for (const name of full.removed) this.removeHeader(name);
    }
    return (writeHead as (...a: unknown[]) => Response).apply(this, args);
  } as Response['writeHead'];
  return (_req, res, next) => {
    for (const [name, value] of JSON_REPLY_HEADERS) res.setHeader(name, value);
    next();
  };
}
