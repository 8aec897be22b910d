import { createHmac } from 'node:crypto';
import { unsignSessionId } from '../../apps/server/src/auth/session';

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
});
