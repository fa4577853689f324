import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';
import { rootDir } from '../config.js';

export type MigrationFn = (ctx: { context: QueryInterface }) => Promise<void>;

/**
 * Umzug over Sequelize's query interface, never sync(). Migrations are `.ts` files in
 * server/db/migrations named by date and intent; they are imported through our own
 * resolve so the same loader works under tsx and Vitest.
 */
export function migrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: {
      glob: ['server/db/migrations/*.ts', { cwd: rootDir }],
      resolve: ({ name, path: file, context }) => ({
        name,
        up: async () => (await import(pathToFileURL(path.resolve(file!)).href)).up({ context }),
        down: async () => (await import(pathToFileURL(path.resolve(file!)).href)).down({ context }),
      }),
    },
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
}

/** Applies every pending migration; returns the names applied. */
export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const done = await migrator(sequelize).up();
  return done.map((m) => m.name);
}
