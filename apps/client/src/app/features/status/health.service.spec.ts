import { HttpErrorResponse } from '@angular/common/http';
import { healthSchema } from '@trabeate/contracts';
import { describeHealthError, parseHealth } from './health.service';

describe('parseHealth', () => {
  const dependency = { status: 'up', latencyMs: 2, essential: true };
  const valid = healthSchema.parse({
    status: 'ok',
    version: '1.2.3',
    uptimeSeconds: 12,
    dependencies: {
      database: dependency,
      jobQueue: dependency,
      objectStorage: { ...dependency, essential: false },
      mailRelay: { status: 'not_configured', latencyMs: null, essential: false, message: 'Not set up.' },
    },
  });
  const withDb = (db: unknown) => ({ ...valid, dependencies: { ...valid.dependencies, database: db } });

  it('accepts an answer with the Health shape and returns it unchanged', () => {
    expect(parseHealth(valid)).toEqual(valid);
    const down = {
      ...withDb({ status: 'down', latencyMs: null, essential: true, message: 'timeout' }),
      status: 'down',
    };
    expect(parseHealth(down)).toEqual(down);
  });

  const rejected: Array<[string, unknown]> = [
    ['not an object', 'ok'],
    ['null', null],
    ['an unknown API status', { ...valid, status: 'fine' }],
    ['a missing version', { ...valid, version: undefined }],
    ['a negative uptime', { ...valid, uptimeSeconds: -1 }],
    ['no dependencies', { ...valid, dependencies: undefined }],
    ['the old single database part', { status: 'ok', version: '1', uptimeSeconds: 1, database: dependency }],
    ['a missing dependency', { ...valid, dependencies: { ...valid.dependencies, mailRelay: undefined } }],
    ['an unknown dependency status', withDb({ ...dependency, status: 'maybe' })],
    ['a latency given as text', withDb({ ...dependency, latencyMs: '2' })],
    ['a negative latency', withDb({ ...dependency, latencyMs: -1 })],
    ['no essential flag', withDb({ status: 'up', latencyMs: 1 })],
    ['a message that is not text', withDb({ ...dependency, message: 5 })],
    ['an overlong message', withDb({ ...dependency, message: 'x'.repeat(201) })],
  ];

  it.each(rejected)('rejects %s', (_label, raw) => {
    expect(() => parseHealth(raw)).toThrow(TypeError);
  });

  // The guard is hand-written to keep zod out of the bundle; it must agree with the contract.
  it.each([['the valid answer', valid] as [string, unknown], ...rejected])(
    'agrees with the contract schema on %s',
    (_label, raw) => {
      const guardAccepts = (() => {
        try {
          parseHealth(raw);
          return true;
        } catch {
          return false;
        }
      })();
      expect(guardAccepts).toBe(healthSchema.safeParse(raw).success);
    },
  );
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
