import { execFileSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import dayjs from 'dayjs';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { testOutputDir } from '../setup/env.js';
import { openBrowser, screenshot } from './browser.js';
import { DEMO_PASSWORD, signIn, signOut } from './helpers.js';

const baseUrl = inject('baseUrl');
const mailboxUrl = inject('mailboxUrl');
let b: Awaited<ReturnType<typeof openBrowser>>;
beforeAll(async () => {
  b = await openBrowser();
});
afterAll(() => b?.close());

/** Stored-XSS payloads (OWASP XSS filter evasion cheat sheet, the classic forms). */
const PAYLOAD = `<img src=x onerror="window.__xss=1"><script>window.__xss=1</script>`;
const cspViolations = (errors: string[]) => errors.filter((e) => /Content Security Policy|Refused to (load|execute|apply|connect)/i.test(e));

async function api(token: string | null, method: string, url: string, body?: unknown) {
  const res = await fetch(`${baseUrl}/api/v1${url}`, { method, headers: { 'content-type': 'application/json', ...(token ? { authorization: `Bearer ${token}` } : {}) }, body: body === undefined ? undefined : JSON.stringify(body) });
  const data = res.headers.get('content-type')?.includes('json') ? await res.json() : await res.arrayBuffer();
  if (!res.ok) throw new Error(`${method} ${url}: ${res.status} ${JSON.stringify(data)}`);
  return data as any;
}
const login = async (email: string) => (await api(null, 'POST', '/auth/login', { email, password: DEMO_PASSWORD })).token as string;

describe('stored XSS and the content-security policy', () => {
  it('shows hostile text as text in the app, the PDF and the e-mail, with no script run and no CSP violation', async () => {
    const { page, consoleErrors } = b;
    const admin = await login('admin@marrowfield.example');
    const officer = await login('compliance@kestrelford.example');
    const orgs = await api(admin, 'GET', '/organizations?pageSize=50');
    const kf = orgs.items.find((o: any) => o.name === 'Kestrel Ford Sanitary District');
    const facility = await api(admin, 'POST', '/facilities', { organizationId: kf.id, name: `XSS plant ${PAYLOAD}`.slice(0, 160), kind: 'wastewater', timezone: 'America/Denver', address: PAYLOAD });
    const point = await api(admin, 'POST', `/facilities/${facility.id}/points`, { code: 'XSS-1', name: PAYLOAD.slice(0, 160), matrix: 'effluent' });
    const sample = await api(admin, 'POST', '/samples', { sampleType: 'grab', pointId: point.id, collectedAt: dayjs().subtract(1, 'hour').toISOString(), notes: PAYLOAD });
    await api(admin, 'POST', '/permits', { facilityId: facility.id, number: `XSS-${Date.now()}`, issuingAuthority: PAYLOAD.slice(0, 160), effectiveFrom: '2026-01-01', regulatorContacts: [{ name: 'XSS desk', email: 'xss-desk@state.example' }] });
    const report = await api(officer, 'POST', '/reports', { facilityId: facility.id, month: dayjs().subtract(1, 'month').format('YYYY-MM') });
    await api(officer, 'POST', `/reports/${report.id}/certify`, { password: DEMO_PASSWORD, statement: PAYLOAD });

    await signIn(page, baseUrl, 'admin@marrowfield.example');
    for (const url of [`/sites/facilities/${facility.id}`, `/bench/samples/${sample.id}`, `/reports/${report.id}`]) {
      await page.goto(`${baseUrl}${url}`);
      await page.getByRole('heading', { level: 1 }).first().waitFor();
      const shown = await page.waitForFunction(() => document.body.innerText.includes('onerror='), null, { timeout: 8000 }).then(() => true, () => false);
      if (!shown) await screenshot(page, `security-xss-missing`);
      expect(shown, `${url} shows the payload as text`).toBe(true);
      expect(await page.evaluate(() => (window as any).__xss)).toBeUndefined();
    }
    await screenshot(page, 'security-xss-report');
    expect(await page.locator('body').innerText()).toContain('<script>window.__xss=1</script>');

    // the PDF carries the statement as text
    const pdf = Buffer.from(await api(officer, 'GET', `/reports/${report.id}/pdf`));
    const file = path.join(testOutputDir, 'security-xss.pdf');
    writeFileSync(file, pdf);
    expect(execFileSync('pdftotext', [file, '-']).toString()).toContain('onerror="window.__xss=1"');
    expect(pdf.toString('latin1')).not.toMatch(/\/JavaScript|\/JS\s*\(/);

    // the e-mail to the regulator is plain text, the payload as it was typed
    let mail: any = null;
    for (let i = 0; i < 40 && !mail; i++) {
      const list = await (await fetch(`${mailboxUrl}/messages`)).json();
      mail = (list.items ?? list).find((m: any) => (m.subject ?? '').includes('XSS plant'));
      if (!mail) await new Promise((r) => setTimeout(r, 500));
    }
    expect(mail, 'the certified report e-mail arrived').toBeTruthy();
    expect(mail.html).toBeNull();
    expect(cspViolations(consoleErrors)).toEqual([]);
  });

  it('opens every area as each demo role without a content-security-policy violation', async () => {
    const { page, consoleErrors } = b;
    await signOut(page);
    for (const email of ['admin@marrowfield.example', 'analyst@marrowfield.example', 'operator@kestrelford.example', 'compliance@kestrelford.example', 'billing@kestrelford.example']) {
      await signIn(page, baseUrl, email);
      const links = await page.locator('nav[aria-label="Main"] .nav-link').evaluateAll((els) => els.map((e) => e.getAttribute('href')));
      expect(links.length, `${email} sees areas to open`).toBeGreaterThan(2);
      for (const href of links) {
        await page.goto(`${baseUrl}${href}`);
        await page.getByRole('heading', { level: 1 }).first().waitFor();
        await page.waitForTimeout(300);
      }
      await signOut(page);
    }
    expect(cspViolations(consoleErrors)).toEqual([]);
  });
});
