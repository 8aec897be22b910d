import type { Db } from '../db/db';

export interface PruneCounts {
  sessions: number;
  rateLimits: number;
  identityPayloads: number;
}

/**
 * Deletes rows whose time is up: expired sessions (they are already refused on read), spent
 * sign-in rate-limit windows, and the local identity provider's expired records. Runs as a
 * scheduled job, so with several API processes it still runs once per tick.
 */
export async function pruneExpired(db: Db, now: Date = new Date()): Promise<PruneCounts> {
  const [sessions, rateLimits, identityPayloads] = await Promise.all([
    db('sessions').where('expire', '<', now).delete(),
    db('rate_limits').where('reset_at', '<', now).delete(),
    db('identity_payloads').where('expires_at', '<', now).delete(),
  ]);
  return { sessions, rateLimits, identityPayloads };
}

export const PRUNE_JOB = 'maintenance.prune';
/** Every ten minutes: often enough to keep the tables small, rare enough to cost nothing. */
export const PRUNE_CRON = '*/10 * * * *';
