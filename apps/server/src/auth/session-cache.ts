import { createHash } from 'node:crypto';
import type { ChangeFeed } from '../core/change-feed';
import type { SessionWithCaller } from './caller.repository';

/** The change-feed key that drops every kept session (a person, firm or organisation changed). */
export const EVERY_SESSION_KEY = 'sessions';

/** The change-feed key of a session's bucket, as the sessions_change_notice trigger names it. */
export function sessionBucket(sid: string): string {
  return `session:${createHash('md5').update(sid).digest('hex').slice(0, 2)}`;
}

export interface SessionCacheOptions {
  /** Sessions kept at most (the oldest go first). */
  maxEntries: number;
  /** A kept session is read again after this long even without a notice. */
  maxAgeMs: number;
}

interface Kept {
  value: SessionWithCaller;
  bucket: string;
  generation: string;
  at: number;
}

/** What `start` gives and `keep` takes: the session's bucket and its number before the query. */
export interface SessionLookupStart {
  bucket: string;
  generation: string;
}

const deepFreeze = <T>(value: T): T => {
  if (value && typeof value === 'object' && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const v of Object.values(value)) deepFreeze(v);
  }
  return value;
};

/**
 * Session rows, each with its person, kept between requests while PostgreSQL says nothing about
 * them changed (see the session_change_notices migration and ChangeFeed). A signed-in read then
 * needs no query at all; a sign-out, an idle-expiry push, a removed person or a changed role on
 * any API process drops what it touches when its notice arrives, and this process's own writes
 * drop it at once (`forget`, and the app's bump after every change request). Only rows read from
 * the database are kept, never "no such session"; an expired row is never served; nothing is kept
 * or served while the feed is not listening. `start` takes the bucket's number BEFORE the query,
 * so a row read while a change to it committed is kept under the old number and never served.
 * Kept values are frozen: a request changes its session only through RequestSession, which copies.
 */
export class SessionCache {
  private readonly kept = new Map<string, Kept>();

  constructor(
    private readonly feed: ChangeFeed,
    private readonly options: SessionCacheOptions,
  ) {}

  private generation(bucket: string): string {
    return `${this.feed.generation(EVERY_SESSION_KEY)}/${this.feed.generation(bucket)}`;
  }

  get(sid: string): SessionWithCaller | undefined {
    const k = this.kept.get(sid);
    if (!k) return undefined;
    const now = Date.now();
    if (
      !this.feed.live() ||
      k.value.expiresAt < now ||
      now - k.at > this.options.maxAgeMs ||
      k.generation !== this.generation(k.bucket)
    ) {
      this.kept.delete(sid);
      return undefined;
    }
    return k.value;
  }

  /** Before the query; undefined when nothing may be kept. */
  start(sid: string): SessionLookupStart | undefined {
    if (!this.feed.live()) return undefined;
    const bucket = sessionBucket(sid);
    return { bucket, generation: this.generation(bucket) };
  }

  keep(sid: string, started: SessionLookupStart | undefined, value: SessionWithCaller): void {
    if (!started || !this.feed.live()) return;
    if (this.kept.size >= this.options.maxEntries && !this.kept.has(sid)) {
      const oldest = this.kept.keys().next().value;
      if (oldest !== undefined) this.kept.delete(oldest);
    }
    this.kept.set(sid, {
      value: deepFreeze(value),
      bucket: started.bucket,
      generation: started.generation,
      at: Date.now(),
    });
  }

  /** This process wrote or removed the row: the next request reads it again. */
  forget(sid: string): void {
    this.kept.delete(sid);
  }

  get size(): number {
    return this.kept.size;
  }
}
