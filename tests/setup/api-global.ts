import { prepareDatabase } from '../../server/bin/bootstrap.js';
import { testConfig, testDbDir } from './env.js';

/** API layer: a clean `titrata_api` database on the test instance, migrated and seeded with the demo data. */
export default async function setup() {
  const config = testConfig(process.env.TEST_API_DB ?? 'titrata_api');
  await prepareDatabase(config, { instanceDir: testDbDir, fresh: true });
}
