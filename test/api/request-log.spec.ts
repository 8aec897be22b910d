import express from 'express';
import request from 'supertest';
import { requestLog } from '../../apps/server/src/core/request-log';
import { capturingLogger } from '../support/logs';

const DEBUG = 20;
const INFO = 30;
const WARN = 40;
const ERROR = 50;

describe('the request log', () => {
  const { logger, lines } = capturingLogger();
  const app = express();
  app.use(requestLog(logger, { slowReadMs: 50 }));
  app.get('/fast', (req, res) => {
    req.log.info({ detail: 1 }, 'a handler line');
    res.json({ ok: true });
  });
  app.get('/slow', (_req, res) => void setTimeout(() => res.json({ ok: true }), 80));
  app.post('/change', (_req, res) => void res.status(201).json({ ok: true }));
  app.get('/refused', (_req, res) => void res.status(404).json({ error: 'none' }));
  app.get('/broken', (_req, res) => void res.status(500).json({ error: 'broken' }));

  /** The line that ended the request with this id. */
  const completion = (id: string) =>
    lines.find(
      (l) =>
        (l['req'] as { id?: string } | undefined)?.id === id && /request (completed|aborted)/.test(String(l['msg'])),
    );

  it('logs fast successful reads at debug, and changes, slow reads, refusals and errors above it', async () => {
    const cases: Array<[string, 'get' | 'post', number]> = [
      ['/fast?code=secret', 'get', DEBUG],
      ['/slow', 'get', INFO],
      ['/change', 'post', INFO],
      ['/refused', 'get', WARN],
      ['/broken', 'get', ERROR],
    ];
    for (const [path, method, level] of cases) {
      const res = await request(app)[method](path);
      const line = completion(res.headers['x-request-id']);
      expect(line).toBeDefined();
      expect({ path, level: line!['level'] }).toEqual({ path, level });
      expect(line!['res']).toEqual({ statusCode: res.status });
      expect(typeof line!['responseTime']).toBe('number');
    }
  });

  it('keeps query strings out, and gives handler lines the request’s id, method and path', async () => {
    const res = await request(app).get('/fast?code=secret').set('X-Request-Id', 'probe-7');
    expect(res.headers['x-request-id']).toBe('probe-7');
    const handlerLine = lines.find(
      (l) => l['msg'] === 'a handler line' && (l['req'] as { id: string }).id === 'probe-7',
    );
    expect(handlerLine?.['req']).toEqual({ id: 'probe-7', method: 'GET', url: '/fast' });
    expect(JSON.stringify(lines)).not.toContain('secret');
  });
});
