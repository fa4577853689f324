import type { Page } from 'playwright-core';

export const DEMO_PASSWORD = process.env.DEMO_PASSWORD ?? 'titrata-demo';

/** Signs in through the sign-in page and waits for Today. */
export async function signIn(page: Page, baseUrl: string, email: string, password = DEMO_PASSWORD) {
  await page.goto(`${baseUrl}/sign-in`);
  await page.fill('#email', email);
  await page.fill('#password', password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/today/);
  await page.getByRole('heading', { level: 1 }).waitFor();
}

/** Signs out with the top bar button. */
export async function signOut(page: Page) {
  await page.locator('[data-test="sign-out"]').click();
  await page.waitForURL(/\/sign-in/);
}

/** The labels of the main navigation, in order. */
export async function navLabels(page: Page): Promise<string[]> {
  return (await page.locator('nav[aria-label="Main"] .nav-link').allInnerTexts()).map((s) => s.trim());
}
