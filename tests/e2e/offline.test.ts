import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startApp, testSql, type AppServer } from '../helpers/appServer';
import { artifactPath, chromiumAvailable, launchBrowser, signInPage } from '../helpers/browser';
import { Client } from '../helpers/client';

const haveBrowser = chromiumAvailable();

describe.skipIf(!haveBrowser)('offline at the bedside', () => {
  let app: AppServer;
  let browser: Browser;
  beforeAll(async () => {
    app = await startApp({ cases: 10 });
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it('keeps doses and interventions recorded offline as waiting, and saves each exactly once when back online', async () => {
    const nurse = app.account('nurse');
    const api = new Client(app.url);
    await api.signIn(nurse.username, nurse.password);
    const opened = await api.post('/api/v1/cases', {
      patient: { mrn: 'OFF-0001', familyName: 'Offline', givenName: 'Olive', birthDate: '1971-02-03', sex: 'female' },
      procedureType: 'gastroscopy',
      roomId: 'room-2',
      plannedDepth: 'moderate',
      weightKg: 70,
    });
    expect(opened.status).toBe(201);
    const caseId = opened.json.id as string;

    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    const page = await context.newPage();
    await signInPage(page, app.url, nurse);
    await page.goto(`${app.url}/cases/${caseId}`);
    await page.getByTestId('save-state').waitFor();
    expect(await page.getByTestId('save-state').textContent()).toBe('All saved');

    await context.setOffline(true);
    await page.getByTestId('tab-doses').click();
    await page.getByRole('button', { name: /propofol/i }).first().click();
    await page.getByLabel(/propofol amount/i).fill('40');
    await page.getByTestId('record-dose').click();
    await page.getByRole('button', { name: /propofol/i }).first().click();
    await page.getByLabel(/propofol amount/i).fill('20');
    await page.getByTestId('record-dose').click();
    await page.getByTestId('tab-interventions').click();
    await page.getByRole('button', { name: 'Jaw thrust' }).click();
    await page.getByRole('button', { name: 'Chin lift' }).click();
    await page.waitForFunction(() => /4 entries wait/.test(document.querySelector('[data-testid=save-state]')?.textContent ?? ''));
    await page.screenshot({ path: artifactPath('offline', '01-waiting'), fullPage: true });
    const count = async (table: string) => (await testSql(app).get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "${table}" WHERE "caseId" = ?`, [caseId]))!.n;
    expect((await count('Dose')) + (await count('Intervention'))).toBe(0);

    await context.setOffline(false);
    await page.waitForFunction(() => document.querySelector('[data-testid=save-state]')?.textContent === 'All saved', undefined, { timeout: 20_000 });
    await page.screenshot({ path: artifactPath('offline', '02-all-saved'), fullPage: true });
    expect(await count('Dose')).toBe(2);
    expect(await count('Intervention')).toBe(2);
    // Later retries and polls never duplicate them.
    await page.waitForTimeout(3000);
    expect(await count('Dose')).toBe(2);
    expect(await count('Intervention')).toBe(2);
    await context.close();
  });

  it('survives a page reload with entries still waiting', async () => {
    const nurse = app.account('nurse');
    const api = new Client(app.url);
    await api.signIn(nurse.username, nurse.password);
    const caseId = (await api.post('/api/v1/cases', { patient: { mrn: 'OFF-0002', familyName: 'Offline', givenName: 'Oscar', birthDate: '1966-07-08', sex: 'male' }, procedureType: 'colonoscopy', roomId: 'room-1', plannedDepth: 'deep' })).json.id as string;
    const context = await browser.newContext();
    const page = await context.newPage();
    await signInPage(page, app.url, nurse);
    await page.goto(`${app.url}/cases/${caseId}`);
    await page.getByTestId('save-state').waitFor();
    // Block only the entries endpoint, so the page itself can reload.
    await page.route('**/entries', (route) => route.abort('internetdisconnected'));
    await page.getByTestId('tab-interventions').click();
    await page.getByRole('button', { name: 'Verbal / tactile stimulation' }).click();
    await page.waitForFunction(() => /1 entry waits/.test(document.querySelector('[data-testid=save-state]')?.textContent ?? ''));
    await page.reload();
    await page.waitForFunction(() => /1 entry waits/.test(document.querySelector('[data-testid=save-state]')?.textContent ?? ''));
    await page.unroute('**/entries');
    await page.waitForFunction(() => document.querySelector('[data-testid=save-state]')?.textContent === 'All saved', undefined, { timeout: 20_000 });
    expect((await testSql(app).get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "Intervention" WHERE "caseId" = ? AND "kind" = 'stimulation'`, [caseId]))!.n).toBe(1);
    await context.close();
  });
});
