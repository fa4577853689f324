import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { openBrowser, screenshot } from './browser.js';
import { signIn } from './helpers.js';

const baseUrl = inject('baseUrl');
let b: Awaited<ReturnType<typeof openBrowser>>;
beforeAll(async () => {
  b = await openBrowser();
  await signIn(b.page, baseUrl, 'operator@kestrelford.example');
});
afterAll(() => b?.close());

/** Opens a tool from the Tools index, as a person would. */
async function openTool(page: Page, name: RegExp) {
  await page.locator('nav[aria-label="Main"] [data-area="tools"]').click();
  await page.getByRole('heading', { level: 1, name: 'Tools' }).waitFor();
  await page.getByRole('link', { name }).click();
}

async function shoot(page: Page, name: string) {
  await page.evaluate(() => document.fonts.ready);
  await screenshot(page, name);
}

const text = (page: Page, test: string) => page.locator(`[data-test="${test}"]`).innerText();

describe('Tools pages (issue 9): live results from the shared engine', () => {
  it('Curve insight: true equivalence points, the pH 4.5 endpoint error and the steep-part warning', async () => {
    const { page } = b;
    await openTool(page, /Curve insight/);
    // domain.md 3.4: 125.0 mg/L at pH 9.20 → equivalences 0.8685 mL (pH 8.32) and 12.500 mL (pH 4.52)
    await page.locator('[data-test="result-eq-total"]').getByText('12.500 mL at pH 4.52').waitFor();
    expect(await text(page, 'result-eq-carbonate')).toContain('0.869 mL at pH 8.32');
    await page.locator('canvas').waitFor();
    await shoot(page, 'tools-curve-insight');

    // a 70 mg/L water at pH 7.50 has its equivalence near pH 4.61: pH 4.5 reads about 0.065 mL (0.65 mg/L) high
    await page.fill('#totalAlkalinity', '70');
    await page.fill('#initialPh', '7.50');
    await page.locator('[data-test="result-error-total"]').getByText('+0.065 mL').waitFor();
    expect(await text(page, 'result-error-total')).toContain('On the steep part');
    expect(await text(page, 'result-recommended')).toContain('pH 4.7');
    await shoot(page, 'tools-curve-insight-70mgL');

    // pH 5.5 is off the steep part: flagged with icon + word and a warning
    await page.fill('#totalEndpointPh', '5.5');
    await page.locator('[data-test="result-error-total"]').getByText('Off the steep part').waitFor();
    expect(await text(page, 'calc-warnings')).toMatch(/outside the steep part/);

    // an endpoint the sample starts below is refused beside the field
    await page.fill('#initialPh', '4.2');
    await page.locator('[data-test="error-totalEndpointPh"]').waitFor();
  });

  it('Corrosion indices: 8e–8g water, LSI +0.48 scale-forming, CCPP 13.5 mg/L; °F input; an aggressive water', async () => {
    const { page } = b;
    await openTool(page, /Corrosion indices/);
    await page.locator('[data-test="result-lsi"]').getByText('+0.48').waitFor();
    expect(await text(page, 'result-lsi')).toContain('Scale-forming');
    expect(await text(page, 'result-rsi')).toContain('Balanced');
    expect(await text(page, 'result-ccpp')).toContain('13.5');

    // 77 °F is 25 °C: the same CCPP
    await page.getByText('°F', { exact: true }).click();
    await page.fill('#temperature', '77');
    await page.locator('[data-test="result-ccpp"]').getByText('13.5').waitFor();
    await shoot(page, 'tools-corrosion');

    await page.fill('#pH', '7.00');
    await page.locator('[data-test="result-lsi"]').getByText('Aggressive').waitFor();
    expect(await text(page, 'result-ccpp')).toContain('Would dissolve');
  });

  it('Enhanced coagulation: 8c (35.0 % required, 40.4 % achieved, ratio 1.15) and the 141.135 boundaries', async () => {
    const { page } = b;
    await openTool(page, /Enhanced coagulation/);
    await page.locator('[data-test="result-required"]').getByText('35.0').waitFor();
    expect(await text(page, 'result-achieved')).toContain('40.4');
    expect(await text(page, 'result-ratio')).toContain('1.15');
    expect(await text(page, 'result-ratio')).toContain('Meets Step 1');
    expect(await text(page, 'matrix-current')).toContain('this water');
    await shoot(page, 'tools-enhanced-coagulation');

    // alkalinity 60.0 is in the 0–60 column: > 4.0–8.0 row → 45.0 % (40 CFR 141.135(b)(2))
    await page.fill('#sourceAlkalinity', '60.0');
    await page.locator('[data-test="result-required"]').getByText('45.0').waitFor();
    await page.fill('#sourceTocMgL', '2.0');
    await page.locator('[data-test="result-required"]').getByText('No Step 1 requirement').waitFor();
  });

  it('Nitrification budget: 8h residual 70.1 mg/L meets 50; a target of 80 needs caustic, with cautions', async () => {
    const { page } = b;
    await openTool(page, /Nitrification budget/);
    await page.locator('[data-test="result-residual"]').getByText('70.1').waitFor();
    expect(await text(page, 'result-residual')).toContain('Meets target');
    await page.fill('#targetResidualAlkalinity', '80');
    await page.locator('[data-test="result-shortfall"]').getByText('9.9').waitFor();
    expect(await text(page, 'result-residual')).toContain('Below target');
    // 9.94 × 40.00/50.04 = 7.9 mg/L NaOH; × 2.0 MGD × 8.34 = 133 lb/d
    expect(await text(page, 'result-makeup')).toContain('7.9');
    expect(await text(page, 'result-makeup')).toContain('133 lb/d');
    expect(await text(page, 'cautions')).toMatch(/licensed practice govern/);
    await page.locator('svg.budget-chart').waitFor();
    await shoot(page, 'tools-nitrification');
  });

  it('Alkalinity dose: 8j, 30 mg/L at 2.0 MGD with 50 % NaOH → 400 lb/d of 100 % = 800 lb/d of 50 %; the same in m³/d', async () => {
    const { page } = b;
    await openTool(page, /Alkalinity dose/);
    await page.locator('[data-test="result-pure"]').getByText('23.98').waitFor();
    expect(await text(page, 'result-feed-pure')).toContain('400 lb/d');
    expect(await text(page, 'result-feed-product')).toContain('800 lb/d');
    expect(await text(page, 'cautions')).toMatch(/corrosive/);
    expect(await text(page, 'cautions')).toMatch(/permit, local codes and licensed practice govern/);
    await shoot(page, 'tools-alkalinity-dose');

    await page.getByText('m³/d', { exact: true }).click();
    await page.fill('#flow', '7570.82');
    await page.locator('[data-test="result-feed-pure"]').getByText('181.6 kg/d').waitFor();
    expect(await text(page, 'result-feed-pure')).toContain('400 lb/d');

    // a purity of 0 is refused beside the field
    await page.fill('#purityPercent', '0');
    await page.locator('[data-test="error-purityPercent"]').waitFor();
  });

  it('Digester health: 8i, 0.10 stable and 0.375 act; a rising trend', async () => {
    const { page } = b;
    await openTool(page, /Digester health/);
    await page.locator('[data-test="result-ratio"]').getByText('0.100').waitFor();
    expect(await text(page, 'result-ratio')).toContain('Stable');
    await page.fill('#volatileAcidsMgL', '900');
    await page.fill('#alkalinity', '2400');
    await page.locator('[data-test="result-ratio"]').getByText('0.375').waitFor();
    expect(await text(page, 'result-ratio')).toContain('Act');
    expect(await text(page, 'result-additional')).toContain('1200');
    await page.fill('#previousRatios', '0.2, 0.3');
    await page.locator('[data-test="result-trend"]').getByText('Rising').waitFor();
    await shoot(page, 'tools-digester');
  });

  it('every tool fills its inputs from a point’s latest approved results, naming where each figure came from', async () => {
    const { page } = b;
    /** Picks Kestrel Ford's point in the fill control and fills; returns the outcome line. */
    async function fillFrom(pointCode: string) {
      const control = page.locator('[data-test="fill-from-results"]');
      await control.waitFor();
      const facility = control.locator('[data-test="fill-facility"]');
      if (!(await facility.innerText()).includes('Kestrel Ford Water Reclamation Plant')) {
        await facility.click();
        await page.locator('.p-select-overlay .p-select-option', { hasText: 'Kestrel Ford Water Reclamation Plant' }).click();
        await page.locator('.p-select-overlay').waitFor({ state: 'detached' });
      }
      await control.locator('[data-test="fill-point"]').click();
      await page.locator('.p-select-overlay .p-select-option', { hasText: `${pointCode} —` }).click();
      await page.locator('.p-select-overlay').waitFor({ state: 'detached' });
      await control.locator('[data-test="fill-go"]').click();
      await control.locator('[data-test="fill-outcome"]').getByText(`From ${pointCode}`).waitFor();
      return control.locator('[data-test="fill-outcome"]').innerText();
    }
    /** The figure the outcome line names for a label, e.g. "total alkalinity 123.4 (…)". */
    const named = (outcome: string, label: string) => /\d/.test(outcome) ? new RegExp(`${label} (-?[\\d.]+) \\(`).exec(outcome)?.[1] : undefined;

    // Curve insight from the effluent: alkalinity, pH and temperature from the bench; the model follows.
    await openTool(page, /Curve insight/);
    let outcome = await fillFrom('EFF-001');
    const alk = named(outcome, 'total alkalinity');
    expect(alk).toBeDefined();
    expect(await page.inputValue('#totalAlkalinity')).toBe(alk);
    expect(await page.inputValue('#initialPh')).toBe(named(outcome, 'pH'));
    expect(await page.inputValue('#temperatureC')).toBe(named(outcome, 'temperature'));
    // The recommendation names the filled alkalinity.
    await page.getByText(`Recommended total endpoint for ${alk} mg/L`).waitFor();
    await shoot(page, 'tools-fill-curve-insight');

    // Digester health from the digester point: volatile acids and alkalinity of its latest approved result.
    await openTool(page, /Digester health/);
    outcome = await fillFrom('DIG-1');
    expect(await page.inputValue('#volatileAcidsMgL')).toBe(named(outcome, 'volatile acids'));
    expect(await page.inputValue('#alkalinity')).toBe(named(outcome, 'total alkalinity'));
    // and the trend from the earlier approved results (the demo digester has months of them)
    expect(await page.inputValue('#previousRatios')).toMatch(/^\d\.\d{3}(, \d\.\d{3}){4}$/);
    await shoot(page, 'tools-fill-digester');

    // The other tools take the alkalinity (and what else the bench records) the same way.
    for (const [tool, field] of [
      [/Titration calculator/, '#sampleVolumeMl'],
      [/Corrosion indices/, '#totalAlkalinity'],
      [/Enhanced coagulation/, '#sourceAlkalinity'],
      [/Nitrification budget/, '#influentAlkalinity'],
      [/Alkalinity dose/, '#currentAlkalinity'],
    ] as const) {
      await openTool(page, tool);
      outcome = await fillFrom('EFF-001');
      const label = field === '#sampleVolumeMl' ? 'sample volume' : 'total alkalinity';
      expect(await page.inputValue(field), String(tool)).toBe(named(outcome, label));
    }
    await shoot(page, 'tools-fill-alkalinity-dose');
  });

  it('raised no browser errors on the way', () => {
    expect(b.consoleErrors).toEqual([]);
  });
});
