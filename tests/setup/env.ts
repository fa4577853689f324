import path from 'node:path';
import { dataDir, loadConfig, type Config } from '../../server/config.js';

/** The test database instance: its own folder and port, so tests run beside `npm start`. */
export const testDbDir = path.join(dataDir, 'test-db');
export const testDbPort = Number(process.env.TEST_DB_PORT ?? 3407);
export const testOutputDir = path.join(dataDir, 'test-output');

/** Configuration for a test layer: its own database name on the test instance, quiet logs, high limits. */
export function testConfig(dbName: string, extra: Record<string, string> = {}): Config {
  return loadConfig({
    ...process.env,
    NODE_ENV: 'test',
    DB_HOST: process.env.TEST_DB_HOST ?? '',
    DB_PORT: String(process.env.TEST_DB_HOST ? (process.env.TEST_DB_PORT ?? 3306) : testDbPort),
    DB_NAME: dbName,
    DB_USER: 'titrata_test',
    DB_PASSWORD: 'titrata-test',
    JWT_SECRET: 'test-secret-test-secret-test-secret-0123456789',
    LOG_LEVEL: process.env.TEST_LOG_LEVEL ?? 'silent',
    LOGIN_RATE_LIMIT: '1000',
    API_RATE_LIMIT: '100000',
    ...extra,
  });
}
