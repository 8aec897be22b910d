import { outboxMessageSchema, outboxQuerySchema, type OutboxMessage, type OutboxQuery } from '@trabeate/contracts';
import { HttpError } from '../core/errors';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';

/**
 * The development outbox: the messages the local SMTP fake caught, read from its HTTP API. Only
 * when that fake is configured (DEV_OUTBOX_URL); production refuses the setting.
 */
export function outboxRoutes(outboxUrl: string | undefined): RouteDecl[] {
  return [
    route('get', '/dev/outbox', 'principal', validate({ query: outboxQuerySchema }), async (_req, res) => {
      const q = res.locals['query'] as OutboxQuery;
      if (!outboxUrl)
        throw new HttpError(
          404,
          'not_found',
          'The development outbox is available only when the local mail fake is configured (DEV_OUTBOX_URL).',
        );
      const base = outboxUrl.replace(/\/$/, '');
      const fetchJson = async (path: string): Promise<unknown> => {
        let r: Response;
        try {
          r = await fetch(`${base}${path}`, { signal: AbortSignal.timeout(5000) });
        } catch {
          throw new HttpError(503, 'service_unavailable', 'The local mail fake is not answering.');
        }
        if (!r.ok) throw new HttpError(503, 'service_unavailable', `The local mail fake answered ${r.status}.`);
        return r.json();
      };
      // The fake's list has headers only, newest first; only this page's messages are fetched for
      // their bodies, so a long-running outbox costs one page of requests, not all of them.
      const all = (await fetchJson('/messages')) as Array<{ id: string }>;
      const onPage = all.slice((q.page - 1) * q.pageSize, q.page * q.pageSize);
      const items: OutboxMessage[] = await Promise.all(
        onPage.map(async (m) => {
          const full = (await fetchJson(`/messages/${encodeURIComponent(m.id)}`)) as Record<string, unknown>;
          return outboxMessageSchema.parse({
            id: full['id'],
            receivedAt: full['receivedAt'],
            from: full['from'],
            to: full['to'],
            subject: full['subject'],
            text: full['text'],
            html: full['html'] ?? null,
          });
        }),
      );
      res.json({ items, total: all.length, page: q.page, pageSize: q.pageSize });
    }),
  ];
}
