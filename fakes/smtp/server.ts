// A local SMTP server that keeps every message it accepts in memory, and an HTTP mailbox
// (Express) that lists them, so demos and tests can read what the product sent.
import { SMTPServer } from 'smtp-server';
import type { SMTPServerDataStream, SMTPServerSession } from 'smtp-server';
import { simpleParser } from 'mailparser';
import type { AddressObject, ParsedMail } from 'mailparser';
import express from 'express';
import type { NextFunction, Request, Response } from 'express';
import type { AddressInfo } from 'node:net';
import { listenHttp } from '../common.js';
import type { Listening } from '../common.js';
import { renderIndexPage, renderMessagePage } from './pages.js';

export interface SmtpFakeOptions {
  /** SMTP listener port; 0 picks a free one. */
  smtpPort: number;
  /** HTTP mailbox port; 0 picks a free one. */
  mailboxPort: number;
  host?: string;
  /** Largest message accepted, advertised with the SIZE extension (RFC 1870). */
  maxMessageBytes?: number;
}

export interface StoredAttachment {
  filename: string | null;
  contentType: string;
  size: number;
  contentId: string | null;
  disposition: string | null;
  checksum: string | null;
  content: Buffer;
}

export interface StoredMessage {
  id: string;
  /** Address of the From header (RFC 5322 section 3.6.2), or the envelope sender when absent. */
  from: string | null;
  fromName: string | null;
  to: string[];
  cc: string[];
  bcc: string[];
  replyTo: string[];
  subject: string | null;
  /** The Date header as ISO 8601, or the time received when the header is missing. */
  date: string;
  receivedAt: string;
  messageId: string | null;
  text: string | null;
  html: string | null;
  headers: Record<string, string>;
  /** What the client said in MAIL FROM and RCPT TO (RFC 5321 section 3.3); Bcc shows only here. */
  envelope: { from: string | null; to: string[] };
  attachments: StoredAttachment[];
  raw: Buffer;
}

export interface MessageSummary {
  id: string;
  from: string | null;
  to: string[];
  cc: string[];
  subject: string | null;
  date: string;
  text: string | null;
  html: string | null;
  envelope: { from: string | null; to: string[] };
  attachments: { filename: string | null; contentType: string; size: number }[];
}

export interface MessageDetail extends Omit<MessageSummary, 'attachments'> {
  fromName: string | null;
  bcc: string[];
  replyTo: string[];
  receivedAt: string;
  messageId: string | null;
  headers: Record<string, string>;
  attachments: {
    filename: string | null;
    contentType: string;
    size: number;
    contentId: string | null;
    disposition: string | null;
    checksum: string | null;
    /** base64 */
    content: string;
  }[];
}

export interface SmtpFakeHandle {
  smtpPort: number;
  mailboxPort: number;
  host: string;
  close(): Promise<void>;
  /** The stored messages, oldest first, in the shape GET /messages returns. */
  messages(): MessageSummary[];
  /** The full stored messages, raw bytes and attachment content included. */
  storedMessages(): StoredMessage[];
  clear(): void;
  /** Resolves with the first stored message matching `predicate`, waiting for it if needed. */
  waitForMessage(predicate?: (m: MessageSummary) => boolean, timeoutMs?: number): Promise<MessageSummary>;
  /** Stops the SMTP listener but keeps the mailbox and its messages (to test a mail outage). */
  suspendSmtp(): Promise<void>;
  /** Starts the SMTP listener again on the same port. */
  resumeSmtp(): Promise<void>;
  /** Answers MAIL FROM with this reply (e.g. 451 temporary, 550 permanent) until cleared with null. */
  rejectWith(reply: { code: number; message?: string } | null): void;
}

const DEFAULT_MAX_BYTES = 25 * 1024 * 1024;

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
  if (!field) return [];
  const list = Array.isArray(field) ? field : [field];
  const out: string[] = [];
  // Groups (RFC 5322 section 3.4) hold their members one level down.
  const walk = (entries: AddressObject['value']) => {
    for (const entry of entries) {
      if (entry.group) walk(entry.group);
      else if (entry.address) out.push(entry.address);
    }
  };
  for (const item of list) walk(item.value);
  return out;
}

function headerMap(parsed: ParsedMail): Record<string, string> {
  // Decoded header values (RFC 2047 encoded words undone by mailparser); a repeated header
  // keeps its first value; structured values fall back to the unfolded raw line (RFC 5322 2.2.3).
  const out: Record<string, string> = {};
  for (const { key, line } of parsed.headerLines) {
    if (key in out) continue;
    const value = parsed.headers.get(key);
    const first = Array.isArray(value) ? value[0] : value;
    if (typeof first === 'string') out[key] = first;
    else if (first instanceof Date) out[key] = first.toISOString();
    else if (first && typeof first === 'object' && 'text' in first && typeof first.text === 'string') out[key] = first.text;
    else out[key] = line.slice(line.indexOf(':') + 1).replace(/\r?\n[ \t]+/g, ' ').trim();
  }
  return out;
}

export function summarize(m: StoredMessage): MessageSummary {
  return {
    id: m.id,
    from: m.from,
    to: m.to,
    cc: m.cc,
    subject: m.subject,
    date: m.date,
    text: m.text,
    html: m.html,
    envelope: m.envelope,
    attachments: m.attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, size: a.size })),
  };
}

function detail(m: StoredMessage): MessageDetail {
  return {
    ...summarize(m),
    fromName: m.fromName,
    bcc: m.bcc,
    replyTo: m.replyTo,
    receivedAt: m.receivedAt,
    messageId: m.messageId,
    headers: m.headers,
    attachments: m.attachments.map((a) => ({
      filename: a.filename,
      contentType: a.contentType,
      size: a.size,
      contentId: a.contentId,
      disposition: a.disposition,
      checksum: a.checksum,
      content: a.content.toString('base64'),
    })),
  };
}

function smtpError(code: number, message: string): Error {
  // smtp-server sends err.responseCode as the reply code.
  return Object.assign(new Error(message), { responseCode: code });
}

export async function startSmtpFake(options: SmtpFakeOptions): Promise<SmtpFakeHandle> {
  const host = options.host ?? '127.0.0.1';
  const maxBytes = options.maxMessageBytes ?? DEFAULT_MAX_BYTES;
  const store: StoredMessage[] = [];
  const waiters = new Set<() => void>();
  let nextId = 1;
  let reject: { code: number; message: string } | null = null;

  async function accept(raw: Buffer, session: SMTPServerSession): Promise<string> {
    // keepCidLinks: show the HTML as it was sent instead of inlining images as data: URLs.
    const parsed = await simpleParser(raw, { keepCidLinks: true });
    const receivedAt = new Date();
    const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address || null : null;
    const fromEntry = parsed.from?.value.find((v) => v.address);
    const message: StoredMessage = {
      id: String(nextId++),
      from: fromEntry?.address ?? envelopeFrom,
      fromName: fromEntry?.name || null,
      to: addresses(parsed.to),
      cc: addresses(parsed.cc),
      bcc: addresses(parsed.bcc),
      replyTo: addresses(parsed.replyTo),
      subject: parsed.subject ?? null,
      date: (parsed.date && !Number.isNaN(parsed.date.getTime()) ? parsed.date : receivedAt).toISOString(),
      receivedAt: receivedAt.toISOString(),
      messageId: parsed.messageId ?? null,
      text: parsed.text ?? null,
      html: typeof parsed.html === 'string' ? parsed.html : null,
      headers: headerMap(parsed),
      envelope: { from: envelopeFrom, to: session.envelope.rcptTo.map((r) => r.address) },
      attachments: parsed.attachments.map((a) => ({
        filename: a.filename ?? null,
        contentType: a.contentType,
        size: a.size,
        contentId: a.contentId ?? null,
        disposition: a.contentDisposition ?? null,
        checksum: a.checksum ?? null,
        content: a.content,
      })),
      raw,
    };
    store.push(message);
    for (const wake of [...waiters]) wake();
    return message.id;
  }

  function onData(stream: SMTPServerDataStream, session: SMTPServerSession, callback: (err?: Error | null, message?: string) => void) {
    const chunks: Buffer[] = [];
    stream.on('data', (chunk: Buffer) => chunks.push(chunk));
    stream.on('error', (err) => callback(err));
    stream.on('end', () => {
      if (stream.sizeExceeded) {
        // RFC 1870 section 6.3: 552 for a message over the advertised SIZE.
        return callback(smtpError(552, `Message exceeds the fixed maximum message size of ${maxBytes} bytes`));
      }
      accept(Buffer.concat(chunks), session).then(
        (id) => callback(null, `Message queued as ${id}`),
        // 554 transaction failed (RFC 5321 section 4.2.3): unparseable input is a permanent failure.
        (err: Error) => callback(smtpError(554, `Message could not be parsed: ${err.message}`)),
      );
    });
  }

  function makeSmtp(): SMTPServer {
    return new SMTPServer({
      name: 'smtp.titrata.test',
      banner: 'Titrata SMTP fake',
      // No certificate of our own: plain SMTP only, the client must not try STARTTLS.
      disabledCommands: ['STARTTLS'],
      authOptional: true,
      // Accept AUTH over plain text too, so an app configured with credentials still works locally.
      allowInsecureAuth: true,
      disableReverseLookup: true,
      size: maxBytes,
      logger: false,
      closeTimeout: 1000,
      onAuth(auth, _session, callback) {
        callback(null, { user: auth.username ?? 'anonymous' });
      },
      onMailFrom(_address, _session, callback) {
        if (reject) return callback(smtpError(reject.code, reject.message));
        callback();
      },
      onData,
    });
  }

  let smtp = makeSmtp();
  let smtpRunning = false;
  let smtpPort = options.smtpPort;

  function listenSmtp(port: number): Promise<number> {
    return new Promise((resolve, rejectListen) => {
      const onError = (err: Error) => rejectListen(err);
      smtp.server.once('error', onError);
      smtp.listen(port, host, () => {
        smtp.server.off('error', onError);
        // Later socket errors must not crash the process; the SMTP client sees them anyway.
        smtp.on('error', () => {});
        smtpRunning = true;
        resolve((smtp.server.address() as AddressInfo).port);
      });
    });
  }

  function closeSmtp(): Promise<void> {
    if (!smtpRunning) return Promise.resolve();
    smtpRunning = false;
    return new Promise((resolve) => smtp.close(() => resolve()));
  }

  smtpPort = await listenSmtp(smtpPort);

  const app = express();
  app.disable('x-powered-by');
  app.use(express.json());

  const find = (req: Request): StoredMessage | undefined => store.find((m) => m.id === req.params.id);

  app.get('/', (_req, res) => {
    res.set('Content-Security-Policy', "default-src 'none'; style-src 'unsafe-inline'; frame-ancestors 'none'");
    res.type('html').send(renderIndexPage(store.map(summarize).reverse()));
  });

  app.get('/messages', (req, res) => {
    const to = typeof req.query.to === 'string' ? req.query.to.toLowerCase() : null;
    const subject = typeof req.query.subject === 'string' ? req.query.subject.toLowerCase() : null;
    const list = store.filter((m) => {
      if (to && ![...m.to, ...m.cc, ...m.bcc, ...m.envelope.to].some((a) => a.toLowerCase() === to)) return false;
      if (subject && !(m.subject ?? '').toLowerCase().includes(subject)) return false;
      return true;
    });
    res.json(list.map(summarize));
  });

  app.delete('/messages', (_req, res) => {
    store.length = 0;
    res.status(204).end();
  });

  app.get('/messages/:id', (req, res) => {
    const m = find(req);
    if (!m) return res.status(404).json({ error: 'message not found' });
    res.json(detail(m));
  });

  app.delete('/messages/:id', (req, res) => {
    const index = store.findIndex((m) => m.id === req.params.id);
    if (index < 0) return res.status(404).json({ error: 'message not found' });
    store.splice(index, 1);
    res.status(204).end();
  });

  app.get('/messages/:id/raw', (req, res) => {
    const m = find(req);
    if (!m) return res.status(404).json({ error: 'message not found' });
    // RFC 2046 section 5.2.1: a whole message is message/rfc822.
    res.type('message/rfc822').send(m.raw);
  });

  app.get('/messages/:id/html', (req, res) => {
    const m = find(req);
    if (!m) return res.status(404).json({ error: 'message not found' });
    if (m.html === null) return res.status(404).json({ error: 'message has no HTML part' });
    // The HTML is whatever the sender wrote: a CSP sandbox gives it an opaque origin and no scripts.
    res.set('Content-Security-Policy', "sandbox; default-src 'none'; img-src data: cid:; style-src 'unsafe-inline'; frame-ancestors 'self'");
    res.set('X-Content-Type-Options', 'nosniff');
    res.type('html').send(m.html);
  });

  app.get('/messages/:id/attachments/:index', (req, res) => {
    const m = find(req);
    const index = Number(req.params.index);
    const attachment = m && Number.isInteger(index) ? m.attachments[index] : undefined;
    if (!m || !attachment) return res.status(404).json({ error: 'attachment not found' });
    // Downloaded, never rendered inline: an attachment could be HTML served from this origin.
    res.attachment(attachment.filename ?? `attachment-${index}`);
    res.set('Content-Type', attachment.contentType);
    res.set('X-Content-Type-Options', 'nosniff');
    res.send(attachment.content);
  });

  app.get('/view/:id', (req, res) => {
    const m = find(req);
    if (!m) return res.status(404).type('text').send('message not found');
    res.set('Content-Security-Policy', "default-src 'none'; style-src 'unsafe-inline'; frame-src 'self'; frame-ancestors 'none'");
    res.type('html').send(renderMessagePage(detail(m)));
  });

  // Test controls, for tests that run the fake in another process.
  app.get('/_fake/health', (_req, res) => {
    res.json({ smtp: smtpRunning ? 'up' : 'suspended', smtpPort, rejecting: reject, messages: store.length });
  });
  app.post('/_fake/smtp/suspend', async (_req, res) => {
    await handle.suspendSmtp();
    res.json({ smtp: 'suspended' });
  });
  app.post('/_fake/smtp/resume', async (_req, res) => {
    await handle.resumeSmtp();
    res.json({ smtp: 'up', smtpPort });
  });
  app.put('/_fake/smtp/reject', (req, res) => {
    const code = Number(req.body?.code);
    // Only 4xx (transient) and 5xx (permanent) replies are failures (RFC 5321 section 4.2.1).
    if (!Number.isInteger(code) || code < 400 || code > 599) {
      return res.status(400).json({ error: 'code must be an SMTP reply code from 400 to 599' });
    }
    handle.rejectWith({ code, message: typeof req.body?.message === 'string' ? req.body.message : undefined });
    res.json({ rejecting: reject });
  });
  app.delete('/_fake/smtp/reject', (_req, res) => {
    handle.rejectWith(null);
    res.status(204).end();
  });

  app.use((_req: Request, res: Response) => {
    res.status(404).json({ error: 'not found' });
  });
  app.use((err: Error & { status?: number }, _req: Request, res: Response, _next: NextFunction) => {
    res.status(err.status && err.status >= 400 && err.status < 500 ? err.status : 500).json({ error: err.message });
  });

  let mailbox: Listening;
  try {
    mailbox = await listenHttp(app, options.mailboxPort, host);
  } catch (err) {
    await closeSmtp();
    throw err;
  }

  const handle: SmtpFakeHandle = {
    smtpPort,
    mailboxPort: mailbox.port,
    host,
    async close() {
      for (const wake of [...waiters]) wake();
      await Promise.all([closeSmtp(), mailbox.close()]);
    },
    messages: () => store.map(summarize),
    storedMessages: () => [...store],
    clear() {
      store.length = 0;
    },
    waitForMessage(predicate = () => true, timeoutMs = 5000) {
      return new Promise((resolve, rejectWait) => {
        const check = () => {
          const found = store.map(summarize).find(predicate);
          if (found) {
            cleanup();
            resolve(found);
          }
        };
        const timer = setTimeout(() => {
          cleanup();
          rejectWait(new Error(`no matching message within ${timeoutMs} ms`));
        }, timeoutMs);
        const cleanup = () => {
          clearTimeout(timer);
          waiters.delete(check);
        };
        waiters.add(check);
        check();
      });
    },
    async suspendSmtp() {
      await closeSmtp();
    },
    async resumeSmtp() {
      if (smtpRunning) return;
      smtp = makeSmtp();
      await listenSmtp(smtpPort);
    },
    rejectWith(reply) {
      reject = reply ? { code: reply.code, message: reply.message ?? (reply.code < 500 ? 'Try again later' : 'Rejected') } : null;
    },
  };
  return handle;
}
