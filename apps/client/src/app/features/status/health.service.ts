import type { Health } from '@trabeate/contracts';
import { HttpErrorResponse, httpResource } from '@angular/common/http';
import { Injectable, computed } from '@angular/core';

export const HEALTH_URL = '/api/health';

/** What the status page shows; one of these at any moment, never a blank screen. */
export type HealthView =
  | { readonly kind: 'loading' }
  | { readonly kind: 'ready'; readonly health: Health }
  | { readonly kind: 'error'; readonly message: string };

const DEPENDENCIES = ['database', 'jobQueue', 'objectStorage', 'mailRelay'] as const;

/**
 * Checks the answer against the Health shape. The zod schema stays on the server side of the
 * bundle (the client imports only the type), so this is a small hand-written guard; its spec
 * holds it to the schema in libs/contracts.
 */
export function parseHealth(raw: unknown): Health {
  const fail = (): never => {
    throw new TypeError('The health answer does not have the expected shape.');
  };
  const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null;
  if (!isObject(raw)) return fail();
  if (!['ok', 'degraded', 'down'].includes(raw['status'] as string)) fail();
  if (typeof raw['version'] !== 'string') fail();
  if (typeof raw['uptimeSeconds'] !== 'number' || raw['uptimeSeconds'] < 0) fail();
  const deps = raw['dependencies'];
  if (!isObject(deps)) return fail();
  for (const name of DEPENDENCIES) {
    const d = deps[name];
    if (!isObject(d)) return fail();
    if (!['up', 'down', 'not_configured'].includes(d['status'] as string)) fail();
    const latency = d['latencyMs'];
    if (latency !== null && (typeof latency !== 'number' || latency < 0)) fail();
    if (typeof d['essential'] !== 'boolean') fail();
    const message = d['message'];
    if (message !== undefined && (typeof message !== 'string' || message.length > 200)) fail();
  }
  return raw as Health;
}

/** A user-facing sentence for a failed health request. */
export function describeHealthError(error: unknown): string {
  if (error instanceof HttpErrorResponse) {
    // 0: no answer at all; 502/503/504: a proxy or load balancer answered for a server that did not.
    if (error.status === 0 || error.status === 502 || error.status === 503 || error.status === 504) {
      return 'The Trabeate server could not be reached. Check that it is running and that this computer is connected, then try again.';
    }
    return `The Trabeate server, or something between it and this browser, answered with an error (HTTP ${error.status}). Try again in a moment; if it persists, tell whoever looks after the server.`;
  }
  return 'The Trabeate server answered, but not in a form this page understands. The server and this page may be from different versions; reload the page.';
}

/**
 * The server's health as the status page sees it. Provided by the page itself, so each visit
 * asks afresh and nothing lingers after leaving.
 */
@Injectable()
export class HealthService {
  private readonly resource = httpResource<Health>(() => HEALTH_URL, { parse: parseHealth });

  readonly view = computed<HealthView>(() => {
    const r = this.resource;
    if (r.hasValue()) return { kind: 'ready', health: r.value() };
    if (r.isLoading()) return { kind: 'loading' };
    const error = r.error();
    // A server whose database or job queue is down answers 503 with a full health body: show it,
    // it tells the user more than "unreachable".
    if (error instanceof HttpErrorResponse) {
      const body = tryParse(error.error);
      if (body) return { kind: 'ready', health: body };
    }
    return error ? { kind: 'error', message: describeHealthError(error) } : { kind: 'loading' };
  });

  /** True while a new answer is on its way (first load or a refresh). */
  readonly busy = this.resource.isLoading;

  refresh(): void {
    this.resource.reload();
  }
}

function tryParse(raw: unknown): Health | null {
  try {
    return parseHealth(raw);
  } catch {
    return null;
  }
}
