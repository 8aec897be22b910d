import type { ChangeFeed } from './change-feed';

export interface ReplyCacheOptions {
  /** Replies kept at most (the oldest go first). */
  maxEntries: number;
  /** A reply is made again after this long even without a change (what depends on the date: late stages). */
  maxAgeMs: number;
}

interface Kept {
  generation: string;
  at: number;
  body: string;
}

/**
 * Serialized replies kept per firm while nothing in the firm's lists changed (see ChangeFeed).
 * `start` gives the firm's number BEFORE the reply's queries run: a change committed while they
 * run moves the number, so the reply is kept under the old one and never served as current.
 * Without a live feed nothing is kept or served.
 */
export class ReplyCache {
  private readonly kept = new Map<string, Kept>();

  constructor(
    private readonly feed: ChangeFeed | undefined,
    private readonly options: ReplyCacheOptions,
  ) {}

  get(firmId: string, key: string): string | undefined {
    if (!this.feed?.live()) return undefined;
    const k = this.kept.get(`${firmId} ${key}`);
    if (!k) return undefined;
    if (k.generation !== this.feed.generation(firmId) || Date.now() - k.at > this.options.maxAgeMs) {
      this.kept.delete(`${firmId} ${key}`);
      return undefined;
    }
    return k.body;
  }

  /** The firm's number now, to pass to `keep`; undefined when nothing may be kept. */
  start(firmId: string): string | undefined {
    return this.feed?.live() ? this.feed.generation(firmId) : undefined;
  }

  keep(firmId: string, key: string, generation: string | undefined, body: string): void {
    if (generation === undefined || !this.feed?.live()) return;
    if (this.kept.size >= this.options.maxEntries) {
      const oldest = this.kept.keys().next().value;
      if (oldest !== undefined) this.kept.delete(oldest);
    }
    this.kept.set(`${firmId} ${key}`, { generation, at: Date.now(), body });
  }
}
