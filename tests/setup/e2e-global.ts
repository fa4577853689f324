import type { TestProject } from 'vitest/node';
import { prepareDatabase } from '../../server/bin/bootstrap.js';
import { ensureClientBuilt } from '../../server/bin/build-client.js';
import { startFakes } from '../../server/bin/fakes.js';
import { startServer } from '../../server/index.js';
import { testConfig, testDbDir } from './env.js';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    mailboxUrl: string;
    paymentsUrl: string;
  }
}

/** Browser layer: a clean `titrata_e2e` database with the demo data, the built client, the fakes and the app. */
export default async function setup(project: TestProject) {
  const ports = { PORT: '8180', SMTP_PORT: '2625', MAILBOX_PORT: '8126', PAYMENTS_PORT: '8191' };
  const config = testConfig('titrata_e2e', ports);
  await prepareDatabase(config, { instanceDir: testDbDir, fresh: true });
  await ensureClientBuilt();
  const fakes = await startFakes(config);
  const app = await startServer(config);
  project.provide('baseUrl', config.publicUrl);
  project.provide('mailboxUrl', `http://127.0.0.1:${config.MAILBOX_PORT}`);
  project.provide('paymentsUrl', `http://127.0.0.1:${config.PAYMENTS_PORT}`);
  return async () => {
    await app.stop();
    await fakes.stop();
  };
}
