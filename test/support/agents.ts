import request from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import type { TestApp } from './app';
import { signIn, xsrfToken } from './identity';

/** An agent signed in as this person, holding the CSRF cookie the client would have. */
export async function signedInAs(t: TestApp, email: string): Promise<TestAgent> {
  const api = request.agent(t.app);
  const steps = await signIn(api, t.identity!, email);
  if (steps.callback?.status !== 302) throw new Error(`${email} could not sign in`);
  await api.get('/api/me');
  return api;
}

/** A state-changing request with the X-XSRF-TOKEN header, as Angular sends it. */
export function send(api: TestAgent, method: 'post' | 'put' | 'patch' | 'delete', path: string, body?: object) {
  const req = api[method](path).set('X-XSRF-TOKEN', xsrfToken(api));
  return body ? req.send(body) : req;
}

/** Polls until the probe is true (for work a background worker does). */
export async function until(what: string, probe: () => Promise<boolean>, ms = 15_000): Promise<void> {
  const end = Date.now() + ms;
  while (!(await probe())) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}
