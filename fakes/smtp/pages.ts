// The mailbox's demo pages. Every value comes from a message someone sent, so all of it is
// escaped, and the message's own HTML is only ever shown inside a sandboxed frame.
import { escapeHtml as e } from '../common.js';
import type { MessageDetail, MessageSummary } from './server.js';

const STYLE = `
  body { font: 15px/1.45 system-ui, sans-serif; margin: 2rem auto; max-width: 64rem; padding: 0 1rem; color: #1d2733; }
  table { border-collapse: collapse; width: 100%; }
  th, td { text-align: left; padding: .4rem .6rem; border-bottom: 1px solid #d5dbe1; vertical-align: top; }
  th { font-weight: 600; background: #f2f5f7; }
  pre { white-space: pre-wrap; background: #f7f9fa; padding: 1rem; border: 1px solid #d5dbe1; }
  iframe { width: 100%; height: 30rem; border: 1px solid #d5dbe1; }
  .muted { color: #5b6773; }
`;

function page(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${e(title)}</title><style>${STYLE}</style></head>
<body>${body}</body>
</html>`;
}

export function renderIndexPage(messages: MessageSummary[]): string {
  const rows = messages
    .map(
      (m) => `<tr>
  <td>${e(new Date(m.date).toISOString().replace('T', ' ').slice(0, 19))} UTC</td>
  <td>${e(m.from ?? '')}</td>
  <td>${e(m.to.join(', '))}</td>
  <td><a href="/view/${encodeURIComponent(m.id)}">${e(m.subject || '(no subject)')}</a></td>
  <td>${m.attachments.length || ''}</td>
</tr>`,
    )
    .join('\n');
  return page(
    'Mailbox (local SMTP fake)',
    `<h1>Mailbox</h1>
<p class="muted">Messages received by the local SMTP fake, newest first. Nothing here left this machine.</p>
${
  messages.length
    ? `<table><thead><tr><th scope="col">Date</th><th scope="col">From</th><th scope="col">To</th><th scope="col">Subject</th><th scope="col">Attachments</th></tr></thead><tbody>${rows}</tbody></table>`
    : '<p>No messages yet.</p>'
}`,
  );
}

export function renderMessagePage(m: MessageDetail): string {
  const id = encodeURIComponent(m.id);
  const attachments = m.attachments
    .map(
      (a, i) =>
        `<li><a href="/messages/${id}/attachments/${i}">${e(a.filename ?? `attachment ${i + 1}`)}</a> <span class="muted">${e(a.contentType)}, ${a.size} bytes</span></li>`,
    )
    .join('');
  return page(
    m.subject || '(no subject)',
    `<p><a href="/">← All messages</a></p>
<h1>${e(m.subject || '(no subject)')}</h1>
<table>
  <tr><th scope="row">From</th><td>${e(m.fromName ? `${m.fromName} <${m.from}>` : (m.from ?? ''))}</td></tr>
  <tr><th scope="row">To</th><td>${e(m.to.join(', '))}</td></tr>
  ${m.cc.length ? `<tr><th scope="row">Cc</th><td>${e(m.cc.join(', '))}</td></tr>` : ''}
  <tr><th scope="row">Envelope</th><td>${e(m.envelope.from ?? '<>')} → ${e(m.envelope.to.join(', '))}</td></tr>
  <tr><th scope="row">Date</th><td>${e(m.date)}</td></tr>
</table>
${attachments ? `<h2>Attachments</h2><ul>${attachments}</ul>` : ''}
${m.html !== null ? `<h2>HTML</h2><iframe sandbox title="HTML body" src="/messages/${id}/html"></iframe>` : ''}
<h2>Text</h2>
<pre>${e(m.text ?? '')}</pre>
<p><a href="/messages/${id}/raw">Raw message</a></p>`,
  );
}
