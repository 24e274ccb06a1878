import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startApp, type AppServer } from '../helpers/appServer';
import { artifactPath, chromiumAvailable, launchBrowser } from '../helpers/browser';

const haveBrowser = chromiumAvailable();

describe.skipIf(!haveBrowser)('a demo nurse in Chromium', () => {
  let app: AppServer;
  let browser: Browser;

  beforeAll(async () => {
    app = await startApp({ cases: 30 });
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await app?.stop();
  });

  it('signs in, sees today\'s cases by room, and the caution line on every screen', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    const nurse = app.account('nurse');
    await page.goto(`${app.url}/cases`);
    await page.waitForURL(/\/sign-in/);
    await expect(page.getByTestId('caution').textContent()).resolves.toMatch(/not an alarm and not a medical device/);
    await page.screenshot({ path: artifactPath('sign-in', '01-sign-in'), fullPage: true });

    await page.getByLabel('Username').fill(nurse.username);
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.locator('#signin-error').waitFor();
    expect(await page.locator('#signin-error').textContent()).toMatch(/not right/);

    await page.getByLabel('Password').fill(nurse.password);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/cases$/);
    const rooms = page.getByTestId('room');
    expect(await rooms.count()).toBeGreaterThanOrEqual(4);
    expect(await page.getByTestId('case-row').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('who').textContent()).toContain(nurse.displayName);
    await expect(page.getByTestId('caution').textContent()).resolves.toMatch(/clinical judgement/);
    await page.screenshot({ path: artifactPath('sign-in', '02-cases-today'), fullPage: true });

    await page.getByTestId('case-row').first().click();
    await page.waitForURL(/\/cases\/[^/]+$/);
    await page.getByTestId('save-state').waitFor();
    expect(await page.getByTestId('episode-panel').count()).toBe(1);
    await page.screenshot({ path: artifactPath('sign-in', '03-case-facts'), fullPage: true });

    await page.goto(`${app.url}/admin`);
    expect(await page.getByRole('heading', { name: 'Not for your role' }).count()).toBe(1);
    await page.close();
  });
});
