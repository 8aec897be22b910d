import { createHash } from 'node:crypto';
import type { Knex } from 'knex';

/**
 * How failed passwords for one account slow further tries. The first `freeFailures` cost nothing
 * (typos happen); each one after that doubles the wait, from `firstWaitSeconds` up to
 * `maxWaitSeconds`. Failures older than `forgetAfterSeconds` no longer count.
 */
export interface ThrottlePolicy {
  freeFailures: number;
  firstWaitSeconds: number;
  maxWaitSeconds: number;
  forgetAfterSeconds: number;
}

export const DEFAULT_THROTTLE: ThrottlePolicy = {
  freeFailures: 3,
  firstWaitSeconds: 5,
  maxWaitSeconds: 15 * 60,
  forgetAfterSeconds: 60 * 60,
};

/** Seconds to wait after the n-th failure in a row. */
export function waitAfter(failures: number, p: ThrottlePolicy): number {
  if (failures <= p.freeFailures) return 0;
  return Math.min(p.maxWaitSeconds, p.firstWaitSeconds * 2 ** (failures - p.freeFailures - 1));
}

/**
 * The row key for what was typed in the e-mail field: a hash of the normalised address. Unknown
 * addresses get a key like any other, so the throttle behaves the same whether the account exists.
 */
export function accountKey(email: string): string {
  return createHash('sha256').update(email.trim().toLowerCase()).digest('base64url');
}

export type Claim = { allowed: true; failures: number; waitSeconds: number } | { allowed: false; waitSeconds: number };

/**
 * Takes one password try for the account, counted as a failure until `forgiveTry` says it
 * succeeded. Counting first and checking after means tries sent all at once are counted too: once
 * a wait starts, the conditional update refuses every try until it ends. One statement, so every
 * process sharing the database sees the same count.
 */
export async function claimTry(db: Knex, key: string, p: ThrottlePolicy): Promise<Claim> {
  const next = `case when f.last_failed_at < now() - make_interval(secs => :forget) then 1 else f.failures + 1 end`;
  const waitFor = (n: string) =>
    `case when ${n} <= :free then 0 else least(cast(:max as float8), cast(:first as float8) * power(2, ${n} - :free - 1)) end`;
  const { rows } = await db.raw(
    `insert into identity_sign_in_failures as f (account_key, failures, last_failed_at, wait_until)
     values (:key, 1, now(), now() + make_interval(secs => :firstTryWait))
     on conflict (account_key) do update set
       failures = ${next},
       last_failed_at = now(),
       wait_until = now() + make_interval(secs => ${waitFor(next)})
     where f.wait_until <= now()
     returning failures, cast(greatest(0, extract(epoch from wait_until - now())) as float8) as wait`,
    {
      key,
      forget: p.forgetAfterSeconds,
      free: p.freeFailures,
      max: p.maxWaitSeconds,
      first: p.firstWaitSeconds,
      firstTryWait: waitAfter(1, p),
    },
  );
  if (rows.length) return { allowed: true, failures: Number(rows[0].failures), waitSeconds: Number(rows[0].wait) };
  const waiting = await db('identity_sign_in_failures')
    .where({ account_key: key })
    .first(db.raw('greatest(0, extract(epoch from wait_until - now()))::float8 as wait'));
  return { allowed: false, waitSeconds: Number(waiting?.wait ?? 0) };
}

/** A right password: the try is not a failure, and earlier failures are forgotten. */
export async function forgiveTry(db: Knex, key: string): Promise<void> {
  await db('identity_sign_in_failures').where({ account_key: key }).del();
}

/** Drops counts nobody needs any more; run at start like the payload pruning. */
export async function pruneFailures(db: Knex, p: ThrottlePolicy = DEFAULT_THROTTLE): Promise<number> {
  return db('identity_sign_in_failures')
    .where('wait_until', '<', db.fn.now())
    .andWhere('last_failed_at', '<', db.raw('now() - make_interval(secs => ?)', [p.forgetAfterSeconds]))
    .del();
}

/** "8 seconds", "3 minutes": how long to wait, in words, rounded up. */
export function waitInWords(seconds: number): string {
  const s = Math.max(1, Math.ceil(seconds));
  if (s < 60) return `${s} second${s === 1 ? '' : 's'}`;
  const m = Math.ceil(s / 60);
  return `${m} minute${m === 1 ? '' : 's'}`;
}
