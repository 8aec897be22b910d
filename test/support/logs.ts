import { Writable } from 'node:stream';
import pino from 'pino';

/** A logger that keeps every line, so a test can check that a fault was logged. */
export function capturingLogger(): { logger: pino.Logger; lines: Array<Record<string, unknown>> } {
  const lines: Array<Record<string, unknown>> = [];
  const stream = new Writable({
    write(chunk, _enc, done) {
      for (const line of String(chunk).split('\n')) if (line.trim()) lines.push(JSON.parse(line));
      done();
    },
  });
  return { logger: pino({ level: 'debug' }, stream), lines };
}
