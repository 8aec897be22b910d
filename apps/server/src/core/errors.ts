import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { Logger } from './logger';

/** The error codes an API answer may carry; the client may switch on them. */
export type ErrorCode =
  | 'bad_request'
  | 'validation_failed'
  | 'malformed_json'
  | 'unauthenticated'
  | 'session_expired'
  | 'no_access'
  | 'csrf_failed'
  | 'forbidden'
  | 'not_found'
  | 'conflict'
  | 'payload_too_large'
  | 'unsupported_media_type'
  | 'too_many_requests'
  | 'service_unavailable'
  | 'internal';

export interface ErrorBody {
  error: { code: ErrorCode; message: string; fields?: Record<string, string[]>; requestId?: string };
}

export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly fields?: Record<string, string[]>,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}

export const notFound = (what = 'Not found'): HttpError => new HttpError(404, 'not_found', what);

/** Unknown API routes answer 404 in the same JSON shape as every other error. */
export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new HttpError(404, 'not_found', `No API route for ${req.method} ${req.originalUrl.split('?')[0]}`));
};

/** What the parsers in front of the handlers (body-parser, raw-body, router, send) mark as the client's. */
interface ClientStatusError extends Error {
  status?: number;
  statusCode?: number;
  type?: string;
  code?: string;
  expose?: boolean;
}

/**
 * busboy (under multer) throws plain Errors with no code or type, so these are recognised by their
 * exact text: the fixed list of busboy 1.x's parse failures, each said again in our own words.
 */
const MULTIPART_FAILURES: Record<string, string> = {
  'Multipart: Boundary not found':
    'The upload form could not be read: its Content-Type has no boundary (send multipart/form-data with a boundary).',
  'Malformed part header':
    'The upload form could not be read: a part header is malformed (for example a control character in the file name).',
  'Unexpected end of form': 'The upload form could not be read: the body ended before the form was complete.',
  'Unexpected end of file': 'The upload form could not be read: the body ended in the middle of the file.',
  'Malformed content type': 'The upload form could not be read: its Content-Type header is malformed.',
  'Missing Content-Type': 'The upload form could not be read: it has no Content-Type header.',
  'Malformed urlencoded form': 'The form could not be read: it is not valid URL-encoded data.',
};

/**
 * PostgreSQL's refusals of a value (SQLSTATE class 22, data exception) that only bad input causes.
 * Validation should catch these first; this is the safety net, so the text says what kind of value
 * was wrong without the database's own words (which quote types, columns and the value).
 */
const DATABASE_VALUE_REFUSALS: Record<string, string> = {
  '22021': 'A value in the request holds characters that could not be stored.',
  '22P05': 'A value in the request holds characters that could not be stored.',
  '22P02': 'A value in the request is not in the form its field expects, so it could not be stored.',
  '22001': 'A value in the request is longer than its field allows, so it could not be stored.',
  '22003': 'A number in the request is out of range, so it could not be stored.',
  '22007': 'A date or time in the request is not valid, so it could not be stored.',
  '22008': 'A date or time in the request is out of range, so it could not be stored.',
};

/** The one final handler: known errors keep their status; anything else is a 500 with no details. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (err: unknown, req, res, _next) => {
    const requestId = String(req.id ?? '');
    let httpError = err instanceof HttpError ? err : clientErrorOf(err);
    if (!httpError) {
      (req.log ?? logger).error({ err, requestId }, 'unhandled error');
      httpError = new HttpError(500, 'internal', 'Something went wrong on our side. The error has been logged.');
    }
    if (httpError.status < 500)
      (req.log ?? logger).info({ code: httpError.code, status: httpError.status }, httpError.message);
    if (isDatabaseError(err) && DATABASE_VALUE_REFUSALS[err.code])
      // A value got past validation: worth fixing in the contract, so it is logged with its code.
      (req.log ?? logger).warn(
        { sqlState: err.code, requestId },
        'the database refused a value that passed validation',
      );
    if (res.headersSent) {
      res.end();
      return;
    }
    const body: ErrorBody = {
      error: { code: httpError.code, message: httpError.message, requestId: requestId || undefined },
    };
    if (httpError.fields) body.error.fields = httpError.fields;
    res.status(httpError.status).json(body);
  };
}

/** The client's mistakes that reach the handler as someone else's error type; null for anything else. */
function clientErrorOf(err: unknown): HttpError | null {
  if (!(err instanceof Error)) return null;
  // Express's router marks a path it cannot percent-decode with status 400.
  if (err instanceof URIError)
    return new HttpError(400, 'bad_request', 'The request path is not valid percent-encoding (a "%" must start %XX).');
  if (isDatabaseError(err)) {
    const message = DATABASE_VALUE_REFUSALS[err.code];
    return message ? new HttpError(400, 'bad_request', message) : null;
  }
  if (Object.hasOwn(MULTIPART_FAILURES, err.message) && !('status' in err) && !('$metadata' in err))
    return new HttpError(400, 'bad_request', MULTIPART_FAILURES[err.message]);
  const e = err as ClientStatusError;
  const status = e.status ?? e.statusCode;
  // Only http-errors' client errors (expose: true): an outside service's 4xx, seen by one of our
  // own calls (an SDK error carrying the status it got), stays our problem.
  if (e.expose !== true || typeof status !== 'number' || status < 400 || status >= 500) return null;
  switch (e.type) {
    case 'entity.parse.failed':
      return new HttpError(400, 'malformed_json', 'The request body is not valid JSON.');
    case 'entity.too.large':
      return new HttpError(413, 'payload_too_large', 'The request body is too large.');
    case 'encoding.unsupported':
      return new HttpError(
        415,
        'unsupported_media_type',
        'The request body uses a Content-Encoding the API does not take (use gzip, deflate, br or none).',
      );
    case 'charset.unsupported':
      return new HttpError(
        415,
        'unsupported_media_type',
        'The request body uses a charset the API does not take (use UTF-8).',
      );
    case 'request.size.invalid':
      return new HttpError(400, 'bad_request', 'The request body is not as long as its Content-Length says.');
    case 'request.aborted':
      return new HttpError(400, 'bad_request', 'The request body was cut off before it ended.');
  }
  // zlib's failures, which body-parser passes on with status 400 and zlib's own code.
  if (typeof e.code === 'string' && e.code.startsWith('Z_'))
    return new HttpError(
      400,
      'bad_request',
      'The request body could not be decompressed: it is not what its Content-Encoding header says (gzip, deflate or br).',
    );
  return new HttpError(status, 'bad_request', 'The request could not be read.');
}

interface DatabaseError extends Error {
  code: string;
  severity: string;
}

/** node-postgres's DatabaseError (knex passes it on as it is): a SQLSTATE code and a severity. */
function isDatabaseError(err: unknown): err is DatabaseError {
  return (
    err instanceof Error &&
    typeof (err as Partial<DatabaseError>).code === 'string' &&
    typeof (err as Partial<DatabaseError>).severity === 'string'
  );
}
