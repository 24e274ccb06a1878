import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { startApp, ROOT, testSql, type AppServer } from '../helpers/appServer';
import { artifactPath, chromiumAvailable, launchBrowser, signInPage } from '../helpers/browser';

const haveBrowser = chromiumAvailable();
const CSV = path.join(ROOT, 'tests', 'fixtures', 'csv', 'monitor-apnea.csv');

describe.skipIf(!haveBrowser)('the bedside story, from opening a case to discharge', () => {
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

  const shot = (page: Page, step: string) => page.screenshot({ path: artifactPath('bedside-story', step), fullPage: true });
  const allSaved = (page: Page) => page.waitForFunction(() => document.querySelector('[data-testid=save-state]')?.textContent === 'All saved', undefined, { timeout: 20_000 });

  it('documents a whole case for a new patient', async () => {
    const nurse = app.account('nurse');
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    await signInPage(page, app.url, nurse);
    await shot(page, '01-cases-today');

    // Open a case for a new patient.
    await page.getByTestId('new-case').click();
    await page.getByTestId('add-patient').click();
    await page.getByLabel('Record number').fill('KBD-990001');
    await page.getByLabel('Family name').fill('Storyteller');
    await page.getByLabel('Given name').fill('Sam');
    await page.getByLabel('Birth date').fill('1962-04-12');
    await page.getByLabel('Sex').selectOption('male');
    await page.getByLabel('Procedure', { exact: true }).selectOption('colonoscopy');
    await page.getByText('Moderate sedation', { exact: true }).click();
    await page.locator('label.chip', { hasText: /^II$/ }).click();
    await page.getByLabel('Weight (kg)').fill('92');
    await page.getByLabel('Height (cm)').fill('178');
    expect(await page.getByTestId('bmi').textContent()).toBe('29');
    for (const [q, yes] of [['Snoring', true], ['Tired', false], ['Observed apnoea', false], ['Pressure', true]] as const) {
      await page.locator('.yn', { hasText: q }).locator('label.chip', { hasText: yes ? 'yes' : 'no' }).click();
    }
    // S, P, age > 50 and male: 4 of 8; 2 STOP items plus male sex makes it high (Chung et al. 2016, Chest 149:631-8).
    expect(await page.getByTestId('stopbang-result').textContent()).toMatch(/Score 4\/8 · High risk/);
    await shot(page, '02-open-case');
    await page.getByTestId('open-case').click();
    await page.waitForURL(/\/cases\/[0-9a-f-]{36}$/);
    const caseId = page.url().split('/').pop()!;
    await page.getByTestId('save-state').waitFor();

    // Sedation start, then three doses.
    await page.getByTestId('tab-markers').click();
    await page.getByTestId('marker-sedation_start').click();
    await page.getByTestId('tab-doses').click();
    for (const [drug, amount] of [['propofol', '60'], ['fentanyl', '50'], ['propofol', '30']] as const) {
      await page.locator('.drug-grid button', { hasText: drug }).click();
      await page.getByLabel(new RegExp(`${drug} amount`, 'i')).fill(amount);
      await page.getByTestId('record-dose').click();
    }
    await allSaved(page);
    expect(await page.getByTestId('dose-totals').textContent()).toMatch(/Propofol90 mg0\.978 mg\/kg2/);
    await shot(page, '03-doses');

    // Import the monitor CSV with an apnea.
    await page.getByTestId('tab-import').click();
    await page.getByTestId('csv-file').setInputFiles(CSV);
    await page.getByTestId('csv-preview').waitFor();
    await shot(page, '04-import-preview');
    await page.getByTestId('csv-import').click();
    await page.getByTestId('csv-done').waitFor();
    // The sheet's next poll brings the samples and the analysis.
    await page.locator('[data-testid=episode-row][data-rule=apnea]').waitFor({ timeout: 20_000 });
    await shot(page, '05-apnea-in-episode-panel');

    // Jaw thrust, then re-timed to when it was done (the apnea began 1,500 s into the file).
    await page.getByTestId('tab-interventions').click();
    await page.getByRole('button', { name: 'Jaw thrust' }).click();
    await allSaved(page);
    await page.getByTestId('tab-history').click();
    await page.getByRole('button', { name: 'Re-time Jaw thrust' }).click();
    const startAt = Date.parse((await (await page.request.get(`${app.url}/api/v1/cases/${caseId}/sheet`)).json()).case.startAt);
    const when = new Intl.DateTimeFormat('en-GB', { timeZone: 'Europe/Dublin', hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23' }).format(new Date(startAt + 1512_000));
    await page.getByLabel('Time (HH:MM:SS)').fill(when);
    await page.getByRole('button', { name: 'Set time' }).click();
    await allSaved(page);
    await page.waitForFunction(() => /Jaw thrust/.test(document.querySelector('[data-testid=episode-row][data-rule=apnea]')?.textContent ?? ''), undefined, { timeout: 20_000 });
    // The typed time has one-second resolution: the response is from the apnea's start (1,500 s into the file) to that second.
    const expectedResponse = Math.round((Math.floor((startAt + 1512_000) / 1000) * 1000 - (startAt + 1500_000)) / 1000);
    expect(await page.locator('[data-testid=episode-row][data-rule=apnea]').textContent()).toContain(`${expectedResponse} s · Jaw thrust`);
    await shot(page, '06-jaw-thrust-linked');

    // Void the wrong dose (the fentanyl) with a reason.
    await page.getByRole('button', { name: 'Void fentanyl 50 mcg IV' }).click();
    await page.getByLabel('Why is it wrong?').fill('entered on the wrong patient');
    await page.getByTestId('confirm-void').click();
    await allSaved(page);
    await page.waitForFunction(() => /voided by .*entered on the wrong patient/.test(document.querySelector('[data-testid=history-panel]')?.textContent ?? ''));
    await shot(page, '07-voided-dose');

    // Recovery: score, then discharge.
    await page.getByTestId('tab-markers').click();
    await page.getByTestId('marker-recovery_start').click();
    await page.getByTestId('tab-recovery').click();
    for (const item of ['activity', 'respiration', 'circulation', 'consciousness', 'oxygenation']) await page.getByTestId(`aldrete-${item}-2`).click();
    expect(await page.getByTestId('aldrete-total').textContent()).toBe('10');
    await page.getByTestId('record-aldrete').click();
    await page.getByTestId('tab-markers').click();
    await page.getByTestId('marker-discharge').click();
    await allSaved(page);
    await shot(page, '08-discharged');

    /** The first row of a query about this case (its id is the one parameter). */
    const one = async <T,>(sql: string) => (await testSql(app).get<T>(sql, [caseId]))!;
    expect((await one<{ n: number }>('SELECT COUNT(*) AS "n" FROM "Dose" WHERE "caseId" = ? AND "voidedAt" IS NULL')).n).toBe(2);
    expect((await one<{ voidReason: string }>(`SELECT "voidReason" FROM "Dose" WHERE "caseId" = ? AND "drug" = 'fentanyl'`)).voidReason).toBe('entered on the wrong patient');
    expect((await one<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "Intervention" WHERE "caseId" = ? AND "kind" = 'jaw_thrust' AND "voidedAt" IS NULL`)).n).toBe(1);
    expect((await one<{ total: number }>('SELECT "total" FROM "RecoveryScore" WHERE "caseId" = ?')).total).toBe(10);
    expect((await one<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "CaseEvent" WHERE "caseId" = ? AND "kind" = 'discharge'`)).n).toBe(1);
    expect((await one<{ status: string }>('SELECT "status" FROM "Case" WHERE "id" = ?')).status).toBe('recovery');
    expect((await one<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "Sample" WHERE "caseId" = ? AND "source" = 'monitor'`)).n).toBe(14390);

    // The nurse signs the note.
    await page.getByTestId('open-note').click();
    await page.waitForURL(/\/note$/);
    expect(await page.getByTestId('note-text').textContent()).toMatch(/Apnea/);
    await page.getByLabel(/Nurse's notes/).fill('Patient comfortable; brief apnea relieved by jaw thrust.');
    await page.getByLabel(/Your password/).fill(nurse.password);
    await page.getByTestId('sign-note').click();
    await page.getByTestId('note-history').waitFor();
    expect(await page.getByTestId('note-text').textContent()).toMatch(/brief apnea relieved by jaw thrust/);
    await shot(page, '09-note-signed');
    await page.close();
  });
});
