import { S3ServiceException } from '@aws-sdk/client-s3';
import type { ErrorRequestHandler } from 'express';
import { HttpError } from '../core/errors';

/** Object storage could not be reached or failed on its side: the request may work later. */
export class StorageUnavailable extends Error {
  constructor(cause: unknown) {
    super(`object storage is unavailable: ${(cause as Error)?.message ?? String(cause)}`, { cause });
    this.name = 'StorageUnavailable';
  }
}

/** Seconds a client is asked to wait before trying again while storage is down. */
export const STORAGE_RETRY_AFTER_SECONDS = 30;

// Network failures seen from the SDK's Node handler when the store is down or unreachable.
const NETWORK_CODES = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EPIPE',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'EAI_AGAIN',
  'ENOTFOUND',
]);
const NETWORK_IN_TEXT = new RegExp(`\\b(${[...NETWORK_CODES].join('|')})\\b`);
const TIMEOUT_NAMES = new Set(['TimeoutError', 'RequestTimeout', 'RequestTimeoutException']);

/** Refused connections, timeouts and 5xx answers become StorageUnavailable; anything else is unchanged. */
export function asStorageError(err: unknown): unknown {
  if (err instanceof StorageUnavailable) return err;
  return isUnavailable(err) ? new StorageUnavailable(err) : err;
}

function isUnavailable(err: unknown, depth = 0): boolean {
  if (!err || typeof err !== 'object' || depth > 3) return false;
  if (err instanceof S3ServiceException) {
    const status = err.$metadata?.httpStatusCode;
    return status !== undefined && status >= 500;
  }
  const e = err as { code?: unknown; name?: unknown; errors?: unknown; cause?: unknown; $metadata?: unknown };
  if (typeof e.code === 'string' && NETWORK_CODES.has(e.code)) return true;
  if (typeof e.name === 'string' && TIMEOUT_NAMES.has(e.name)) return true;
  // The SDK's retry layer may wrap a network error it does not recognise as an Error (one from
  // another realm, as under a test runner) into a new Error that keeps only the text.
  const message = (err as { message?: unknown }).message;
  if (typeof message === 'string' && NETWORK_IN_TEXT.test(message)) return true;
  // Node's connection attempts to several addresses fail as one AggregateError.
  if (Array.isArray(e.errors) && e.errors.some((x) => isUnavailable(x, depth + 1))) return true;
  return isUnavailable(e.cause, depth + 1);
}

/**
 * At the edge, before the one final handler: storage down is a 503 with Retry-After and a plain
 * message, never a 500.
 */
export const storageUnavailableHandler: ErrorRequestHandler = (err, req, res, next) => {
  if (!(err instanceof StorageUnavailable)) return next(err);
  req.log?.warn({ err: err.message }, 'object storage unavailable');
  if (!res.headersSent) res.setHeader('Retry-After', String(STORAGE_RETRY_AFTER_SECONDS));
  next(
    new HttpError(
      503,
      'service_unavailable',
      'File storage is unavailable at the moment; please try again in a minute.',
    ),
  );
};
