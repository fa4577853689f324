// Browser journeys for Billing (common practice for a hosted-payment flow): the utility's
// billing contact pays an invoice on the provider's hosted page and comes back to see it paid;
// the lab administrator issues a draft and keeps the price list.
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { openBrowser, screenshot } from './browser.js';
import { navLabels, signIn, signOut } from './helpers.js';

const baseUrl = inject('baseUrl');
const paymentsUrl = inject('paymentsUrl');
let b: Awaited<ReturnType<typeof openBrowser>>;
beforeAll(async () => {
  b = await openBrowser();
});
afterAll(() => b?.close());

describe('Billing: paying an invoice online', () => {
  it('lets the billing contact open an invoice, pay it on the hosted page, return and see it paid', async () => {
    const { page } = b;
    await signIn(page, baseUrl, 'billing@kestrelford.example');
    expect(await navLabels(page)).toContain('Billing');
    // Today: unpaid and overdue invoices
    const today = page.locator('[data-test="today-invoices"]');
    await today.getByText(/unpaid, \d+ overdue/).waitFor();
    await screenshot(page, 'billing-today-payer');

    await page.locator('nav[aria-label="Main"] [data-area="billing"]').click();
    const table = page.locator('[data-test="invoices-table"]');
    await table.locator('[data-state="open"]').first().waitFor();
    expect(await table.innerText()).toContain('Paid');
    expect(await table.innerText()).toContain('Overdue');
    await screenshot(page, 'billing-invoices-payer');

    // open the invoice awaiting payment
    await table.locator('tr', { has: page.locator('[data-state="open"]') }).first().getByRole('link').click();
    await page.locator('[data-test="invoice-lines"]').waitFor();
    const total = (await page.locator('[data-test="invoice-total"]').innerText()).trim();
    expect(total).toMatch(/^\$[\d,]+\.\d{2}$/);
    const invoiceUrl = page.url();
    await screenshot(page, 'billing-invoice-open');

    // Pay → the provider's hosted page (another origin)
    await page.locator('[data-test="pay"]').click();
    await page.waitForURL((u) => u.toString().startsWith(`${paymentsUrl}/pay/`));
    expect(await page.locator('body').innerText()).toContain(total);
    // a declined card first: the page says why and nothing is charged
    await page.fill('#card_number', '4000 0000 0000 0002');
    await page.getByRole('button', { name: /^Pay / }).click();
    await page.getByText(/declined/i).first().waitFor();
    await screenshot(page, 'billing-hosted-page-declined');
    // then the success card
    await page.fill('#card_number', '4242 4242 4242 4242');
    await screenshot(page, 'billing-hosted-page');
    await page.getByRole('button', { name: /^Pay / }).click();

    // back in the app: confirmed by the signed webhook
    await page.waitForURL((u) => u.toString().startsWith(invoiceUrl.split('?')[0]));
    await page.locator('[data-test="paid-message"]').waitFor({ timeout: 30_000 });
    expect(await page.locator('[data-test="invoice-state"]').innerText()).toContain('Paid');
    expect(await page.locator('[data-test="paid-message"]').innerText()).toContain(total);
    await page.locator('[data-test="receipt"]').waitFor();
    expect(await page.locator('[data-test="pay"]').count()).toBe(0);
    expect(await page.locator('[data-test="payment-error"]').count()).toBe(0);
    await screenshot(page, 'billing-invoice-paid');
    await signOut(page);
  });

  it('lets the lab administrator issue a draft invoice and see the price list', async () => {
    const { page } = b;
    await signIn(page, baseUrl, 'admin@marrowfield.example');
    await page.locator('nav[aria-label="Main"] [data-area="billing"]').click();
    const table = page.locator('[data-test="invoices-table"]');
    await table.locator('[data-state="draft"]').first().waitFor();
    await table.locator('[data-state="overdue"]').first().waitFor();
    await screenshot(page, 'billing-invoices-lab');
    await table.locator('tr', { has: page.locator('[data-state="draft"]') }).first().getByRole('link').click();
    await page.locator('[data-test="finalise"]').click();
    await page.locator('[data-test="finalise-confirm"]').click();
    await page.locator('[data-test="invoice-state"]').getByText('Awaiting payment').waitFor();
    expect(await page.getByRole('heading', { level: 1 }).innerText()).toMatch(/^Invoice MA-\d{4}-\d{4}$/);
    await screenshot(page, 'billing-invoice-issued');

    // bill a month that has no invoice yet: three months ago, for Brindlemoor
    await page.getByRole('link', { name: 'Billing', exact: true }).first().click();
    await page.locator('[data-test="generate-invoice"]').click();
    await page.locator('#gi-client').click();
    await page.getByRole('option', { name: 'Brindlemoor Water Authority' }).click();
    const m = new Date();
    const first = new Date(Date.UTC(m.getUTCFullYear(), m.getUTCMonth() - 3, 1)).toISOString().slice(0, 10);
    const last = new Date(Date.UTC(m.getUTCFullYear(), m.getUTCMonth() - 2, 0)).toISOString().slice(0, 10);
    await page.fill('#gi-from', first);
    await page.fill('#gi-to', last);
    await screenshot(page, 'billing-bill-a-period');
    await page.locator('[data-test="generate-submit"]').click();
    await page.locator('[data-test="invoice-state"]').getByText('Draft').waitFor();
    expect(await page.locator('[data-test="invoice-lines"]').innerText()).toContain('Alkalinity');
    expect(await page.locator('p', { hasText: 'analyses from' }).first().innerText()).toContain(`Brindlemoor Water Authority · analyses from ${first} to ${last}`);
    await screenshot(page, 'billing-draft');

    await page.getByRole('link', { name: 'Billing', exact: true }).first().click();
    await page.getByRole('link', { name: 'Price list' }).click();
    await page.locator('[data-test="prices-table"]').getByText('Full carbonate speciation').first().waitFor();
    expect(await page.locator('[data-test="prices-table"]').innerText()).toContain('$38.75');
    await screenshot(page, 'billing-prices');
  });
});
