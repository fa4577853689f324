// CLI: tsx fakes/smtp/main.ts — SMTP on SMTP_PORT (2525), mailbox HTTP on MAILBOX_PORT (8026).
import { envInt } from '../common.js';
import { startSmtpFake } from './server.js';

const fake = await startSmtpFake({
  smtpPort: envInt('SMTP_PORT', 2525),
  mailboxPort: envInt('MAILBOX_PORT', 8026),
  host: process.env.FAKES_HOST || '127.0.0.1',
});
console.log(`smtp fake: SMTP on ${fake.host}:${fake.smtpPort}, mailbox on http://${fake.host}:${fake.mailboxPort}/`);

let stopping = false;
const stop = async () => {
  if (stopping) return;
  stopping = true;
  await fake.close();
  process.exit(0);
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
