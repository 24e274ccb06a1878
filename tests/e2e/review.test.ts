import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startApp, testSql, type AppServer } from '../helpers/appServer';
import { artifactPath, chromiumAvailable, launchBrowser } from '../helpers/browser';

const haveBrowser = chromiumAvailable();

describe.skipIf(!haveBrowser)('the lead’s monthly review in Chromium', () => {
  let app: AppServer;
  let browser: Browser;

  beforeAll(async () => {
    app = await startApp({ cases: 120 });
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it('signs in, opens last month, follows a funnel point to a case’s episode chart, and records a review', async () => {
    const context = await browser.newContext({ viewport: { width: 1400, height: 900 } });
    const page = await context.newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    const lead = app.account('lead');

    await page.goto(`${app.url}/review`);
    await page.waitForURL(/\/sign-in/);
    await page.getByLabel('Username').fill(lead.username);
    await page.getByLabel('Password').fill(lead.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/cases/);
    await page.getByRole('link', { name: 'Monthly review' }).first().click();
    await page.waitForURL(/\/review$/);

    // Last month is the default.
    const now = new Date();
    const last = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 15));
    const lastName = new Intl.DateTimeFormat('en-GB', { month: 'long', year: 'numeric', timeZone: 'UTC' }).format(last);
    await expect(page.getByTestId('period-label').textContent()).resolves.toBe(lastName);
    const sedated = Number((await page.getByTestId('sedated-cases').locator('.kf-value').textContent())?.trim());
    expect(sedated).toBeGreaterThan(0);
    expect(await page.getByTestId('p-chart').count()).toBeGreaterThanOrEqual(4);
    expect(await page.getByTestId('funnel-chart').count()).toBe(2);
    await page.screenshot({ path: artifactPath('review', '01-last-month'), fullPage: true });

    // A funnel outlier if there is one with cases behind it, else any point with cases.
    const points = page.locator('[data-testid=funnel-proceduralist] [data-testid=funnel-point], [data-testid=funnel-nurse] [data-testid=funnel-point]');
    const n = await points.count();
    expect(n).toBeGreaterThan(0);
    let chosen = -1;
    for (const wanted of ['outlier', 'alert', 'none']) {
      for (let i = 0; i < n && chosen < 0; i++) {
        const p = points.nth(i);
        if ((await p.getAttribute('data-flag')) === wanted && Number(await p.getAttribute('data-x')) > 0) chosen = i;
      }
    }
    expect(chosen).toBeGreaterThanOrEqual(0);
    const label = await points.nth(chosen).getAttribute('data-label');
    const x = Number(await points.nth(chosen).getAttribute('data-x'));
    await points.nth(chosen).locator('circle').click();
    await page.waitForURL(/\/review\/cases\?/);
    expect(await page.getByTestId('cases-title').textContent()).toContain(label ?? '');
    expect(await page.getByTestId('review-case-row').count()).toBe(x);
    await page.screenshot({ path: artifactPath('review', '02-funnel-point-cases'), fullPage: true });

    // The case's evidence: timeline and each episode's chart segment.
    await page.getByTestId('review-case-link').first().click();
    await page.waitForURL(/\/review\/cases\/[^/?]+$/);
    const chart = page.getByTestId('episode-chart').first();
    await chart.waitFor();
    await chart.locator('canvas').first().waitFor();
    expect(await page.getByTestId('episode-segment').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('timeline').locator('tbody tr').count()).toBeGreaterThan(3);
    await chart.scrollIntoViewIfNeeded();
    await page.screenshot({ path: artifactPath('review', '03-episode-chart'), fullPage: true });

    // Record the review.
    const caseId = decodeURIComponent(new URL(page.url()).pathname.split('/').pop()!);
    const form = page.getByTestId('review-form');
    await form.getByText('Reviewed', { exact: true }).click();
    await form.getByLabel('Contributing factor').selectOption('depth_beyond_plan');
    await form.getByLabel('Comment').fill('Planned moderate; the apnea came 40 s after a second propofol bolus.');
    await form.getByLabel('Follow-up actions').fill('Share at the sedation meeting; remind the team to wait 60 s between boluses.');
    await page.getByTestId('save-review').click();
    await expect(page.getByTestId('review-saved').textContent()).resolves.toMatch(/Saved \(version 1\)/);
    await form.scrollIntoViewIfNeeded();
    await page.screenshot({ path: artifactPath('review', '04-review-recorded'), fullPage: false });

    const stored = await testSql(app).get('SELECT "status", "category", "version" FROM "CaseReview" WHERE "caseId" = ?', [caseId]);
    const audit = await testSql(app).all(`SELECT "action" FROM "AuditEntry" WHERE "entity" = 'case_review' AND "caseId" = ?`, [caseId]);
    expect(stored).toEqual({ status: 'reviewed', category: 'depth_beyond_plan', version: 1 });
    expect(audit).toEqual([{ action: 'create' }]);

    // After a reload the form shows the saved review; a second tab's stale save is refused.
    const other = await context.newPage();
    await other.goto(page.url());
    await page.reload();
    await page.getByTestId('review-meta').waitFor();
    await page.getByLabel('Comment').fill('Updated after talking to the nurse.');
    await page.getByTestId('save-review').click();
    await expect(page.getByTestId('review-saved').textContent()).resolves.toMatch(/version 2/);
    await other.getByLabel('Comment').fill('An older view');
    await other.getByTestId('save-review').click();
    await expect(other.getByTestId('review-error').textContent()).resolves.toMatch(/after you opened it/);
    await other.screenshot({ path: artifactPath('review', '05-stale-edit-refused'), fullPage: false });
    await other.close();
    expect(errors).toEqual([]);
    await context.close();
  });
});
