import request from 'supertest';
import { safeReturnTo } from '../../apps/server/src/auth/auth.routes';

// Found in review: the URL parser collapses dot segments, so a path that starts with a single "/"
// can come out of it as "//host", which a browser follows to another site after sign-in.
describe('sign-in returnTo after dot segments are resolved', () => {
  it.each([
    '/.//evil.example/x',
    '/a/..//evil.example/x',
    '/%2e//evil.example',
    '/%2E%2e//evil.example/steal?x=1',
    '/././/evil.example',
  ])('never gives a protocol-relative address for %s', (hostile) => {
    const out = safeReturnTo(hostile);
    expect(out.startsWith('//')).toBe(false);
    expect(out).toMatch(/^\/(?!\/)/);
    // Resolved against any origin, the result stays on that origin.
    expect(new URL(out, 'https://app.trabeate.test').origin).toBe('https://app.trabeate.test');
  });

  it('still keeps ordinary paths, queries and fragments (dot segments resolved)', () => {
    expect(safeReturnTo('/projects/a/../b?tab=stages#x')).toBe('/projects/b?tab=stages#x');
    expect(safeReturnTo('/projects')).toBe('/projects');
  });

  it('does not let an express redirect to the collapsed path leave the origin', async () => {
    // The value reaches res.redirect(302, returnTo); check the Location the browser would follow.
    const express = (await import('express')).default;
    const app = express();
    app.get('/go', (req, res) => res.redirect(302, safeReturnTo(req.query['to'])));
    const res = await request(app).get('/go').query({ to: '/.//evil.example/steal' });
    expect(res.status).toBe(302);
    expect(new URL(res.headers['location'], 'https://app.trabeate.test').origin).toBe('https://app.trabeate.test');
  });
});
