// The hosted pay page: our own plain design, self-contained (one same-origin stylesheet, no
// scripts at all), so it works under a strict Content-Security-Policy. Every value shown came
// from the product's request and is escaped.
import { escapeHtml as e } from '../common.js';
import { formatAmount, TEST_CARD_NUMBERS } from './state.js';
import type { CheckoutSession, LineItem } from './types.js';

export const PAY_CSS = `
*, *::before, *::after { box-sizing: border-box; }
body { margin: 0; font: 16px/1.5 system-ui, -apple-system, "Segoe UI", sans-serif; color: #1b2430; background: #eef2f5; }
main { max-width: 28rem; margin: 3rem auto; padding: 2rem; background: #fff; border: 1px solid #d3dae1; border-radius: 8px; }
.test-mode { display: inline-block; margin: 0 0 1rem; padding: .1rem .5rem; font-size: .8rem; font-weight: 600; letter-spacing: .04em; color: #7a4b00; background: #ffefc7; border-radius: 4px; }
h1 { font-size: 1.25rem; margin: 0 0 .25rem; }
.total { font-size: 2rem; font-weight: 650; margin: 0 0 1rem; }
table { width: 100%; border-collapse: collapse; margin: 0 0 1.5rem; font-size: .95rem; }
td { padding: .35rem 0; border-bottom: 1px solid #e5e9ed; vertical-align: top; }
td.amount { text-align: right; white-space: nowrap; padding-left: 1rem; }
label { display: block; font-weight: 600; margin: 0 0 .35rem; }
input { width: 100%; font: inherit; padding: .6rem .7rem; border: 1px solid #9aa5b1; border-radius: 6px; letter-spacing: .05em; }
input:focus { outline: 3px solid #86b7fe; outline-offset: 1px; }
.hint { font-size: .85rem; color: #53606d; margin: .35rem 0 1.25rem; }
.buttons { display: flex; gap: .75rem; }
button { font: inherit; font-weight: 600; padding: .65rem 1.2rem; border-radius: 6px; border: 1px solid transparent; cursor: pointer; }
button.pay { flex: 1; background: #1f5fbf; color: #fff; }
button.pay:hover { background: #184c99; }
button.cancel { background: #fff; color: #1b2430; border-color: #9aa5b1; }
button:focus-visible { outline: 3px solid #86b7fe; outline-offset: 2px; }
.error { padding: .75rem 1rem; margin: 0 0 1.25rem; color: #8a1c1c; background: #fdecec; border: 1px solid #f1b5b5; border-radius: 6px; }
.notice { padding: .75rem 1rem; margin: 0 0 1rem; background: #eef6ee; border: 1px solid #b9dab9; border-radius: 6px; }
details { margin-top: 1.5rem; font-size: .85rem; color: #53606d; }
code { font-size: .85rem; }
a { color: #1f5fbf; }
`;

function layout(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex">
<title>${e(title)}</title>
<link rel="stylesheet" href="/pay/assets/pay.css">
</head>
<body>
<main>
<p class="test-mode">TEST MODE — no real money moves</p>
${body}
</main>
</body>
</html>`;
}

export interface PayFormView {
  session: CheckoutSession;
  items: LineItem[];
  email: string | null;
  error?: string;
}

export function renderPayForm({ session, items, email, error }: PayFormView): string {
  const total = formatAmount(session.amount_total, session.currency);
  const rows = items
    .map(
      (item) =>
        `<tr><td>${e(item.description)}${item.quantity > 1 ? ` × ${item.quantity}` : ''}</td><td class="amount">${e(formatAmount(item.amount_total, item.currency))}</td></tr>`,
    )
    .join('\n');
  const id = encodeURIComponent(session.id);
  return layout(
    `Pay ${total}`,
    `<h1>Pay ${e(items.length === 1 ? items[0].description : 'your order')}</h1>
<p class="total">${e(total)}</p>
${email ? `<p class="hint">Receipt to ${e(email)}</p>` : ''}
<table><tbody>${rows}</tbody></table>
${error ? `<div class="error" role="alert" id="card-error">${e(error)}</div>` : ''}
<form method="post" action="/pay/${id}">
  <label for="card_number">Card number</label>
  <input id="card_number" name="card_number" type="text" inputmode="numeric" autocomplete="cc-number"
    placeholder="4242 4242 4242 4242" maxlength="23" required${error ? ' aria-describedby="card-error" aria-invalid="true"' : ''} autofocus>
  <p class="hint">Test cards only. Expiry and security code are not asked for.</p>
  <div class="buttons">
    <button class="pay" type="submit" name="action" value="pay">Pay ${e(total)}</button>
    ${session.cancel_url ? '<button class="cancel" type="submit" name="action" value="cancel" formnovalidate>Cancel</button>' : ''}
  </div>
</form>
<details>
  <summary>Test card numbers</summary>
  <ul>
    <li><code>4242 4242 4242 4242</code> succeeds</li>
    <li><code>4000 0000 0000 0002</code> is declined</li>
    <li><code>4000 0000 0000 9995</code> is declined: insufficient funds</li>
    <li>also: ${TEST_CARD_NUMBERS.filter((n) => !['4242424242424242', '4000000000000002', '4000000000009995'].includes(n))
      .map((n) => `<code>${e(n)}</code>`)
      .join(', ')}</li>
  </ul>
</details>`,
  );
}

export function renderMessage(title: string, message: string, link?: { href: string; text: string }): string {
  const safeLink = link && /^https?:\/\//i.test(link.href) ? `<p><a href="${e(link.href)}">${e(link.text)}</a></p>` : '';
  return layout(title, `<h1>${e(title)}</h1>\n<p class="notice">${e(message)}</p>\n${safeLink}`);
}
