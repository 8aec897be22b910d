import express from 'express';
import request from 'supertest';
import { z } from 'zod';
import { createLogger } from './logger';
import { errorHandler } from './errors';
import { nulPath, validate } from './validate';

function appWith() {
  const app = express();
  app.use(express.json());
  app.post(
    '/things/:id',
    validate({
      params: z.object({ id: z.uuid() }),
      body: z.object({ name: z.string().min(1), spanM: z.number().positive() }),
    }),
    (req, res) => {
      res.json({ ok: true, body: req.body });
    },
  );
  app.use(errorHandler(createLogger('silent')));
  return app;
}

describe('validate()', () => {
  const id = '8d0f7f4e-5a8b-4c51-9a7e-2b0a4bb5d1a0';

  it('answers 400 naming the field that failed', async () => {
    const res = await request(appWith()).post(`/things/${id}`).send({ name: 'B1', spanM: -2 });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.message).toMatch(/body\.spanM/);
    expect(res.body.error.fields).toHaveProperty(['body.spanM']);
  });

  it('checks path parameters too', async () => {
    const res = await request(appWith()).post('/things/not-a-uuid').send({ name: 'B1', spanM: 4 });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty(['params.id']);
  });

  it('passes valid input through', async () => {
    const res = await request(appWith()).post(`/things/${id}`).send({ name: 'B1', spanM: 4.5 });
    expect(res.status).toBe(200);
    expect(res.body.body).toEqual({ name: 'B1', spanM: 4.5 });
  });

  it('refuses a NUL character in a string, naming the field, before the schema sees it', async () => {
    const res = await request(appWith()).post(`/things/${id}`).send({ name: 'B\u00001', spanM: 4 });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ 'body.name': ['must not contain the NUL character (U+0000)'] });
  });
});

describe('nulPath()', () => {
  it('finds NUL in nested strings and in keys, and nothing in clean input', () => {
    expect(nulPath({ a: [{ b: 'ok' }, { c: 'x\u0000' }] }, 'body')).toBe('body.a.1.c');
    expect(nulPath({ ['k\u0000']: 1 }, 'query')).toBe('query.k\\0');
    expect(nulPath({ a: ['fine', 3, null, true], b: { c: 'also fine' } }, 'body')).toBeNull();
    expect(nulPath(undefined, 'params')).toBeNull();
  });

  it('walks a body nested far deeper than the call stack would allow', () => {
    let deep: unknown = 'bottom\u0000';
    for (let i = 0; i < 200_000; i++) deep = [deep];
    expect(nulPath(deep, 'body')).toMatch(/^body(\.0)+$/);
  });
});
