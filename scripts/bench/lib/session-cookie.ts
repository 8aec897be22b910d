import { createHmac, randomBytes } from 'node:crypto';
import type { Knex } from 'knex';

/**
 * A signed-in session for a benchmark without the identity provider: a session row as
 * express-session stores one, its signed cookie, and the XSRF token the API issues on /api/me
 * (sent back as X-XSRF-TOKEN on every change, as Angular does).
 */
export async function sessionCookie(
  base: string,
  db: Knex,
  secret: string,
  u: { id: string; email: string; name: string },
): Promise<{ cookie: string; cookieName: string; cookieValue: string; xsrf: string }> {
  const sid = randomBytes(24).toString('base64url');
  const expires = new Date(Date.now() + 3_600_000);
  await db('sessions').insert({
    sid,
    sess: JSON.stringify({
      cookie: { originalMaxAge: 3_600_000, expires: expires.toISOString(), httpOnly: true, path: '/', sameSite: 'lax' },
      auth: {
        userId: u.id,
        issuer: 'bench',
        subject: 'bench',
        email: u.email,
        name: u.name,
        signedInAt: Date.now(),
        idToken: '',
      },
    }),
    expire: expires,
  });
  const cookieName = 'trabeate.sid';
  const cookieValue = encodeURIComponent(
    `s:${sid}.${createHmac('sha256', secret).update(sid).digest('base64').replace(/=+$/, '')}`,
  );
  const cookie = `${cookieName}=${cookieValue}`;
  const me = await fetch(`${base}/api/me`, { headers: { cookie } });
  if (me.status !== 200) throw new Error(`GET /api/me answered ${me.status}`);
  const set = me.headers.getSetCookie().find((c) => c.startsWith('XSRF-TOKEN='));
  if (!set) throw new Error('GET /api/me issued no XSRF-TOKEN cookie');
  const xsrf = decodeURIComponent(set.slice('XSRF-TOKEN='.length).split(';')[0]);
  return { cookie: `${cookie}; XSRF-TOKEN=${encodeURIComponent(xsrf)}`, cookieName, cookieValue, xsrf };
}
