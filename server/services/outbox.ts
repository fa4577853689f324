import { Op, QueryTypes, type Transaction } from 'sequelize';
import type { Transporter } from 'nodemailer';
import type { Config } from '../config.js';
import { sequelize } from '../db/current.js';
import { OutboxAttachment, OutboxMessage } from '../db/models/index.js';

export interface OutgoingMail {
  /** Unique per thing being sent (`notice:12`, `report:7:v2`): enqueuing it again changes nothing. */
  dedupeKey: string;
  organizationId?: number | null;
  to: string[];
  cc?: string[];
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; contentType: string; content: Buffer }[];
}

/**
 * Saves a message in the caller's transaction; the sender job delivers it later. A record
 * and its e-mail therefore commit together, and a dead SMTP server loses nothing.
 */
export async function enqueueMail(mail: OutgoingMail, transaction?: Transaction): Promise<OutboxMessage> {
  const existing = await OutboxMessage.findOne({ where: { dedupeKey: mail.dedupeKey }, transaction });
  if (existing) return existing;
  const msg = await OutboxMessage.create(
    {
      dedupeKey: mail.dedupeKey,
      organizationId: mail.organizationId ?? null,
      toAddresses: mail.to,
      ccAddresses: mail.cc ?? null,
      subject: mail.subject,
      textBody: mail.text,
      htmlBody: mail.html ?? null,
      nextAttemptAt: new Date(),
    },
    { transaction },
  );
  for (const a of mail.attachments ?? []) {
    await OutboxAttachment.create({ messageId: msg.id, filename: a.filename, contentType: a.contentType, content: a.content }, { transaction });
  }
  return msg;
}

type DeliveredHook = (msg: OutboxMessage) => Promise<void>;
const deliveredHooks: DeliveredHook[] = [];

/** Registers work to do once a message has been accepted by the SMTP server (e.g. mark a notice delivered). */
export function onDelivered(hook: DeliveredHook) {
  deliveredHooks.push(hook);
}

/** Retry delay after `attempts` failures: 2, 4, 8 … seconds, at most five minutes. */
export function backoffMs(attempts: number): number {
  return Math.min(2 ** attempts * 1000, 5 * 60_000);
}

const CLAIM_SECONDS = 120;

/**
 * Claims due messages with `SELECT … FOR UPDATE SKIP LOCKED`, so several app processes can
 * share the outbox without sending anything twice; a claim that outlives its process
 * expires after two minutes and is taken again.
 */
async function claim(limit: number): Promise<string[]> {
  return sequelize().transaction(async (transaction) => {
    const rows = await sequelize().query<{ id: string }>(
      `SELECT id FROM outbox_messages
        WHERE (status = 'pending' AND next_attempt_at <= NOW(3))
           OR (status = 'sending' AND locked_until < NOW(3))
        ORDER BY id LIMIT :limit FOR UPDATE SKIP LOCKED`,
      { type: QueryTypes.SELECT, replacements: { limit }, transaction },
    );
    const ids = rows.map((r) => String(r.id));
    if (ids.length) {
      await OutboxMessage.update(
        { status: 'sending', lockedUntil: new Date(Date.now() + CLAIM_SECONDS * 1000) },
        { where: { id: { [Op.in]: ids } }, transaction },
      );
    }
    return ids;
  });
}

/** Permanent SMTP refusals (5xx) stop retrying; anything else waits and tries again. */
function permanent(err: unknown): boolean {
  const code = (err as { responseCode?: number }).responseCode;
  return typeof code === 'number' && code >= 500 && code < 600;
}

/** Sends what is due, once; returns how many were sent and how many failed this round. */
export async function deliverDue(config: Config, mailer: Transporter, limit = 20): Promise<{ sent: number; failed: number }> {
  const ids = await claim(limit);
  let sent = 0;
  let failed = 0;
  for (const id of ids) {
    const msg = await OutboxMessage.findByPk(id, { include: [{ model: OutboxAttachment, as: 'attachments' }] });
    if (!msg) continue;
    const attachments = ((msg as unknown as { attachments?: OutboxAttachment[] }).attachments ?? []).map((a) => ({ filename: a.filename, contentType: a.contentType, content: a.content }));
    try {
      const info = await mailer.sendMail({
        from: config.MAIL_FROM,
        to: msg.toAddresses,
        cc: msg.ccAddresses ?? undefined,
        subject: msg.subject,
        text: msg.textBody,
        html: msg.htmlBody ?? undefined,
        attachments,
        // A stable Message-ID lets a receiving server drop a duplicate after a crash between send and mark.
        messageId: `<outbox-${msg.id}@titrata.example>`,
      });
      await msg.update({ status: 'sent', sentAt: new Date(), messageId: info.messageId ?? null, lockedUntil: null, lastError: null, attempts: msg.attempts + 1 });
      sent++;
      for (const hook of deliveredHooks) await hook(msg).catch(() => undefined);
    } catch (err) {
      const attempts = msg.attempts + 1;
      await msg.update({
        status: permanent(err) ? 'failed' : 'pending',
        attempts,
        nextAttemptAt: new Date(Date.now() + backoffMs(attempts)),
        lockedUntil: null,
        lastError: String((err as Error).message ?? err).slice(0, 1000),
      });
      failed++;
    }
  }
  return { sent, failed };
}
