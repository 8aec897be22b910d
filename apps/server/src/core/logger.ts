import pino, { type Logger } from 'pino';

export type { Logger };

/**
 * Structured JSON logs on stdout; one line per event, ready for any log collector.
 * `sync: false` (the server's own setting) hands lines to the operating system without waiting
 * for each write: lines written while one write is under way go out together in the next, none is
 * held back on a quiet server, and pino writes what is left when the process exits. The default
 * (synchronous) suits short scripts and tests.
 */
export function createLogger(level: string, name = 'trabeate-api', { sync = true } = {}): Logger {
  return pino(
    {
      name,
      level,
      base: { service: name },
      timestamp: pino.stdTimeFunctions.isoTime,
      redact: ['req.headers.cookie', 'req.headers.authorization', 'res.headers["set-cookie"]'],
    },
    pino.destination({ dest: 1, sync }),
  );
}
