import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { openBrowser, screenshot } from './browser.js';
import { navLabels, signIn, signOut } from './helpers.js';

const baseUrl = inject('baseUrl');
let b: Awaited<ReturnType<typeof openBrowser>>;

beforeAll(async () => {
  b = await openBrowser();
});
afterAll(() => b?.close());

describe('sign-in, role navigation and sites', () => {
  it('shows an operator only the areas an operator may open', async () => {
    const { page } = b;
    await signIn(page, baseUrl, 'operator@kestrelford.example');
    const labels = await navLabels(page);
    expect(labels).toContain('Today');
    expect(labels).toContain('Sites');
    expect(labels).not.toContain('Admin');
    await page.getByText('Kestrel Ford Water Reclamation Plant').first().waitFor();
    await screenshot(page, 'today-operator');
    // an operator typing the admin address is sent back to Today
    await page.goto(`${baseUrl}/admin/users`);
    await page.waitForURL(/\/today\?denied=/);
    await signOut(page);
  });

  it('refuses a wrong password with a message on the sign-in page', async () => {
    const { page } = b;
    await page.goto(`${baseUrl}/sign-in`);
    await page.fill('#email', 'operator@kestrelford.example');
    await page.fill('#password', 'wrong-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.locator('[data-test="sign-in-error"]').waitFor();
    expect(await page.locator('[data-test="sign-in-error"]').innerText()).toContain('not correct');
    await screenshot(page, 'sign-in-refused');
  });

  it('lets the lab administrator add a monitoring point and see it in the table', async () => {
    const { page } = b;
    await signIn(page, baseUrl, 'admin@marrowfield.example');
    const labels = await navLabels(page);
    expect(labels).toEqual(expect.arrayContaining(['Today', 'Sites', 'Admin']));
    await screenshot(page, 'today-lab-admin');

    await page.locator('nav[aria-label="Main"] [data-area="sites"]').click();
    await page.getByRole('link', { name: 'Quillon Bay Wellfield' }).click();
    await page.locator('[data-test="points-table"]').getByText('WELL-3').waitFor();
    await page.locator('[data-test="add-point"]').click();
    await page.fill('#pt-code', 'WELL-7');
    await page.fill('#pt-name', 'Well 7 raw water');
    await page.locator('[data-test="save-point"]').click();
    await page.locator('[data-test="points-table"]').getByText('WELL-7').waitFor();
    expect(await page.locator('[data-test="points-table"]').innerText()).toContain('Well 7 raw water');
    await screenshot(page, 'sites-point-added');

    // a duplicate code is refused beside the field, nothing saved
    await page.locator('[data-test="add-point"]').click();
    await page.fill('#pt-code', 'WELL-7');
    await page.fill('#pt-name', 'Duplicate');
    await page.locator('[data-test="save-point"]').click();
    await page.getByText('already in use').waitFor();
    await screenshot(page, 'sites-point-duplicate');
    await page.keyboard.press('Escape');

    await page.goto(`${baseUrl}/admin/audit`);
    await page.getByText('point.created').first().waitFor();
    await screenshot(page, 'admin-audit');
    await page.goto(`${baseUrl}/admin/users`);
    await page.getByText('operator@quillonbay.example').waitFor();
    await screenshot(page, 'admin-users');
  });
});
