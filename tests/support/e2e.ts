/**
 * What every end-to-end test file shares: the app's address, the demo password, the screenshot
 * folder, one headless Chromium per file and signing in through the form.
 */
import { afterAll, beforeAll } from 'vitest';
import type { Browser, BrowserContext, Locator, Page } from 'playwright-core';
import { mkdirSync } from 'node:fs';
import { launchBrowser } from './browser';
import { testAppPort } from './server';

export const E2E_BASE = process.env.E2E_BASE_URL ?? `http://127.0.0.1:${testAppPort()}`;
export const DEMO_PASSWORD = process.env.DEMO_PASSWORD ?? 'platewright-demo';
export const SHOTS = '.test-artifacts/screens';

/** Launches Chromium before the file's tests and closes it after; call at the top of the file. */
export function useBrowser(): () => Browser {
  let browser: Browser | undefined;
  beforeAll(async () => {
    mkdirSync(SHOTS, { recursive: true });
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });
  return () => {
    if (!browser) throw new Error('the browser is not running yet (use it inside a test)');
    return browser;
  };
}

/** A new browser context signed in through the sign-in form (Enter in the password field). */
export async function signInThroughForm(
  browser: Browser,
  email: string,
  opts: { viewport?: { width: number; height: number }; acceptDownloads?: boolean; password?: string } = {},
): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport: opts.viewport ?? { width: 1366, height: 900 }, acceptDownloads: opts.acceptDownloads ?? false });
  const page = await context.newPage();
  await page.goto(E2E_BASE + '/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(opts.password ?? DEMO_PASSWORD);
  await Promise.all([page.waitForURL((u) => u.pathname !== '/sign-in'), page.getByLabel('Password').press('Enter')]);
  return { context, page };
}

/** Islands answer clicks only once hydrated (Astro drops the ssr attribute then): wait for that. */
export async function hydrated(page: Page): Promise<void> {
  await page.waitForFunction(() => document.querySelectorAll('astro-island[ssr]').length === 0, undefined, { timeout: 30_000 });
}

/** Waits until the island holding `target` is hydrated (islands shown `client:visible` further down may still wait). */
export async function islandReady(target: Locator): Promise<void> {
  const el = await target.first().elementHandle({ timeout: 30_000 });
  await target.page().waitForFunction((node) => !node?.closest('astro-island')?.hasAttribute('ssr'), el, { timeout: 30_000 });
}
