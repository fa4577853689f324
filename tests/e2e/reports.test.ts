import { execFileSync } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { testOutputDir } from '../setup/env.js';
import { openBrowser, screenshot } from './browser.js';
import { DEMO_PASSWORD, signIn } from './helpers.js';

const baseUrl = inject('baseUrl');
let b: Awaited<ReturnType<typeof openBrowser>>;
beforeAll(async () => {
  b = await openBrowser();
});
afterAll(() => b?.close());

describe('Reports: preview, certify and download', () => {
  it('lets the compliance officer preview last month, certify it and download the PDF', async () => {
    const { page } = b;
    await signIn(page, baseUrl, 'compliance@kestrelford.example');
    await page.locator('nav[aria-label="Main"] [data-area="reports"]').click();
    const table = page.locator('[data-test="reports"]');
    await table.waitFor();
    // the demo has an earlier month certified and last month as a draft
    await expect.poll(() => table.innerText()).toContain('Certified');
    await screenshot(page, 'reports-list');
    await table.locator('tr', { hasText: 'Draft' }).first().click();
    await page.locator('[data-test="report-limits"]').waitFor();
    await page.locator('canvas').first().waitFor();
    expect(await page.locator('[data-test="report-limits"]').innerText()).toContain('mg/L as CaCO3');
    expect(await page.locator('[data-test="certification-block"]').innerText()).toContain('governs');
    await screenshot(page, 'report-preview');

    await page.locator('[data-test="certify-open"]').click();
    await page.locator('[data-test="certify-password"] input').fill('not my password');
    await page.locator('[data-test="certify-confirm"]').click();
    await page.getByText('That password is not correct.').waitFor();
    await page.locator('[data-test="certify-password"] input').fill(DEMO_PASSWORD);
    await page.locator('[data-test="certify-confirm"]').click();
    await page.locator('[data-test="pdf-hash"]').waitFor();
    const hash = (await page.locator('[data-test="pdf-hash"]').innerText()).trim();
    expect(hash).toMatch(/^[0-9a-f]{64}$/);
    await screenshot(page, 'report-certified');

    const [download] = await Promise.all([page.waitForEvent('download'), page.locator('[data-test="download-pdf"]').click()]);
    const dir = path.join(testOutputDir, 'screenshots');
    mkdirSync(dir, { recursive: true });
    const pdf = path.join(testOutputDir, 'report-certified.pdf');
    await download.saveAs(pdf);
    // the downloaded file is the certified one: its SHA-256 is the hash shown
    expect(execFileSync('sha256sum', [pdf]).toString().split(' ')[0]).toBe(hash);
    expect(execFileSync('pdftotext', [pdf, '-']).toString()).toContain('Signed by');
    // first page as a PNG beside the screenshots (poppler's pdftoppm)
    execFileSync('pdftoppm', ['-png', '-r', '80', '-f', '1', '-l', '1', '-singlefile', pdf, path.join(dir, 'report-pdf-page-1')]);
  });
});
