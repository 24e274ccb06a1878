/** Debian Chromium driven by playwright-core (never `playwright install`). */
import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser } from 'playwright-core';
import { ROOT } from './appServer';

export const CHROMIUM = process.env.PLATEAU_CHROMIUM ?? '/usr/bin/chromium';
export const ARTIFACTS = path.join(ROOT, 'tests', 'artifacts');

export function chromiumAvailable(): boolean {
  const present = fs.existsSync(CHROMIUM);
  if (!present && process.env.PLATEAU_REQUIRE_BROWSER === '1') throw new Error(`Chromium is required but missing at ${CHROMIUM}`);
  return present;
}

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-quic'],
  });
}

/** Where a test keeps its screenshots. */
export function artifactPath(test: string, step: string): string {
  const dir = path.join(ARTIFACTS, test);
  fs.mkdirSync(dir, { recursive: true });
  return path.join(dir, `${step}.png`);
}

/** Signs in through the form, as a person would, and waits for the start page. */
export async function signInPage(page: import('playwright-core').Page, baseUrl: string, account: { username: string; password: string }, landing: RegExp = /\/cases$/): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('Username').fill(account.username);
  await page.getByLabel('Password').fill(account.password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(landing);
}
