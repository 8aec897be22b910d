import type { TestRequest } from '@angular/common/http/testing';
import { apiErrorSchema, type ApiError } from '@trabeate/contracts';
import type { z } from 'zod';

// The only way specs answer a request to our API. Every fake reply goes through the response
// schema in libs/contracts, so a fixture the real API would never send (a list where the API pages,
// a missing field, a field it does not have) fails the spec instead of passing it.

/** Throws unless `body` is exactly something the schema allows, with no field the schema drops. */
export function apiShaped<S extends z.ZodType>(schema: S, body: unknown): z.output<S> {
  const parsed = schema.safeParse(body);
  if (!parsed.success) {
    throw new Error(`This fixture is not what the API sends:\n${parsed.error.message}`);
  }
  // zod drops keys it does not know; a fixture carrying them would test a reply that never comes.
  const extra = strayKeys(body, parsed.data);
  if (extra.length) throw new Error(`This fixture has fields the API does not send: ${extra.join(', ')}`);
  return parsed.data;
}

/** Answers a request with a body checked against the named response schema. */
export function reply<S extends z.ZodType>(
  req: TestRequest,
  schema: S,
  body: z.input<S>,
  status: { status: number; statusText: string } = { status: 200, statusText: 'OK' },
): void {
  req.flush(apiShaped(schema, body) as Parameters<TestRequest['flush']>[0], status);
}

/** Answers every request in the list the same way (several resources asking for one URL). */
export function replyAll<S extends z.ZodType>(reqs: readonly TestRequest[], schema: S, body: z.input<S>): void {
  for (const r of reqs) reply(r, schema, body);
}

/** Answers a request with the API's error shape. */
export function replyError(req: TestRequest, status: number, error: ApiError['error'], statusText = 'Error'): void {
  req.flush(apiShaped(apiErrorSchema, { error }), { status, statusText });
}

/** Answers a request that the API answers with no body (204). */
export function replyEmpty(req: TestRequest): void {
  req.flush(null, { status: 204, statusText: 'No Content' });
}

function strayKeys(given: unknown, kept: unknown, at = '$'): string[] {
  if (Array.isArray(given) && Array.isArray(kept)) {
    return given.flatMap((g, i) => strayKeys(g, kept[i], `${at}[${i}]`));
  }
  if (isPlainObject(given) && isPlainObject(kept)) {
    return Object.keys(given).flatMap((k) => (k in kept ? strayKeys(given[k], kept[k], `${at}.${k}`) : [`${at}.${k}`]));
  }
  return [];
}

const isPlainObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === 'object' && v !== null && !Array.isArray(v);
