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

interface BodyParserError extends Error {
  type?: string;
  status?: number;
}

/** The one final handler: known errors keep their status; anything else is a 500 with no details. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (err: unknown, req, res, _next) => {
    const requestId = String(req.id ?? '');
    let httpError: HttpError;
    if (err instanceof HttpError) {
      httpError = err;
    } else if (isBodyParserError(err) && err.type === 'entity.parse.failed') {
      httpError = new HttpError(400, 'malformed_json', 'The request body is not valid JSON.');
    } else if (isBodyParserError(err) && err.type === 'entity.too.large') {
      httpError = new HttpError(413, 'payload_too_large', 'The request body is too large.');
    } else if (isBodyParserError(err) && err.status && err.status >= 400 && err.status < 500) {
      httpError = new HttpError(err.status, 'bad_request', 'The request could not be read.');
    } else {
      (req.log ?? logger).error({ err, requestId }, 'unhandled error');
      httpError = new HttpError(500, 'internal', 'Something went wrong on our side. The error has been logged.');
    }
    if (httpError.status < 500)
      (req.log ?? logger).info({ code: httpError.code, status: httpError.status }, httpError.message);
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

function isBodyParserError(err: unknown): err is BodyParserError {
  return err instanceof Error && 'type' in err;
}
