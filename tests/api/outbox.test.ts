import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startSmtpFake, type SmtpFakeHandle } from '../../fakes/smtp/server.js';
import { createMailer } from '../../server/integrations/mailer.js';
import { OutboxMessage } from '../../server/db/models/index.js';
import { backoffMs, deliverDue, enqueueMail } from '../../server/services/outbox.js';
import { apiTestApp } from '../setup/db.js';

let smtp: SmtpFakeHandle;
let ctx: ReturnType<typeof apiTestApp>;

beforeAll(async () => {
  smtp = await startSmtpFake({ smtpPort: 0, mailboxPort: 0 });
  ctx = apiTestApp({ SMTP_PORT: String(smtp.smtpPort) });
});
afterAll(async () => {
  await ctx.sequelize.close();
  await smtp.close();
});

const due = async () => OutboxMessage.update({ nextAttemptAt: new Date(Date.now() - 1000) }, { where: { status: 'pending' } });

describe('e-mail outbox', () => {
  it('delivers a queued message with its attachment', async () => {
    const mailer = createMailer(ctx.config);
    await enqueueMail({ dedupeKey: `test:${Date.now()}:a`, to: ['regulator@state.example'], subject: 'Queued notice', text: 'Body', attachments: [{ filename: 'r.pdf', contentType: 'application/pdf', content: Buffer.from('%PDF-1.4 test') }] });
    const r = await deliverDue(ctx.config, mailer);
    expect(r.sent).toBeGreaterThanOrEqual(1);
    const m = await smtp.waitForMessage((x) => x.subject === 'Queued notice');
    expect(m.to).toContain('regulator@state.example');
    expect(m.attachments[0]).toMatchObject({ filename: 'r.pdf', contentType: 'application/pdf' });
    mailer.close();
  });

  it('ignores a second enqueue of the same thing', async () => {
    const key = `test:${Date.now()}:dedupe`;
    const a = await enqueueMail({ dedupeKey: key, to: ['x@y.example'], subject: 's', text: 't' });
    const b = await enqueueMail({ dedupeKey: key, to: ['x@y.example'], subject: 's', text: 't' });
    expect(b.id).toBe(a.id);
    expect(await OutboxMessage.count({ where: { dedupeKey: key } })).toBe(1);
  });

  it('keeps a message while SMTP is down and sends it exactly once when it returns', async () => {
    const mailer = createMailer(ctx.config);
    await deliverDue(ctx.config, mailer); // drain earlier messages
    await smtp.suspendSmtp();
    const msg = await enqueueMail({ dedupeKey: `test:${Date.now()}:outage`, to: ['ops@plant.example'], subject: 'During the outage', text: 'Body' });
    const failed = await deliverDue(ctx.config, mailer);
    expect(failed.failed).toBe(1);
    await msg.reload();
    expect(msg.status).toBe('pending');
    expect(msg.attempts).toBe(1);
    expect(msg.nextAttemptAt.getTime()).toBeGreaterThan(Date.now());

    await smtp.resumeSmtp();
    await due();
    const ok = await deliverDue(ctx.config, mailer);
    expect(ok.sent).toBe(1);
    await due();
    expect((await deliverDue(ctx.config, mailer)).sent).toBe(0);
    expect(smtp.messages().filter((m) => m.subject === 'During the outage')).toHaveLength(1);
    mailer.close();
  });

  it('backs off 2, 4, 8 … seconds up to five minutes (common practice)', () => {
    expect([1, 2, 3].map(backoffMs)).toEqual([2000, 4000, 8000]);
    expect(backoffMs(30)).toBe(300_000);
  });
});
