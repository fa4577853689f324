import { prepareDatabase } from '../../server/bin/bootstrap.js';
import { testConfig, testDbDir } from './env.js';

/** API layer: clean `titrata_api` and `titrata_api_fuzz` databases on the test instance, migrated and seeded with the demo data. */
export default async function setup() {
  const config = testConfig(process.env.TEST_API_DB ?? 'titrata_api');
  await prepareDatabase(config, { instanceDir: testDbDir, fresh: true });
  // The fuzzing file writes random bodies with real ids: it gets a database of its own.
  await prepareDatabase(testConfig(FUZZ_DB), { instanceDir: testDbDir, fresh: true });
}

export const FUZZ_DB = `${process.env.TEST_API_DB ?? 'titrata_api'}_fuzz`;
