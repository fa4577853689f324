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
  // E2E_PORT_OFFSET lets two checkouts run their browser layers side by side.
  const off = Number(process.env.E2E_PORT_OFFSET ?? 0);
  const ports = { PORT: String(8180 + off), SMTP_PORT: String(2625 + off), MAILBOX_PORT: String(8126 + off), PAYMENTS_PORT: String(8191 + off) };
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
