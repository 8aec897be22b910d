import { HttpErrorResponse } from '@angular/common/http';
import { describeHealthError, parseHealth } from './health.service';

describe('parseHealth', () => {
  const valid = {
    status: 'ok',
    version: '1.2.3',
    uptimeSeconds: 12,
    database: { status: 'up', latencyMs: 2 },
  };

  it('accepts an answer with the Health shape and returns it unchanged', () => {
    expect(parseHealth(valid)).toEqual(valid);
    const down = { ...valid, status: 'degraded', database: { status: 'down', latencyMs: null, message: 'timeout' } };
    expect(parseHealth(down)).toEqual(down);
  });

  it.each([
    ['not an object', 'ok'],
    ['null', null],
    ['an unknown API status', { ...valid, status: 'fine' }],
    ['a missing version', { ...valid, version: undefined }],
    ['a negative uptime', { ...valid, uptimeSeconds: -1 }],
    ['no database part', { ...valid, database: undefined }],
    ['an unknown database status', { ...valid, database: { status: 'maybe', latencyMs: 1 } }],
    ['a latency given as text', { ...valid, database: { status: 'up', latencyMs: '2' } }],
    ['a message that is not text', { ...valid, database: { status: 'up', latencyMs: 1, message: 5 } }],
  ])('rejects %s', (_label, raw) => {
    expect(() => parseHealth(raw)).toThrow(TypeError);
  });
});

describe('describeHealthError', () => {
  it('calls no answer at all "could not be reached"', () => {
    expect(describeHealthError(new HttpErrorResponse({ status: 0 }))).toContain('could not be reached');
  });

  it('names the status of an error answer from the server itself', () => {
    expect(describeHealthError(new HttpErrorResponse({ status: 418 }))).toContain('HTTP 418');
  });

  it('treats anything that is not an HTTP error as an answer this page does not understand', () => {
    expect(describeHealthError(new TypeError('bad shape'))).toContain('not in a form this page understands');
  });
});
