/**
 * The shared half of `npm start` and `npm test`: a database to talk to (the private
 * instance unless DB_HOST is set), the application database and user, migrations and the
 * demo data.
 */
import path from 'node:path';
import type { Config } from '../config.js';
import { migrate } from '../db/migrate.js';
import { createSequelize, dbTarget } from '../db/sequelize.js';
import { seedDemo } from '../db/seed/index.js';
import { ensureDatabase, startInstance, stopInstance, type Instance } from './mariadb.js';

export interface Bootstrapped {
  instance?: Instance;
  stopDatabase(): Promise<void>;
}

export async function prepareDatabase(
  config: Config,
  opts: { instanceDir?: string; fresh?: boolean; seed?: boolean; log?: (m: string) => void } = {},
): Promise<Bootstrapped> {
  const log = opts.log ?? (() => undefined);
  let instance: Instance | undefined;
  if (!config.DB_HOST) {
    const dir = opts.instanceDir ?? path.join(config.dataDir, 'mariadb');
    instance = await startInstance({ dir, port: config.DB_PORT });
    log(instance.startedHere ? `MariaDB started on 127.0.0.1:${config.DB_PORT}` : `MariaDB already running on 127.0.0.1:${config.DB_PORT}`);
    await ensureDatabase(instance, { name: config.DB_NAME, user: config.DB_USER, password: config.DB_PASSWORD, fresh: opts.fresh });
  }
  const sequelize = createSequelize(dbTarget(config));
  try {
    const applied = await migrate(sequelize);
    if (applied.length) log(`applied ${applied.length} migration(s)`);
    if (opts.seed !== false) {
      const seeded = await seedDemo(sequelize, config);
      if (seeded) log('loaded the demo data');
    }
  } finally {
    await sequelize.close();
  }
  return {
    instance,
    async stopDatabase() {
      if (instance?.startedHere) await stopInstance(instance);
    },
  };
}
