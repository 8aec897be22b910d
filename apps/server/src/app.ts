import { randomUUID } from 'node:crypto';
import { existsSync } from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import helmet from 'helmet';
import { pinoHttp } from 'pino-http';
import type { Config } from './core/config';
import { apiNotFound, errorHandler } from './core/errors';
import type { Logger } from './core/logger';
import type { Db } from './db/db';
import { healthRoutes } from './health/health.routes';

export interface AppDeps {
  config: Pick<Config, 'CLIENT_DIST' | 'TRUST_PROXY'>;
  db: Db;
  logger: Logger;
  version?: string;
}

const REQUEST_ID = /^[\w.:-]{1,128}$/;

/** Builds the Express app without listening, so tests can mount it with supertest. */
export function createApp({ config, db, logger, version = '0.1.0' }: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  if (config.TRUST_PROXY) app.set('trust proxy', 1);

  app.use(
    pinoHttp({
      logger,
      genReqId: (req, res) => {
        const incoming = req.headers['x-request-id'];
        const id = typeof incoming === 'string' && REQUEST_ID.test(incoming) ? incoming : randomUUID();
        res.setHeader('X-Request-Id', id);
        return id;
      },
      customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info'),
    }),
  );
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          // Angular Material sets inline styles; scripts and fonts come only from our own origin.
          styleSrc: ["'self'", "'unsafe-inline'"],
          fontSrc: ["'self'"],
          imgSrc: ["'self'", 'data:'],
          connectSrc: ["'self'"],
          formAction: ["'self'"],
        },
      },
    }),
  );

  const api = express.Router();
  api.use(express.json({ limit: '1mb' }));
  api.use('/health', healthRoutes(db, version));
  api.use(apiNotFound);
  app.use('/api', api);

  if (config.CLIENT_DIST && existsSync(path.join(config.CLIENT_DIST, 'index.html'))) {
    const dist = path.resolve(config.CLIENT_DIST);
    // Hashed bundles (name-HASH.ext) can be cached for a year; anything else, such as the
    // favicon and index.html, must be revalidated.
    app.use(
      express.static(dist, {
        index: false,
        setHeaders: (res, file) => {
          const hashed = /-[A-Z0-9]{8}\.(js|css|woff2?|ttf|svg|png)$/.test(file);
          res.setHeader('Cache-Control', hashed ? 'public, max-age=31536000, immutable' : 'no-cache');
        },
      }),
    );
    app.get('/{*path}', (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(path.join(dist, 'index.html'));
    });
  }

  app.use(errorHandler(logger));
  return app;
}
