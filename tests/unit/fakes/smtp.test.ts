import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import nodemailer from 'nodemailer';
import { startSmtpFake } from '../../../fakes/smtp/server.js';
import type { SmtpFakeHandle } from '../../../fakes/smtp/server.js';

let fake: SmtpFakeHandle;
let mailbox: string;

function transport() {
  // Plain SMTP: the fake offers no STARTTLS and needs no login.
  return nodemailer.createTransport({ host: '127.0.0.1', port: fake.smtpPort, secure: false, ignoreTLS: true });
}

const pdfBytes = Buffer.from('%PDF-1.4\n%\xe2\xe3\xcf\xd3\n1 0 obj <<>> endobj\ntrailer <<>>\n%%EOF\n', 'binary');

beforeAll(async () => {
  fake = await startSmtpFake({ smtpPort: 0, mailboxPort: 0 });
  mailbox = `http://127.0.0.1:${fake.mailboxPort}`;
});

afterAll(async () => {
  await fake.close();
});

beforeEach(async () => {
  await fetch(`${mailbox}/messages`, { method: 'DELETE' });
  fake.rejectWith(null);
  await fake.resumeSmtp();
});

describe('SMTP fake', () => {
  it('reports the real ports when asked for port 0', () => {
    expect(fake.smtpPort).toBeGreaterThan(0);
    expect(fake.mailboxPort).toBeGreaterThan(0);
    expect(fake.smtpPort).not.toBe(fake.mailboxPort);
  });

  it('stores a message sent with nodemailer and lists it over HTTP, attachment included', async () => {
    const info = await transport().sendMail({
      from: '"Titrata Lab" <lab@titrata.test>',
      to: ['regulator@state.test', 'Officer <officer@utility.test>'],
      cc: 'qa@titrata.test',
      bcc: 'archive@titrata.test',
      subject: 'Exceedance notice — Outfall 001',
      text: 'Total alkalinity 18 mg/L as CaCO3 against a minimum of 20.',
      html: '<p>Total alkalinity <b>18 mg/L</b> as CaCO3 against a minimum of 20.</p>',
      attachments: [{ filename: 'notice.pdf', content: pdfBytes, contentType: 'application/pdf' }],
    });
    expect(info.accepted).toHaveLength(4);

    const list = await (await fetch(`${mailbox}/messages`)).json();
    expect(list).toHaveLength(1);
    const m = list[0];
    expect(m).toMatchObject({
      from: 'lab@titrata.test',
      to: ['regulator@state.test', 'officer@utility.test'],
      cc: ['qa@titrata.test'],
      subject: 'Exceedance notice — Outfall 001',
      text: expect.stringContaining('18 mg/L as CaCO3'),
      html: expect.stringContaining('<b>18 mg/L</b>'),
      attachments: [{ filename: 'notice.pdf', contentType: 'application/pdf', size: pdfBytes.length }],
    });
    expect(typeof m.id).toBe('string');
    expect(new Date(m.date).toString()).not.toBe('Invalid Date');
    // Bcc never appears in the headers, only in the envelope.
    expect(m.envelope.to).toEqual(expect.arrayContaining(['archive@titrata.test', 'regulator@state.test']));
    expect(m.attachments[0]).not.toHaveProperty('content');

    const detail = await (await fetch(`${mailbox}/messages/${m.id}`)).json();
    expect(Buffer.from(detail.attachments[0].content, 'base64').equals(pdfBytes)).toBe(true);
    expect(detail.headers.subject).toBe('Exceedance notice — Outfall 001');

    const raw = await fetch(`${mailbox}/messages/${m.id}/attachments/0`);
    expect(raw.status).toBe(200);
    expect(raw.headers.get('content-type')).toBe('application/pdf');
    expect(raw.headers.get('content-disposition')).toContain('notice.pdf');
    expect(Buffer.from(await raw.arrayBuffer()).equals(pdfBytes)).toBe(true);

    const source = await fetch(`${mailbox}/messages/${m.id}/raw`);
    expect(source.headers.get('content-type')).toContain('message/rfc822');
    expect(await source.text()).toContain('Subject: =?UTF-8?Q?Exceedance_notice');
  });

  it('filters by recipient, deletes, and answers 404 for unknown ids', async () => {
    const t = transport();
    await t.sendMail({ from: 'lab@titrata.test', to: 'a@utility.test', subject: 'one', text: '1' });
    await t.sendMail({ from: 'lab@titrata.test', to: 'b@utility.test', subject: 'two', text: '2' });
    const onlyB = await (await fetch(`${mailbox}/messages?to=B@utility.test`)).json();
    expect(onlyB.map((m: { subject: string }) => m.subject)).toEqual(['two']);
    const all = await (await fetch(`${mailbox}/messages`)).json();
    expect(all.map((m: { subject: string }) => m.subject)).toEqual(['one', 'two']);

    expect((await fetch(`${mailbox}/messages/nope`)).status).toBe(404);
    expect((await fetch(`${mailbox}/messages/${all[0].id}/attachments/0`)).status).toBe(404);

    expect((await fetch(`${mailbox}/messages`, { method: 'DELETE' })).status).toBe(204);
    expect(await (await fetch(`${mailbox}/messages`)).json()).toEqual([]);
  });

  it('escapes message content on the HTML index page', async () => {
    await transport().sendMail({
      from: 'lab@titrata.test',
      to: 'x@utility.test',
      subject: '<script>alert(1)</script> & "quotes"',
      text: 'hi',
      html: '<img src=x onerror=alert(1)>',
    });
    const page = await fetch(`${mailbox}/`);
    const html = await page.text();
    expect(page.headers.get('content-security-policy')).toContain("default-src 'none'");
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;quotes&quot;');
    expect(html).not.toContain('<script>');

    const [m] = fake.messages();
    const view = await (await fetch(`${mailbox}/view/${m.id}`)).text();
    expect(view).not.toContain('<script>');
    expect(view).toContain('<iframe sandbox');
    const body = await fetch(`${mailbox}/messages/${m.id}/html`);
    expect(body.headers.get('content-security-policy')).toMatch(/^sandbox/);
  });

  it('can be suspended (connection refused) and resumed on the same port, keeping its messages', async () => {
    await transport().sendMail({ from: 'lab@titrata.test', to: 'x@utility.test', subject: 'before', text: '.' });
    const port = fake.smtpPort;
    const res = await fetch(`${mailbox}/_fake/smtp/suspend`, { method: 'POST' });
    expect(res.status).toBe(200);
    await expect(transport().sendMail({ from: 'lab@titrata.test', to: 'x@utility.test', subject: 'during', text: '.' })).rejects.toMatchObject({
      code: expect.stringMatching(/ECONNREFUSED|ESOCKET|ECONNECTION/),
    });
    expect((await (await fetch(`${mailbox}/_fake/health`)).json()).smtp).toBe('suspended');

    await fetch(`${mailbox}/_fake/smtp/resume`, { method: 'POST' });
    expect(fake.smtpPort).toBe(port);
    await transport().sendMail({ from: 'lab@titrata.test', to: 'x@utility.test', subject: 'after', text: '.' });
    expect(fake.messages().map((m) => m.subject)).toEqual(['before', 'after']);
  });

  it('can answer with a transient SMTP failure until cleared', async () => {
    const set = await fetch(`${mailbox}/_fake/smtp/reject`, {
      method: 'PUT',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ code: 451, message: 'Try again later' }),
    });
    expect(set.status).toBe(200);
    await expect(transport().sendMail({ from: 'lab@titrata.test', to: 'x@utility.test', subject: 's', text: '.' })).rejects.toMatchObject({
      responseCode: 451,
    });
    await fetch(`${mailbox}/_fake/smtp/reject`, { method: 'DELETE' });
    await transport().sendMail({ from: 'lab@titrata.test', to: 'x@utility.test', subject: 's', text: '.' });
    expect(fake.messages()).toHaveLength(1);
  });

  it('waitForMessage resolves when a matching message arrives', async () => {
    const waiting = fake.waitForMessage((m) => m.subject === 'late', 2000);
    await transport().sendMail({ from: 'lab@titrata.test', to: 'x@utility.test', subject: 'late', text: '.' });
    await expect(waiting).resolves.toMatchObject({ subject: 'late', to: ['x@utility.test'] });
  });
});
