import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { openBrowser, screenshot } from './browser.js';
import { signIn, signOut } from './helpers.js';

const baseUrl = inject('baseUrl');
let b: Awaited<ReturnType<typeof openBrowser>>;
beforeAll(async () => {
  b = await openBrowser();
  await signIn(b.page, baseUrl, 'analyst@marrowfield.example');
});
afterAll(() => b?.close());

async function shoot(page: Page, name: string) {
  await page.evaluate(() => document.fonts.ready);
  await screenshot(page, name);
}
const text = (page: Page, test: string) => page.locator(`[data-test="${test}"]`).innerText();

describe('Lab QC screens: titrant lots, standardisations, meter calibrations and QC batches', () => {
  it('registers an acid lot and standardises it against Na2CO3 with the normality shown live', async () => {
    const { page } = b;
    await page.locator('nav[aria-label="Main"] [data-area="lab"]').click();
    await page.waitForURL(/\/lab\/titrants/);
    await page.locator('[data-test="lab-cautions"]').waitFor();
    await page.locator('[data-test="add-titrant"]').click();
    const lot = `E2E-${Date.now().toString().slice(-6)}`;
    await page.fill('[data-test="titrant-lot"]', lot);
    await page.fill('#nominalNormality', '0.1');
    await shoot(page, 'lab-1-titrant-form');
    await page.locator('[data-test="save-titrant"]').click();
    await page.locator('[data-test="standardizations-panel"]').getByText(`lot ${lot}`).waitFor();
    await page.locator('[data-test="titrants-table"]').getByText(lot).waitFor();

    await page.locator('[data-test="add-standardization"]').click();
    await page.locator('[data-test="standardization-form"]').waitFor();
    // SM 2320 B ¶3: N = A × B / (53.00 × C) with A = 2.500 g/L, B = 40.00 mL; computed here for each C.
    const titres = [18.85, 18.87, 18.86];
    for (const [i, c] of titres.entries()) {
      await page.fill(`[data-test="rep-${i}-standard"]`, '40');
      await page.fill(`[data-test="rep-${i}-titrant"]`, String(c));
    }
    const expected = titres.map((c) => (2.5 * 40) / (53 * c)).reduce((a, n) => a + n, 0) / titres.length;
    await page.locator('[data-test="std-normality"]').getByText(`${expected.toFixed(5)} N`).waitFor();
    expect(await text(page, 'std-live')).toContain('Accepted');
    await shoot(page, 'lab-2-standardization-live');
    await page.locator('[data-test="save-standardization"]').click();
    await page.locator('[data-test="standardization-form"]').waitFor({ state: 'detached' });
    await page.locator('[data-test="standardizations-table"]').getByText(`${expected.toFixed(5)} N`).waitFor();
    // The lot now shows its standardised normality in the list.
    await page.locator('[data-test="titrants-table"]').getByText(`${expected.toFixed(5)} N`).waitFor();
    await shoot(page, 'lab-3-titrant-standardised');
  });

  it('records a meter calibration with slope %, offset and a check buffer computed live', async () => {
    const { page } = b;
    await page.locator('[data-test="lab-tab-calibrations"]').click();
    await page.waitForURL(/\/lab\/calibrations/);
    await page.locator('[data-test="add-calibration"]').click();
    await page.fill('[data-test="cal-meter"]', 'E2E-PH-9');
    // Buffers 7.00 → −2 mV and 4.00 → +170 mV at 25 °C: 57.33 mV/pH, 96.9 % of 59.16 (Nernst, computed here).
    await page.fill('[data-test="buf-0-mv"]', '-2');
    await page.fill('[data-test="buf-1-mv"]', '170');
    await page.fill('[data-test="buf-2-mv"]', '-176');
    const slope = 172 / 3;
    const nernst = (Math.LN10 * 8.314462618 * 298.15 * 1000) / 96485.33212;
    await page.locator('[data-test="cal-slope"]').getByText(`${slope.toFixed(2)} mV/pH`).waitFor();
    expect(await text(page, 'cal-percent')).toContain(`${((slope / nernst) * 100).toFixed(1)} %`);
    expect(await text(page, 'cal-offset')).toContain('-2.0 mV');
    expect(await text(page, 'cal-outcome')).toContain('Passed');
    await shoot(page, 'lab-4-calibration-live');
    // A tired electrode: 4.00 at +150 mV is 85 % of Nernst, outside 95–105 %.
    await page.fill('[data-test="buf-1-mv"]', '150');
    await page.locator('[data-test="cal-outcome"]').getByText('Failed').waitFor();
    await page.fill('[data-test="buf-1-mv"]', '170');
    await page.locator('[data-test="cal-outcome"]').getByText('Passed').waitFor();
    await page.locator('[data-test="save-calibration"]').click();
    await page.locator('[data-test="calibration-form"]').waitFor({ state: 'detached' });
    await page.locator('[data-test="calibrations-table"]').getByText('E2E-PH-9').waitFor();
    await shoot(page, 'lab-5-calibrations');
  });

  it('records a QC batch: RPD, recovery and blank judged live against the limits, covering a result of the day', async () => {
    const { page } = b;
    // setup: a draft alkalinity result of today, logged through the Bench entry grid
    await page.locator('nav[aria-label="Main"] [data-area="bench"]').click();
    await page.locator('[data-test="open-grid"]').click();
    const firstRow = page.locator('[data-test^="grid-row-"]').first();
    await firstRow.waitFor();
    const code = (await firstRow.getAttribute('data-test'))!.replace('grid-row-', '');
    await page.fill(`[data-test="grid-${code}-volumeToTotalEndpointMl"]`, '6.1');
    await page.locator('[data-test="grid-save-all"]').click();
    await page.locator(`[data-test="grid-${code}-state"]`).getByText('Saved').waitFor();

    await page.locator('nav[aria-label="Main"] [data-area="lab"]').click();
    await page.locator('[data-test="lab-tab-qc-batches"]').click();
    await page.waitForURL(/\/lab\/qc-batches/);
    await page.locator('[data-test="add-qc"]').click();
    await page.fill('[data-test="dup-0-a"]', '120.4');
    await page.fill('[data-test="dup-0-b"]', '118.9');
    await page.fill('[data-test="std-0-true"]', '100');
    await page.fill('[data-test="std-0-measured"]', '97.8');
    await page.fill('[data-test="blank-0-measured"]', '0.8');
    // RPD = |x1 − x2| / mean × 100 (common practice), computed here.
    const rpd = (Math.abs(120.4 - 118.9) / ((120.4 + 118.9) / 2)) * 100;
    await page.locator('[data-test="qc-rpd-0"]').getByText(`RPD ${rpd.toFixed(2)} %`).waitFor();
    expect(await text(page, 'qc-recovery-0')).toContain('recovery 97.8 %');
    expect(await text(page, 'qc-live-outcome')).toContain('passes');
    // A second pair 15 % apart fails the 10 % limit.
    await page.getByRole('button', { name: 'Add pair' }).click();
    await page.fill('[data-test="dup-1-a"]', '100');
    await page.fill('[data-test="dup-1-b"]', '116.2');
    await page.locator('[data-test="qc-live-outcome"]').getByText('fails').waitFor();
    // The day's result joins the batch.
    await page.locator('[data-test="qc-titrations"]').click();
    await page.locator('.p-multiselect-overlay .p-multiselect-option', { hasText: ` ${code} ` }).first().click();
    await page.locator('[data-test="qc-form"] h3', { hasText: 'Evaluation' }).click();
    await page.locator('.p-multiselect-overlay').waitFor({ state: 'detached' });
    await shoot(page, 'lab-6-qc-live');
    await page.locator('[data-test="save-qc"]').click();
    await page.locator('[data-test="qc-form"]').waitFor({ state: 'detached' });
    await page.locator('[data-test="qc-detail"]').waitFor();
    expect(await text(page, 'qc-detail')).toContain(`RPD ${rpd.toFixed(2)} %`);
    expect(await text(page, 'qc-detail')).toMatch(/Covers titrations\s+#\d+/);
    await shoot(page, 'lab-7-qc-saved');
    expect(b.consoleErrors.filter((e) => !/favicon/.test(e))).toEqual([]);
  });

  it('shows an operator the lab’s lots and QC to read, and lets them record their own meter calibration', async () => {
    const { page } = b;
    await signOut(page);
    await signIn(page, baseUrl, 'operator@kestrelford.example');
    await page.locator('nav[aria-label="Main"] [data-area="lab"]').click();
    await page.locator('[data-test="titrants-table"]').getByText('MA-H2SO4').first().waitFor();
    expect(await page.locator('[data-test="add-titrant"]').count()).toBe(0);
    await page.locator('[data-test="lab-tab-calibrations"]').click();
    await page.locator('[data-test="add-calibration"]').waitFor();
    await page.locator('[data-test="lab-tab-qc-batches"]').click();
    await page.locator('[data-test="qc-table"]').waitFor();
    await page.locator('[data-test="qc-table"] .p-datatable-mask').waitFor({ state: 'detached' });
    expect(await page.locator('[data-test="add-qc"]').count()).toBe(0);
    await shoot(page, 'lab-8-operator-qc');
  });
});
