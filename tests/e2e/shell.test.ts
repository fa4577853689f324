import { existsSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { openBrowser, screenshot } from './browser.js';

const baseUrl = inject('baseUrl');
let b: Awaited<ReturnType<typeof openBrowser>>;

beforeAll(async () => {
  b = await openBrowser();
});
afterAll(() => b?.close());

describe('the client shell', () => {
  it('serves the app in Work Sans and shows a 404 page for unknown paths', async () => {
    const { page } = b;
    await page.goto(`${baseUrl}/no-such-page`);
    await page.getByText('Page not found').waitFor();
    await page.evaluate(() => document.fonts.ready);
    const fonts = await page.evaluate(() => ({
      loaded: [...document.fonts].filter((f) => f.status === 'loaded').map((f) => f.family.replace(/"/g, '')),
      body: getComputedStyle(document.body).fontFamily,
      check: document.fonts.check('16px "Work Sans"'),
    }));
    expect(fonts.body.startsWith("'Work Sans'") || fonts.body.startsWith('"Work Sans"')).toBe(true);
    expect(fonts.loaded).toContain('Work Sans');
    expect(fonts.check).toBe(true);
    const file = await screenshot(page, 'shell-not-found');
    expect(existsSync(file)).toBe(true);
    expect(b.consoleErrors.filter((e) => /Content Security Policy/i.test(e))).toEqual([]);
  });
});
