import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { startApp, testSql, type AppServer } from '../helpers/appServer';
import { artifactPath, chromiumAvailable, launchBrowser, signInPage } from '../helpers/browser';
import { Client } from '../helpers/client';

const haveBrowser = chromiumAvailable();

describe.skipIf(!haveBrowser)('when a sedation case turns into a cardiac arrest', () => {
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
  const shot = (page: Page, step: string) => page.screenshot({ path: artifactPath('resuscitation', step), fullPage: true });
  const allSaved = (page: Page) => page.waitForFunction(() => document.querySelector('[data-testid=save-state]')?.textContent === 'All saved', undefined, { timeout: 20_000 });

  it('the nurse documents compressions, two shocks, epinephrine and return of circulation in the resuscitation view', async () => {
    const nurse = app.account('nurse');
    const api = new Client(app.url);
    await api.signIn(nurse.username, nurse.password);
    const caseId = (await api.post('/api/v1/cases', { patient: { mrn: 'RES-0001', familyName: 'Arrest', givenName: 'Ari', birthDate: '1950-01-01', sex: 'male' }, procedureType: 'ercp', roomId: 'room-3', plannedDepth: 'deep', weightKg: 80 })).json.id as string;

    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    await signInPage(page, app.url, nurse);
    await page.goto(`${app.url}/cases/${caseId}`);
    await page.getByTestId('save-state').waitFor();
    await page.getByTestId('tab-interventions').click();
    await page.getByRole('button', { name: 'Chest compressions' }).click();
    await page.getByTestId('resus-panel').waitFor();
    await shot(page, '01-resuscitation-view');
    await page.getByTestId('resus-shock').click();
    await page.getByTestId('resus-epinephrine').click();
    await page.getByTestId('resus-shock').click();
    await page.getByLabel('Team note').fill('second shock 200 J');
    await page.getByRole('button', { name: 'Add' }).click();
    await allSaved(page);
    await page.waitForFunction(() => (document.querySelector('[data-testid=resus-timeline]')?.textContent?.match(/Shock delivered/g) ?? []).length === 2);
    expect(await page.getByTestId('resus-timeline').textContent()).toMatch(/epinephrine 1 mg IV/);
    expect(await page.getByTestId('compression-clock').textContent()).toMatch(/^\d\d:\d\d$/);
    await shot(page, '02-shocks-and-epinephrine');
    await page.getByTestId('resus-rosc').click();
    await allSaved(page);
    await page.getByTestId('resus-panel').waitFor({ state: 'detached', timeout: 20_000 });
    expect(await page.getByTestId('case-level').textContent()).toBe('Rescued');
    await shot(page, '03-after-return-of-circulation');

    const db = testSql(app);
    const kinds = (await db.all<{ kind: string }>('SELECT "kind" FROM "CaseEvent" WHERE "caseId" = ? ORDER BY "at"', [caseId])).map((r) => r.kind);
    expect(kinds.filter((k) => k === 'shock')).toHaveLength(2);
    expect(kinds).toContain('rosc');
    expect((await db.get<{ note: string }>(`SELECT "note" FROM "CaseEvent" WHERE "caseId" = ? AND "kind" = 'team_note'`, [caseId]))!.note).toBe('second shock 200 J');
    expect((await db.get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "Dose" WHERE "caseId" = ? AND "drug" = 'epinephrine'`, [caseId]))!.n).toBe(1);
    expect((await db.get<{ caseLevel: string }>('SELECT "caseLevel" FROM "CaseSummary" WHERE "caseId" = ?', [caseId]))!.caseLevel).toBe('rescued');

    // The note has its own resuscitation section with the timeline.
    const note = (await api.get(`/api/v1/cases/${caseId}/note`)).json.draft;
    expect(note.resuscitation.timeline.map((x: { label: string }) => x.label)).toEqual(['Compressions started', 'Shock delivered', 'epinephrine 1 mg IV', 'Shock delivered', 'Team note', 'Return of circulation recorded']);
    expect(note.text).toMatch(/RESUSCITATION/);
    await page.close();
  });
});
