import type { RequestHandler } from 'express';
import type { Health } from '@trabeate/contracts';
import type { Db } from '../db/db';

const startedAt = Date.now();

/** GET /api/health: is the API up, and can it reach PostgreSQL? Always 200 so probes can read the body. */
export function healthHandler(db: Db, version: string): RequestHandler {
  return async (req, res) => {
    const database = await probeDatabase(db, (err) =>
      req.log?.error({ err }, 'health check: the database did not answer'),
    );
    const body: Health = {
      status: database.status === 'up' ? 'ok' : 'degraded',
      version,
      uptimeSeconds: Math.round((Date.now() - startedAt) / 1000),
      database,
    };
    res.json(body);
  };
}

async function probeDatabase(db: Db, logFailure: (err: unknown) => void): Promise<Health['database']> {
  const t0 = performance.now();
  try {
    await Promise.race([
      db.raw('select 1'),
      new Promise((_, reject) => setTimeout(() => reject(new Error('timed out after 2 s')), 2000).unref()),
    ]);
    return { status: 'up', latencyMs: Math.round((performance.now() - t0) * 10) / 10 };
  } catch (err) {
    // The page is public: the reason (host, user, driver text) goes to the log, not to the caller.
    logFailure(err);
    const timedOut = (err as Error).message.startsWith('timed out');
    return {
      status: 'down',
      latencyMs: null,
      message: timedOut
        ? 'The database did not answer within 2 s.'
        : 'The database did not answer; the reason is in the server log.',
    };
  }
}
