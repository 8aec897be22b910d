import express from 'express';
import request from 'supertest';
import { z } from 'zod';
import { createLogger } from './logger';
import { errorHandler } from './errors';
import { validate } from './validate';

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
});
