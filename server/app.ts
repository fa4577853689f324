import { existsSync } from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import helmet from 'helmet';
import rateLimit from 'express-rate-limit';
import { ErrorCode } from '../shared/errors.js';
import type { Logger } from 'pino';
import type { Sequelize } from 'sequelize';
import type { Config } from './config.js';
import { apiNotFound, errorHandler } from './middleware/errorHandler.js';
import { setSequelize } from './db/current.js';
import { initModels } from './db/models/index.js';
import { apiRouter } from './routes/index.js';
import { setComplianceConfig } from './services/compliance.js';
import { setBillingConfig } from './services/billing.js';
import { PAYMENTS_WEBHOOK_PATH } from './routes/billing.js';

export interface AppDeps {
  config: Config;
  sequelize: Sequelize;
  log: Logger;
}

/** Builds the Express app (no listen), so tests can drive it with supertest. */
export function createApp(deps: AppDeps): Express {
  const { config, log } = deps;
  initModels(deps.sequelize);
  setSequelize(deps.sequelize);
  setComplianceConfig(deps.config);
  setBillingConfig(deps.config);
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');

  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // PrimeVue writes its theme as <style> elements at run time.
          styleSrc: ["'self'", "'unsafe-inline'"],
          fontSrc: ["'self'", 'data:'],
          imgSrc: ["'self'", 'data:', 'blob:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          frameAncestors: ["'none'"],
          formAction: ["'self'"],
        },
      },
      crossOriginEmbedderPolicy: false,
    }),
  );
  app.use(
    '/api',
    rateLimit({
      windowMs: 60_000,
      limit: config.API_RATE_LIMIT,
      standardHeaders: 'draft-7',
      legacyHeaders: false,
      handler: (_req, res) => {
        res.status(429).json({ error: { code: ErrorCode.tooMany, message: 'Too many requests; slow down and try again in a minute.' } });
      },
    }),
  );
  // The payment webhook's signature covers the exact bytes sent, so it gets the raw body and the
  // JSON parser (which skips a body already read) never touches it.
  app.use(`/api/v1${PAYMENTS_WEBHOOK_PATH}`, express.raw({ type: () => true, limit: '1mb' }));
  app.use('/api', express.json({ limit: config.JSON_LIMIT }));
  app.use('/api/v1', apiRouter(deps));
  app.use('/api', apiNotFound);

  const clientDir = path.join(config.dataDir, 'client');
  if (existsSync(path.join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }));
    app.get('/{*splat}', (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile('index.html', { root: clientDir });
    });
  } else {
    app.get('/', (_req, res) => {
      res.type('text/plain').send('Titrata API is running; the client has not been built (npm run build).');
    });
  }

  app.use(errorHandler(log));
  return app;
}
