import { Sequelize } from 'sequelize';
import type { Config } from '../config.js';

export interface DbTarget {
  host: string;
  port: number;
  name: string;
  user: string;
  password: string;
  poolMax?: number;
}

/** The connection target from configuration: DB_HOST when set, else the private instance on loopback. */
export function dbTarget(config: Config): DbTarget {
  return {
    host: config.DB_HOST ?? '127.0.0.1',
    port: config.DB_PORT,
    name: config.DB_NAME,
    user: config.DB_USER,
    password: config.DB_PASSWORD,
    poolMax: config.DB_POOL_MAX,
  };
}

/**
 * One Sequelize instance on the mariadb connector. DECIMAL and BIGINT come back as exact
 * strings (bigNumberStrings) so that recorded figures go to decimal.js untouched; all times
 * are stored in UTC.
 */
export function createSequelize(t: DbTarget): Sequelize {
  return new Sequelize(t.name, t.user, t.password, {
    host: t.host,
    port: t.port,
    dialect: 'mariadb',
    logging: process.env.SQL_TRACE ? (sql: string, ms?: number) => console.log(`[sql ${ms ?? '?'} ms] ${sql.slice(0, 160)}`) : false,
    benchmark: !!process.env.SQL_TRACE,
    timezone: '+00:00',
    dialectOptions: {
      bigNumberStrings: true,
      supportBigNumbers: true,
      decimalAsNumber: false,
      connectTimeout: 2000,
      timezone: 'Etc/UTC',
    },
    pool: { max: t.poolMax ?? 10, min: 0, acquire: 4000, idle: 10_000, evict: 5000 },
    define: { underscored: true, timestamps: true },
  });
}
