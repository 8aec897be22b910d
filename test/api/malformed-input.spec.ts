import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import express from 'express';
import request from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import { DEMO } from '../../seeds/demo';
import { errorHandler } from '../../apps/server/src/core/errors';
import { createLogger } from '../../apps/server/src/core/logger';
import { testApp, type TestApp } from '../support/app';
import { tinyPdf } from '../support/fakes';
import { signIn, xsrfToken } from '../support/identity';

jest.setTimeout(30_000);

const KESTREL = DEMO.projects.kestrel.id;
const UPLOAD = `/api/projects/${KESTREL}/stages/beam_framing/deliverables`;
const BOUNDARY = 'trabeate-probe-boundary';

/** A multipart body assembled by hand, so a test can send exactly the broken bytes it means. */
function multipart(fileName: string, data: Buffer, { close = true } = {}): Buffer {
  return Buffer.concat([
    Buffer.from(
      `--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="${fileName}"\r\n` +
        'Content-Type: application/pdf\r\n\r\n',
      'latin1',
    ),
    data,
    Buffer.from(close ? `\r\n--${BOUNDARY}--\r\n` : ''),
  ]);
}

function expectClientError(res: request.Response, message: RegExp): void {
  expect({ status: res.status, body: res.body }).toEqual({
    status: 400,
    body: { error: expect.objectContaining({ code: expect.any(String), message: expect.stringMatching(message) }) },
  });
  // What was wrong is said in our words; nothing of the driver's or parser's internals leaks.
  expect(res.body.error.message).not.toMatch(/\bat .*\.(ts|js):\d+|invalid byte sequence|0x00|busboy/i);
}

describe('client mistakes in what reaches the API answer 400 with a message', () => {
  let t: TestApp;
  let api: TestAgent;
  const dist = mkdtempSync(path.join(tmpdir(), 'trabeate-dist-'));

  beforeAll(async () => {
    writeFileSync(path.join(dist, 'index.html'), '<!doctype html><title>Trabeate</title>');
    t = await testApp({ seed: true, identity: true, config: { CLIENT_DIST: dist } });
    api = request.agent(t.app);
    const steps = await signIn(api, t.identity!, DEMO.users.principal.email);
    if (steps.callback?.status !== 302) throw new Error('the principal could not sign in');
    await api.get('/api/me');
  });
  afterAll(async () => {
    await t.close();
    rmSync(dist, { recursive: true, force: true });
  });

  const post = (url: string) => api.post(url).set('X-XSRF-TOKEN', xsrfToken(api));

  it('refuses a NUL character in a project name, naming the field, and stores nothing', async () => {
    const res = await post('/api/projects').send({
      reference: 'NUL-1',
      name: 'Quay\u0000annex',
      clientOrganisationId: DEMO.clients.fenwick.id,
      storeys: 3,
      storeyHeightM: 3,
      currency: 'EUR',
      designBasis: {
        codeFamily: 'EN1992',
        concreteMPa: 30,
        steelMPa: 500,
        imposedKPa: 2,
        superimposedDeadKPa: 1,
        bearingPressureKPa: 150,
        foundingDepthM: 1,
      },
    });
    expectClientError(res, /body\.name/);
    expect(res.body.error.fields).toHaveProperty(['body.name']);
    expect(await t.db('projects').where({ reference: 'NUL-1' }).first()).toBeUndefined();
  });

  it('refuses a NUL character in a comment body', async () => {
    const res = await post(`/api/projects/${KESTREL}/stages/beam_framing/comments`).send({ body: 'Check B4\u0000' });
    expectClientError(res, /body\.body/);
  });

  it('refuses a NUL character in a search query', async () => {
    const res = await api.get('/api/projects?q=%00');
    expectClientError(res, /query\.q/);
  });

  it('refuses a NUL character hidden in a nested field name or array', async () => {
    const res = await post(`/api/projects/${KESTREL}/stages/beam_framing/comments`).send({
      body: 'fine',
      extra: [{ ['k\u0000']: 'v' }],
    });
    expectClientError(res, /NUL/);
  });

  it('refuses a multipart part whose file name holds a NUL', async () => {
    const res = await post(UPLOAD)
      .set('Content-Type', `multipart/form-data; boundary=${BOUNDARY}`)
      .send(multipart('plan\u0000.pdf', tinyPdf()));
    expectClientError(res, /upload form/i);
  });

  it('refuses a multipart body cut off in the middle of the file, and keeps nothing of it', async () => {
    const before = (await t.store.list('projects/')).length;
    const res = await post(UPLOAD)
      .set('Content-Type', `multipart/form-data; boundary=${BOUNDARY}`)
      .send(multipart('plan.pdf', tinyPdf().subarray(0, 200), { close: false }));
    expectClientError(res, /upload form/i);
    expect((await t.store.list('projects/')).length).toBe(before);
    expect(await t.db('deliverables').where({ file_name: 'plan.pdf' }).first()).toBeUndefined();
  });

  it('refuses a multipart body without a boundary', async () => {
    const res = await post(UPLOAD).set('Content-Type', 'multipart/form-data').send(multipart('plan.pdf', tinyPdf()));
    expectClientError(res, /boundary/i);
  });

  it('refuses a body that says it is gzip but is not', async () => {
    const res = await post(`/api/projects/${KESTREL}/stages/beam_framing/comments`)
      .set('Content-Type', 'application/json')
      .set('Content-Encoding', 'gzip')
      .send(JSON.stringify({ body: 'plain text, not gzip' }));
    expectClientError(res, /gzip|compress|encod/i);
  });

  it('refuses malformed percent-encoding in an API path', async () => {
    const res = await api.get('/api/projects/%ZZ');
    expectClientError(res, /percent-encod/i);
  });

  it('refuses malformed percent-encoding in a page path, before the client app is served', async () => {
    for (const url of ['/%', '/projects/%E0%A4%A']) {
      const res = await request(t.app).get(url);
      expectClientError(res, /percent-encod/i);
    }
    // A well-formed path still gets the app.
    expect((await request(t.app).get('/projects/abc')).status).toBe(200);
  });

  it('refuses malformed percent-encoding on the identity provider pages with a 400 page', async () => {
    const idp = request(t.identity!.issuer);
    for (const url of ['/interaction/%ZZ', '/interaction/%ZZ/abort', '/auth/%E0%A4%A', '/%']) {
      const res = await idp.get(url);
      expect({ url, status: res.status }).toEqual({ url, status: 400 });
      expect(res.text).toContain('This link is damaged');
      expect(res.text).not.toMatch(/URIError|at .*\.(ts|js):\d+/);
    }
  });
});

describe("PostgreSQL's refusals of a bad value are the client's mistake", () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp();
  });
  afterAll(() => t.close());

  // Each statement makes the real server refuse a value the way a client's input would.
  const refusals: Array<[string, string, string]> = [
    ['22021 invalid byte sequence', "select convert_from('\\x00'::bytea, 'UTF8')", 'could not be stored'],
    ['22P02 invalid text representation', "select 'B4'::integer", 'could not be stored'],
    // A cast would truncate silently; only storing a longer value is refused.
    [
      '22001 string too long',
      "create temp table if not exists probe_short (v varchar(3)); insert into probe_short values ('seven chars')",
      'could not be stored',
    ],
    ['22003 numeric value out of range', 'select 99999999999::integer', 'could not be stored'],
    ['22008 date out of range', "select '2027-02-30'::date", 'could not be stored'],
  ];

  it.each(refusals)('maps %s to 400 without the database text', async (_name, sql) => {
    const app = express();
    app.get('/probe', async (_req, res) => {
      res.json(await t.db.raw(sql));
    });
    app.use(errorHandler(createLogger('silent')));
    const res = await request(app).get('/probe');
    expect(res.status).toBe(400);
    expect(res.body.error).toEqual(
      expect.objectContaining({ code: 'bad_request', message: expect.stringMatching(/could not be stored/) }),
    );
    expect(res.body.error.message).not.toMatch(/integer|varchar|syntax|range for type|UTF8/i);
  });

  it('keeps a broken query (a bug, not bad input) a 500', async () => {
    const app = express();
    app.get('/probe', async (_req, res) => {
      res.json(await t.db.raw('select no_such_column from users'));
    });
    app.use(errorHandler(createLogger('silent')));
    expect((await request(app).get('/probe')).status).toBe(500);
  });
});

describe('what the one error handler does not call a client mistake', () => {
  const failWith = (err: Error) => {
    const app = express();
    app.get('/probe', () => {
      throw err;
    });
    app.use(errorHandler(createLogger('silent')));
    return request(app).get('/probe');
  };

  it('keeps a 4xx that one of our own calls got from another service a 500', async () => {
    const upstream = Object.assign(new Error('Forbidden'), { status: 403, $metadata: { httpStatusCode: 403 } });
    expect((await failWith(upstream)).status).toBe(500);
  });

  it('keeps an error that only shares a parser message, but comes from a service, a 500', async () => {
    const res = await failWith(Object.assign(new Error('Unexpected end of form'), { $metadata: {} }));
    expect(res.status).toBe(500);
    expect(res.body.error.code).toBe('internal');
  });
});
