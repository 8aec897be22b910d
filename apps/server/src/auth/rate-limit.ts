import { rateLimit, type Options, type Store, type IncrementResponse } from 'express-rate-limit';
import type { RequestHandler } from 'express';
import type { Db } from '../db/db';
import { problem } from './pages';

/** Hit counters in PostgreSQL, so every API process counts against the same limit. */
export class PgRateLimitStore implements Store {
  windowMs = 60_000;
  localKeys = false;
  constructor(
    private readonly db: Db,
    readonly prefix: string,
  ) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  async increment(key: string): Promise<IncrementResponse> {
    const { rows } = await this.db.raw(
      `insert into rate_limits (key, hits, reset_at) values (?, 1, now() + (? * interval '1 millisecond'))
       on conflict (key) do update set
         hits = case when rate_limits.reset_at <= now() then 1 else rate_limits.hits + 1 end,
         reset_at = case when rate_limits.reset_at <= now() then excluded.reset_at else rate_limits.reset_at end
       returning hits, reset_at`,
      [this.prefix + key, this.windowMs],
    );
    return { totalHits: Number(rows[0].hits), resetTime: new Date(rows[0].reset_at) };
  }

  async decrement(key: string): Promise<void> {
    await this.db('rate_limits')
      .where({ key: this.prefix + key })
      .update({ hits: this.db.raw('greatest(hits - 1, 0)') });
  }

  async resetKey(key: string): Promise<void> {
    await this.db('rate_limits')
      .where({ key: this.prefix + key })
      .del();
  }
}

/**
 * Sign-in starts allowed per client address in each quarter hour. A whole office behind one
 * address (say 60 people signing in at nine o'clock, some twice) stays far below it; a script
 * opening sign-ins in a loop does not. The return from the provider is not counted: it cannot
 * happen without a start, and counting it halved the allowance.
 */
export const DEFAULT_SIGN_IN_STARTS = 300;

/** Counts sign-in starts per client address: stops floods of provider round trips from one place. */
export function signInRateLimit(db: Db, limit: number = DEFAULT_SIGN_IN_STARTS): RequestHandler {
  return rateLimit({
    windowMs: 15 * 60_000,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: new PgRateLimitStore(db, 'sign-in:'),
    handler: (req, res) => {
      req.log?.warn({ ip: req.ip }, 'sign-in rate limit reached');
      problem(
        req,
        res,
        429,
        'too_many_requests',
        'Too many sign-in attempts',
        'Too many sign-in attempts came from your network. Wait a few minutes and try again.',
      );
    },
  });
}
