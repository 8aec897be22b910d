import { Router, type RequestHandler } from 'express';
import type { Health } from '@trabeate/contracts';
import type { Db } from '../db/db';

const startedAt = Date.now();

/** GET /api/health: is the API up, and can it reach PostgreSQL? Always 200 so probes can read the body. */
export function healthRoutes(db: Db, version: string): Router {
  const router = Router();
  router.get('/', healthHandler(db, version));
  return router;
}

export function healthHandler(db: Db, version: string): RequestHandler {
  return async (_req, res) => {
    const database = await probeDatabase(db);
    const body: Health = {
      status: database.status === 'up' ? 'ok' : 'degraded',
      version,
      uptimeSeconds: Math.round((Date.now() - startedAt) / 1000),
      database,
    };
    res.json(body);
  };
}

async function probeDatabase(db: Db): Promise<Health['database']> {
  const t0 = performance.now();
  try {
    await Promise.race([
      db.raw('select 1'),
      new Promise((_, reject) => setTimeout(() => reject(new Error('timed out after 2 s')), 2000).unref()),
    ]);
    return { status: 'up', latencyMs: Math.round((performance.now() - t0) * 10) / 10 };
  } catch (err) {
    return { status: 'down', latencyMs: null, message: `The database did not answer: ${(err as Error).message}` };
  }
}
