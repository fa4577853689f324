/**
 * `npm start`: private MariaDB, migrations, demo data, the client build, the fakes (SMTP
 * with its HTTP mailbox, the payment API) and the app on PORT. Ctrl-C stops what this
 * process started and keeps the data.
 */
import path from 'node:path';
import { loadConfig } from '../config.js';
import { startServer } from '../index.js';
import { prepareDatabase } from './bootstrap.js';
import { ensureClientBuilt } from './build-client.js';
import { startFakes } from './fakes.js';

const say = (m: string) => console.log(`[titrata] ${m}`);

async function main() {
  const config = loadConfig();
  const t0 = Date.now();
  const db = await prepareDatabase(config, { instanceDir: path.join(config.dataDir, 'mariadb'), log: say });
  await ensureClientBuilt(say);
  const fakes = config.START_FAKES ? await startFakes(config, say) : undefined;
  const app = await startServer(config);

  say(`ready in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  console.log(`
  Titrata is running at ${config.publicUrl}
  Health:   ${config.publicUrl}/api/v1/health
${fakes ? `  Mailbox:  http://127.0.0.1:${config.MAILBOX_PORT}/messages (e-mail the app sent)\n  Payments: http://127.0.0.1:${config.PAYMENTS_PORT} (local payment service)\n` : ''}
  Demo sign-ins (password: ${process.env.DEMO_PASSWORD ? '$DEMO_PASSWORD' : config.DEMO_PASSWORD}):
    admin@marrowfield.example       lab administrator
    analyst@marrowfield.example     analyst
    operator@kestrelford.example    operator (Kestrel Ford Sanitary District)
    compliance@kestrelford.example  compliance officer
    billing@kestrelford.example     billing contact
    operator@brindlemoor.example    operator (Brindlemoor Water Authority)
    operator@quillonbay.example     operator (Quillon Bay Utilities)

  Ctrl-C stops the app, the fakes and the database; the data stays in .data/.
`);

  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    say('stopping');
    await app.stop().catch(() => undefined);
    await fakes?.stop().catch(() => undefined);
    await db.stopDatabase().catch(() => undefined);
    process.exit(0);
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err) => {
  console.error(`[titrata] start failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
