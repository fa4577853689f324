// CLI: tsx fakes/payments/main.ts — the payment API fake on PAYMENTS_PORT (8091), sending
// webhooks to PAYMENTS_WEBHOOK_URL signed with PAYMENTS_WEBHOOK_SECRET.
import { envInt } from '../common.js';
import { DEFAULT_WEBHOOK_SECRET, startPaymentsFake } from './server.js';

const fake = await startPaymentsFake({
  port: envInt('PAYMENTS_PORT', 8091),
  host: process.env.FAKES_HOST || '127.0.0.1',
  // Set PAYMENTS_WEBHOOK_URL to an empty string to store events without sending them.
  webhookUrl: process.env.PAYMENTS_WEBHOOK_URL ?? 'http://127.0.0.1:8080/api/v1/payments/webhook',
  webhookSecret: process.env.PAYMENTS_WEBHOOK_SECRET || DEFAULT_WEBHOOK_SECRET,
  publicUrl: process.env.PAYMENTS_PUBLIC_URL || undefined,
  webhookRetry: {
    attempts: envInt('PAYMENTS_WEBHOOK_ATTEMPTS', 6),
    baseDelayMs: envInt('PAYMENTS_WEBHOOK_RETRY_MS', 1000),
  },
});
const webhookUrl = process.env.PAYMENTS_WEBHOOK_URL ?? 'http://127.0.0.1:8080/api/v1/payments/webhook';
console.log(`payments fake: API and pay pages on ${fake.url}, webhooks ${webhookUrl ? `to ${webhookUrl}` : 'off'}`);

let stopping = false;
const stop = async () => {
  if (stopping) return;
  stopping = true;
  await fake.close();
  process.exit(0);
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
