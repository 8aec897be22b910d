import pg from 'pg';
import type { Logger } from './logger';

export const CHANGE_CHANNEL = 'trabeate_changes';

/**
 * What this process knows of changes: a number per key that moves on every change (`generation`),
 * heard from PostgreSQL's notices and from this process's own writes (`changed`, at once, before
 * the notice arrives). Keys are firm ids for the firm's lists (the list_change_notices migration),
 * and `session:<bucket>` or `sessions` for kept sessions (session_change_notices, SessionCache). A reply kept
 * with the number it was made under is current while the number has not moved. While the feed is
 * not listening (starting, connection lost), `live` is false and nothing may be served from a cache.
 */
export interface ChangeFeed {
  live(): boolean;
  generation(firmId: string): string;
  changed(firmId: string): void;
  close(): Promise<void>;
}

/** Listens on CHANGE_CHANNEL with a connection of its own, reconnecting after a loss. */
export async function startChangeFeed(databaseUrl: string, logger: Logger, retryMs = 1000): Promise<ChangeFeed> {
  const generations = new Map<string, number>();
  /** Moves for every firm at once: a notice naming no firm, or a gap in listening. */
  let everyone = 0;
  let client: pg.Client | undefined;
  let listening = false;
  let closed = false;
  let retry: NodeJS.Timeout | undefined;

  const bump = (firmId: string) => {
    if (firmId === '*') everyone++;
    else generations.set(firmId, (generations.get(firmId) ?? 0) + 1);
  };

  const connect = async (): Promise<void> => {
    const c = new pg.Client({ connectionString: databaseUrl, application_name: 'trabeate change feed' });
    const lost = (err?: Error) => {
      if (client !== c) return;
      client = undefined;
      listening = false;
      everyone++; // notices may be missed from here on
      c.removeAllListeners();
      c.on('error', () => undefined);
      void c.end().catch(() => undefined);
      if (closed) return;
      logger.warn({ err }, 'change feed lost its database connection; list replies are not kept until it is back');
      retry = setTimeout(() => void connect().catch(() => undefined), retryMs);
      retry.unref();
    };
    client = c;
    c.on('notification', (n) => {
      if (n.channel === CHANGE_CHANNEL) bump(n.payload || '*');
    });
    c.on('error', lost);
    c.on('end', () => lost());
    try {
      await c.connect();
      await c.query(`listen ${CHANGE_CHANNEL}`);
      if (client !== c) return;
      everyone++; // whatever changed before listening began
      listening = true;
    } catch (err) {
      lost(err as Error);
      throw err;
    }
  };

  await connect().catch((err: unknown) =>
    logger.warn({ err }, 'change feed could not listen yet; list replies are not kept until it does'),
  );

  return {
    live: () => listening,
    generation: (firmId) => `${everyone}.${generations.get(firmId) ?? 0}`,
    changed: bump,
    close: async () => {
      closed = true;
      clearTimeout(retry);
      const c = client;
      client = undefined;
      listening = false;
      if (c) {
        c.removeAllListeners();
        c.on('error', () => undefined);
        await c.end().catch(() => undefined);
      }
    },
  };
}
