import { randomUUID } from 'node:crypto';
import type { RequestHandler } from 'express';
import { SAFE_METHODS } from '../access/registry';
import type { Logger } from './logger';

const REQUEST_ID = /^[\w.:-]{1,128}$/;

export interface RequestLogOptions {
  /** A successful read slower than this (ms) is logged at info like a change; faster ones at debug. */
  slowReadMs: number;
}

/**
 * One line per request when it ends: errors (5xx) at error, refusals (4xx) at warn, changes and
 * slow reads at info, and fast successful reads at debug (LOG_LEVEL=debug shows every request).
 * Reads are most of the traffic and say nothing an operator acts on; logging each one was a third
 * of the cost of a signed-in read and most of the log's volume.
 *
 * Every request gets an id (a well-formed incoming X-Request-Id is kept, for tracing through a
 * proxy) sent back as X-Request-Id, and `req.log`, a logger whose lines carry the request's id,
 * method and path (never its query string or headers: codes and cookies travel there). The
 * child logger is made only when a handler first logs.
 */
export function requestLog(logger: Logger, { slowReadMs }: RequestLogOptions): RequestHandler {
  return (req, res, next) => {
    const started = performance.now();
    const incoming = req.headers['x-request-id'];
    const id = typeof incoming === 'string' && REQUEST_ID.test(incoming) ? incoming : randomUUID();
    res.setHeader('X-Request-Id', id);
    req.id = id;
    const url = req.url;
    const query = url.indexOf('?');
    const line = { id, method: req.method, url: query < 0 ? url : url.slice(0, query) };
    let child: Logger | undefined;
    Object.defineProperty(req, 'log', {
      configurable: true,
      enumerable: false,
      get: () => (child ??= logger.child({ req: line })),
    });
    // 'close' follows 'finish' on every response Node sends, and comes alone when the client went
    // away first (writableFinished tells which): one listener for both.
    res.once('close', () => {
      const responseTime = Math.round(performance.now() - started);
      const status = res.statusCode;
      const level =
        !res.writableFinished && status < 400
          ? 'warn'
          : status >= 500
            ? 'error'
            : status >= 400
              ? 'warn'
              : SAFE_METHODS.has(line.method) && responseTime < slowReadMs
                ? 'debug'
                : 'info';
      if (!logger.isLevelEnabled(level)) return;
      logger[level](
        { req: line, res: { statusCode: status }, responseTime },
        res.writableFinished ? 'request completed' : 'request aborted before the answer was sent',
      );
    });
    next();
  };
}
