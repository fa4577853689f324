import type { Server } from 'node:http';
import { createApp } from './app.js';
import { loadConfig, type Config } from './config.js';
import { createSequelize, dbTarget } from './db/sequelize.js';
import { createLogger } from './logger.js';
import { startJobs } from './jobs/runner.js';

/** Checks the database, then listens. Returns a stop function. */
export async function startServer(config: Config = loadConfig()) {
  const log = createLogger(config.LOG_LEVEL);
  const sequelize = createSequelize(dbTarget(config));
  await sequelize.authenticate();
  const app = createApp({ config, sequelize, log });
  const jobs = startJobs(config, log);
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(config.PORT, config.HOST, () => resolve(s));
  });
  return {
    server,
    sequelize,
    jobs,
    async stop() {
      await jobs.stop();
      await new Promise<void>((r) => {
        server.close(() => r());
        server.closeIdleConnections();
      });
      await sequelize.close();
    },
  };
}
