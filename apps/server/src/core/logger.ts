import pino, { type Logger } from 'pino';

export type { Logger };

/** Structured JSON logs on stdout; one line per event, ready for any log collector. */
export function createLogger(level: string, name = 'trabeate-api'): Logger {
  return pino({
    name,
    level,
    base: { service: name },
    timestamp: pino.stdTimeFunctions.isoTime,
    redact: ['req.headers.cookie', 'req.headers.authorization', 'res.headers["set-cookie"]'],
  });
}
