import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { openBrowser, screenshot } from './browser.js';
import { signIn } from './helpers.js';

const baseUrl = inject('baseUrl');
let b: Awaited<ReturnType<typeof openBrowser>>;
beforeAll(async () => {
  b = await openBrowser();
});
afterAll(() => b?.close());

describe('Tools: titration calculator', () => {
  it('computes P and T live from typed volumes and from pasted readings, and plots the curve', async () => {
    const { page } = b;
    await signIn(page, baseUrl, 'analyst@marrowfield.example');
    await page.locator('nav[aria-label="Main"] [data-area="tools"]').click();
    await page.getByRole('link', { name: /Titration calculator/ }).click();

    // SM 2320 B: 12.40 mL × 0.0200 N × 50,000 / 100 mL = 124.0 mg/L; 2.10 mL → 21.0 mg/L
    await page.locator('[data-test="result-t"]').getByText('124.0').waitFor();
    expect(await page.locator('[data-test="result-p"]').innerText()).toContain('21.0');

    // typing a new total volume updates T at once: 8.75 mL × 0.1 N × 50,000 / 50 mL = 875 mg/L
    await page.fill('#sampleVolumeMl', '50');
    await page.fill('#titrantNormality', '0.1000');
    await page.fill('#volumeToPh83Ml', '0');
    await page.fill('#volumeToTotalEndpointMl', '8.75');
    await page.locator('[data-test="result-t"]').getByText('875.0').waitFor();

    // a P volume above T is refused beside the field, not computed
    await page.fill('#volumeToPh83Ml', '9');
    await page.locator('[data-test="error-volumeToPh83Ml"]').waitFor();
    await screenshot(page, 'calculator-error');

    // pasted curve readings: fixed endpoint at pH 4.5 between 12.50/4.52 and 12.75/4.22 → 12.5167 mL → 125.2 mg/L
    await page.getByText('pH curve readings').click();
    await page.fill('#sampleVolumeMl', '100');
    await page.fill('#titrantNormality', '0.0200');
    await page.locator('[data-test="result-t"]').getByText('125.2').waitFor();
    await page.locator('canvas').waitFor();
    await page.evaluate(() => document.fonts.ready);
    await screenshot(page, 'calculator-curve');
  });
});
