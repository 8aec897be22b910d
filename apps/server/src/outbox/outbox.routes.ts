import { outboxMessageSchema, type OutboxMessage } from '@trabeate/contracts';
import { HttpError } from '../core/errors';
import { route, type RouteDecl } from '../access/registry';

const LIMIT = 50;

/**
 * The development outbox: the messages the local SMTP fake caught, read from its HTTP API. Only
 * when that fake is configured (DEV_OUTBOX_URL); production refuses the setting.
 */
export function outboxRoutes(outboxUrl: string | undefined): RouteDecl[] {
  return [
    route('get', '/dev/outbox', 'principal', async (_req, res) => {
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
      // The list has headers only; each message is fetched for its bodies (newest first, at most 50).
      const list = ((await fetchJson('/messages')) as Array<{ id: string }>).slice(0, LIMIT);
      const messages: OutboxMessage[] = await Promise.all(
        list.map(async (m) => {
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
      res.json(messages);
    }),
  ];
}
