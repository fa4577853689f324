import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { openBrowser, screenshot } from './browser.js';
import { signIn, signOut } from './helpers.js';

const baseUrl = inject('baseUrl');
let b: Awaited<ReturnType<typeof openBrowser>>;
beforeAll(async () => {
  b = await openBrowser();
});
afterAll(() => b?.close());

// The synthetic curve of tests/api/calc.test.ts (100 mL sample).
const READINGS = [
  'volume_ml\tph',
  '0\t9.20', '0.25\t9.05', '0.50\t8.85', '0.75\t8.52', '1.00\t8.10', '1.50\t7.58', '2.00\t7.31', '4.00\t6.79', '6.00\t6.45', '8.00\t6.15',
  '10.00\t5.79', '11.00\t5.53', '11.50\t5.34', '12.00\t5.05', '12.25\t4.82', '12.50\t4.52', '12.75\t4.22', '13.00\t4.01', '13.50\t3.74', '14.00\t3.57', '15.00\t3.36', '16.00\t3.22', '17.00\t3.11',
].join('\n');
// Fixed-pH interpolation: pH 8.3 at 0.75 + 0.25 × 0.22/0.42 mL, pH 4.5 at 12.50 + 0.25 × 0.02/0.30 mL.
const P_ML = 0.75 + (0.25 * 0.22) / 0.42;
const T_ML = 12.5 + (0.25 * 0.02) / 0.3;

describe('Bench: log a sample and a curve titration, then approve it from Review', () => {
  it('operator logs and submits with live P and T; analyst approves', async () => {
    const { page } = b;
    await signIn(page, baseUrl, 'operator@kestrelford.example');
    await page.locator('nav[aria-label="Main"] [data-area="bench"]').click();
    await page.getByRole('heading', { level: 1, name: 'Bench' }).waitFor();
    await page.locator('[data-test="lab-cautions"]').waitFor();
    await screenshot(page, 'bench-1-list');

    // Log a sample at the first monitoring point.
    await page.locator('[data-test="log-sample"]').click();
    await page.locator('[data-test="sample-point"]').click();
    await page.locator('.p-select-overlay .p-select-option').first().click();
    await page.locator('.p-select-overlay').waitFor({ state: 'detached' });
    await page.fill('#receiptTemperatureC', '4.0');
    await page.fill('#sm-by', 'R. Okafor');
    await screenshot(page, 'bench-2-log-sample');
    await page.locator('[data-test="save-sample"]').click();
    await page.waitForURL(/\/bench\/samples\/\d+/);
    await page.locator('[data-test="lab-cautions"]').waitFor();

    // A curve titration: nothing to show until the inputs are complete.
    await page.locator('[data-test="add-titration"]').click();
    await page.locator('[data-test="titration-form"]').waitFor();
    const normText = await page.locator('[data-test="normality"]').innerText();
    const normality = Number(/([\d.]+) N/.exec(normText)![1]);
    expect(normality).toBeGreaterThan(0);
    await page.fill('#tt-readings', READINGS);
    await page.fill('#sampleVolumeMl', '');
    await page.locator('[data-test="live-invalid"]').waitFor();
    // Typing the sample volume brings P and T up at once, computed with the lot's normality.
    await page.locator('#sampleVolumeMl').pressSequentially('100');
    const expectedT = ((T_ML * normality * 50000) / 100).toFixed(1);
    const expectedP = ((P_ML * normality * 50000) / 100).toFixed(1);
    await page.locator('[data-test="live-t"]').getByText(expectedT).waitFor();
    expect(await page.locator('[data-test="live-p"]').innerText()).toContain(expectedP);
    await page.fill('#temperatureC', '21');
    await page.evaluate(() => document.fonts.ready);
    await screenshot(page, 'bench-3-titration-live');

    await page.locator('[data-test="save-submit"]').click();
    await page.locator('[data-test="titration-status"]').getByText('Submitted').waitFor();
    expect(await page.locator('[data-test="stored-t"]').innerText()).toContain(expectedT);
    const tab = page.locator('[data-test^="titration-tab-"]').last();
    const titrationId = Number((await tab.getAttribute('data-test'))!.replace('titration-tab-', ''));
    await screenshot(page, 'bench-4-submitted');

    // The Curve view plots the readings.
    await page.locator('[data-test="open-curve"]').click();
    await page.locator('canvas').first().waitFor();
    await page.locator('[data-test="readings-table"]').getByText('17.00').first().waitFor();
    await screenshot(page, 'bench-5-curve');

    // Back on the Bench list the sample shows its submitted result.
    await page.locator('nav[aria-label="Main"] [data-area="bench"]').click();
    await page.locator('[data-test="samples-table"]').getByText(expectedT).first().waitFor();
    await screenshot(page, 'bench-5b-list-after');

    await signOut(page);
    await signIn(page, baseUrl, 'analyst@marrowfield.example');
    await page.locator('nav[aria-label="Main"] [data-area="review"]').click();
    await page.getByRole('heading', { level: 1, name: 'Review' }).waitFor();
    const approve = page.locator(`[data-test="approve-${titrationId}"]`);
    await approve.waitFor();
    expect(await page.locator(`[data-test="review-result-${titrationId}"]`).innerText()).toContain(expectedT);
    await screenshot(page, 'bench-6-review');
    await approve.click();
    await page.getByText('Approved', { exact: true }).first().waitFor();
    await approve.waitFor({ state: 'detached' });
    await screenshot(page, 'bench-7-approved');

    // The record now says approved, with its audit trail.
    await page.goto(`${baseUrl}/bench/titrations/${titrationId}/curve`);
    await page.locator('[data-test="curve-results"]').waitFor();

    // Curve insight on the Curve view: the model water with this result's T has its total
    // equivalence at T × V / (N × 50,000) mL (SM 2320 B rearranged), which is the pH 4.5 volume T_ML itself.
    const insight = page.locator('[data-test="curve-insight"]');
    await insight.locator('[data-test="result-eq-total"]').waitFor();
    expect(await insight.locator('[data-test="result-eq-total"]').innerText()).toMatch(new RegExp(`^${T_ML.toFixed(3).replace('.', '\\.')} mL at pH 4\\.\\d\\d`));
    expect(await insight.locator('[data-test="result-error-total"]').innerText()).toMatch(/mL · [+-]?[\d.]+ mg\/L · [+-]?[\d.]+ %/);
    expect(await insight.locator('[data-test="indicator-table"]').innerText()).toMatch(/Phenolphthalein/i);
    expect(await insight.locator('[data-test="result-recommended"]').innerText()).toMatch(/pH 4\.\d/);
    await insight.locator('canvas').waitFor();
    await page.evaluate(() => document.fonts.ready);
    await screenshot(page, 'bench-7b-curve-insight');
    expect(b.consoleErrors.filter((e) => !/favicon/.test(e))).toEqual([]);
  });
});

describe('Bench: the daily entry grid', () => {
  it('operator enters two points by keyboard, sees P and T per row, and saves all in one go', async () => {
    const { page } = b;
    await signIn(page, baseUrl, 'operator@kestrelford.example');
    await page.locator('nav[aria-label="Main"] [data-area="bench"]').click();
    await page.locator('[data-test="open-grid"]').click();
    await page.locator('[data-test="entry-grid"]').waitFor();
    await page.locator('[data-test="grid-row-INF-1"]').waitFor();
    const normText = await page.locator('[data-test="grid-normality"]').innerText();
    const normality = Number(/([\d.]+) N/.exec(normText)![1]);
    // SM 2320 B: mg/L as CaCO3 = mL × N × 50,000 / sample mL (computed here for each row)
    const mgL = (ml: number, sampleMl = 100) => ((ml * normality * 50000) / sampleMl).toFixed(1);

    // INF-1: P cell, then Enter moves on to T and the receipt temperature, then to EFF-001's time.
    await page.locator('[data-test="grid-INF-1-volumeToPh83Ml"]').click();
    await page.keyboard.type('0.6');
    await page.keyboard.press('Enter');
    await page.keyboard.type('9.85');
    await page.keyboard.press('Enter');
    await page.keyboard.type('4.2');
    await page.locator('[data-test="grid-INF-1-t"]').getByText(mgL(9.85)).waitFor();
    expect(await page.locator('[data-test="grid-INF-1-p"]').innerText()).toBe(mgL(0.6));

    // EFF-001 with a 50-mL aliquot, moving by Tab; a mistyped T is named in the row before saving.
    await page.locator('[data-test="grid-EFF-001-sampleVolumeMl"]').fill('');
    await page.locator('[data-test="grid-EFF-001-sampleVolumeMl"]').click();
    await page.keyboard.type('50');
    await page.keyboard.press('Tab');
    await page.keyboard.type('0');
    await page.keyboard.press('Tab');
    await page.keyboard.type('3.4x');
    await page.locator('[data-test="grid-EFF-001-state"]').getByText(/number/).waitFor();
    await page.keyboard.press('Backspace');
    await page.locator('[data-test="grid-EFF-001-t"]').getByText(mgL(3.4, 50)).waitFor();
    expect(await page.locator('[data-test="grid-EFF-001-p"]').innerText()).toBe('0.0');
    await page.evaluate(() => document.fonts.ready);
    await screenshot(page, 'bench-8-entry-grid');

    // A collection time 40 minutes ahead passes the form but not the server: that row is refused
    // with the API's reason beside it and keeps nothing, while INF-1 is saved.
    const hhmm = (offsetMin: number) => page.evaluate((m) => {
      const d = new Date(Date.now() + m * 60_000);
      return `${String(d.getHours()).padStart(2, '0')}:${String(d.getMinutes()).padStart(2, '0')}`;
    }, offsetMin);
    const ahead = await hhmm(40);
    // (just before midnight "40 minutes ahead" is tomorrow, which a time of day cannot say)
    const canBeAhead = ahead > (await hhmm(0));
    if (canBeAhead) await page.fill('[data-test="grid-EFF-001-time"]', ahead);
    await page.locator('[data-test="grid-save-all"]').click();
    await page.locator('[data-test="grid-INF-1-state"]').getByText('Saved (draft)').waitFor();
    if (canBeAhead) {
      await page.locator('[data-test="grid-EFF-001-state"]').getByText('must not be in the future').waitFor();
      expect(await page.locator('[data-test="grid-EFF-001-time"]').getAttribute('aria-invalid')).toBe('true');
      await screenshot(page, 'bench-8b-entry-grid-row-refused');
      await page.fill('[data-test="grid-EFF-001-time"]', await hhmm(-5));
      await page.locator('[data-test="grid-save-all"]').click();
    }
    await page.locator('[data-test="grid-EFF-001-state"]').getByText('Saved (draft)').waitFor();
    // The list below shows both new results.
    await page.locator('[data-test="samples-table"]').getByText(mgL(9.85)).first().waitFor();
    await page.locator('[data-test="samples-table"]').getByText(mgL(3.4, 50)).first().waitFor();
    await screenshot(page, 'bench-9-entry-grid-saved');
    await signOut(page);
  });
});
