import type { Sequelize } from 'sequelize';
import { createApp } from '../../server/app.js';
import { createSequelize, dbTarget } from '../../server/db/sequelize.js';
import { createLogger } from '../../server/logger.js';
import { testConfig } from './env.js';

/**
 * createApp() on the API test database; close `sequelize` in afterAll. Models are bound to
 * one Sequelize instance per process, so a second app in the same file passes the first
 * app's `sequelize` along.
 */
export function apiTestApp(extra: Record<string, string> = {}, shared?: Sequelize) {
  const config = testConfig(process.env.TEST_API_DB ?? 'titrata_api', extra);
  const sequelize: Sequelize = shared ?? createSequelize(dbTarget(config));
  const log = createLogger(config.LOG_LEVEL);
  const app = createApp({ config, sequelize, log });
  return { app, sequelize, config, log };
}
