import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { startApp, type AppServer } from '../helpers/appServer';
import { artifactPath, chromiumAvailable, launchBrowser } from '../helpers/browser';

const haveBrowser = chromiumAvailable();

async function signIn(page: Page, app: AppServer, role: string) {
  const a = app.account(role);
  await page.goto(`${app.url}/sign-in`);
  await page.getByLabel('Username').fill(a.username);
  await page.getByLabel('Password').fill(a.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
}

describe.skipIf(!haveBrowser)('safety indicators in Chromium', () => {
  let app: AppServer;
  let browser: Browser;

  beforeAll(async () => {
    app = await startApp({ cases: 150 });
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it('the safety officer issues the last quarter; a lead opens a counted case from its reference', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(page, app, 'safety');
    await page.goto(`${app.url}/reports`);
    await page.getByTestId('indicator-summary').waitFor();
    expect(await page.locator('[data-testid="indicator-summary"] tbody tr').count()).toBe(13);
    await page.screenshot({ path: artifactPath('indicators', '01-draft-report'), fullPage: true });
    await page.screenshot({ path: artifactPath('indicators', '01a-draft-top') });
    await page.locator('#ind-apnea').scrollIntoViewIfNeeded();
    await page.screenshot({ path: artifactPath('indicators', '01b-draft-indicator') });
    await page.getByTestId('issue-report').click();
    await page.waitForURL(/\/reports\/issued\/[^/]+$/);
    await page.getByText('issued, frozen').waitFor();
    expect(await page.getByTestId('diff').textContent()).toMatch(/first version/);
    const issuedUrl = page.url();
    await page.screenshot({ path: artifactPath('indicators', '02-issued-v1'), fullPage: true });
    await page.screenshot({ path: artifactPath('indicators', '02a-issued-top') });
    await page.close();

    const lead = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(lead, app, 'lead');
    await lead.goto(issuedUrl);
    const refs = lead.getByTestId('refs-capnography_90');
    await refs.locator('summary').click();
    const ref = (await refs.locator('code').first().textContent())!;
    expect(ref).toMatch(/^R-[0-9A-Z]{8}$/);
    await lead.getByPlaceholder('R-XXXXXXXX').fill(ref);
    await lead.getByRole('button', { name: 'Open the case' }).click();
    await lead.waitForURL(/\/cases\/[^/]+$/);
    await lead.screenshot({ path: artifactPath('indicators', '03-resolved-case'), fullPage: false });
    await lead.close();
  });
});
