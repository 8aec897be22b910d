import { createHmac } from 'node:crypto';
import { unsignSessionId } from '../../apps/server/src/auth/session';
import { cookieValue } from '../../apps/server/src/core/cookies';

// The cookie value is `s:<id>.<signature>`, the signature an HMAC-SHA256 of the id in base64
// without padding (the form express-session's cookies have always had, so sessions made before
// the change of middleware stay valid). Checked here against Node's own HMAC, computed apart.
const signed = (sid: string, secret: string) =>
  `s:${sid}.${createHmac('sha256', secret).update(sid).digest('base64').replace(/=+$/, '')}`;

describe('session cookie signatures', () => {
  const sid = 'Zq3v0Yk8bN2c5RtW1xLpA9sD4fGhJ6mK';

  it('accepts the id signed with the current secret or an older one still listed (rotation)', () => {
    expect(unsignSessionId(signed(sid, 'current'), ['current', 'older'])).toBe(sid);
    expect(unsignSessionId(signed(sid, 'older'), ['current', 'older'])).toBe(sid);
  });

  it('refuses a secret no longer listed, a changed id or signature, and values of the wrong form', () => {
    expect(unsignSessionId(signed(sid, 'retired'), ['current'])).toBeUndefined();
    const good = signed(sid, 'current');
    expect(unsignSessionId(good.replace(sid, `${sid.slice(0, -1)}X`), ['current'])).toBeUndefined();
    expect(unsignSessionId(`${good.slice(0, -2)}AA`, ['current'])).toBeUndefined();
    expect(unsignSessionId(`${good}A`, ['current'])).toBeUndefined();
    for (const bad of ['', 's:', 's:.', sid, `x:${sid}.abc`, good.slice(2)])
      expect(unsignSessionId(bad, ['current'])).toBeUndefined();
  });

  it('finds one cookie in a Cookie header as a browser sends it (RFC 6265 §5.4: "name=value; name=value")', () => {
    const header = 'x-trabeate.sid=other; trabeate.sid=s%3Aabc.def; XSRF-TOKEN=t%2Bk; empty=';
    expect(cookieValue(header, 'trabeate.sid')).toBe('s:abc.def');
    expect(cookieValue(header, 'XSRF-TOKEN')).toBe('t+k');
    expect(cookieValue('trabeate.sid=first; trabeate.sid=second', 'trabeate.sid')).toBe('first');
    expect(cookieValue(header, 'missing')).toBeUndefined();
    expect(cookieValue('x-trabeate.sid=other', 'trabeate.sid')).toBeUndefined();
    expect(cookieValue('trabeate.sid=%E0%A4%A', 'trabeate.sid')).toBeUndefined();
    expect(cookieValue(undefined, 'trabeate.sid')).toBeUndefined();
  });
});
