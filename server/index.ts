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
  // Express 5 hands a listen error (port taken) to the callback: refuse to start rather than
  // leave another program answering on our port.
  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(config.PORT, config.HOST, (err?: Error) => (err ? reject(new Error(`cannot listen on ${config.HOST}:${config.PORT}: ${err.message}`)) : resolve(s)));
  }).catch(async (err) => {
    await sequelize.close();
    throw err;
  }) as Server;
  const jobs = startJobs(config, log);
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
