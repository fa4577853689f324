import type { Config } from '../config.js';

/** Starts the SMTP capture with its mailbox and the payment API stand-in on their configured ports. */
export async function startFakes(config: Config, log: (m: string) => void = () => undefined) {
  const { startSmtpFake } = await import('../../fakes/smtp/server.js');
  const { startPaymentsFake } = await import('../../fakes/payments/server.js');
  const smtp = await startSmtpFake({ smtpPort: config.SMTP_PORT, mailboxPort: config.MAILBOX_PORT });
  const payments = await startPaymentsFake({
    port: config.PAYMENTS_PORT,
    webhookUrl: `http://127.0.0.1:${config.PORT}/api/v1/payments/webhook`,
    webhookSecret: config.PAYMENTS_WEBHOOK_SECRET,
  });
  log(`fakes: SMTP 127.0.0.1:${smtp.smtpPort}, mailbox :${smtp.mailboxPort}, payments :${payments.port}`);
  return {
    smtp,
    payments,
    async stop() {
      await Promise.allSettled([smtp.close(), payments.close()]);
    },
  };
}
