import { describe, expect, it } from 'vitest';
import { E2E_BASE, useBrowser } from '../support/e2e';

const base = E2E_BASE;
const browser = useBrowser();

describe('landing page in Chromium', () => {
  it('shows the title, the job, the navigation and uses the self-hosted font', async () => {
    const page = await browser().newPage();
    const fontRequests: string[] = [];
    const foreignRequests: string[] = [];
    page.on('request', (r) => {
      const url = r.url();
      if (!url.startsWith(base) && !url.startsWith('data:')) foreignRequests.push(url);
      if (r.resourceType() === 'font') fontRequests.push(url);
    });
    const fontResponses: { url: string; status: number; type: string | undefined }[] = [];
    page.on('response', (r) => {
      if (r.request().resourceType() === 'font') fontResponses.push({ url: r.url(), status: r.status(), type: r.headers()['content-type'] });
    });
    await page.goto(base + '/', { waitUntil: 'networkidle' });
    expect(await page.title()).toBe('Platewright');
    await expect(page.locator('h1').innerText()).resolves.toMatch(/measured flanges/i);
    const nav = await page.locator('nav[aria-label="Main"] a').allInnerTexts();
    expect(nav).toEqual(expect.arrayContaining(['Projects', 'Review', 'Shop', 'Admin']));

    // The font is Source Sans 3, loaded from the app itself (no font from the network).
    const family = await page.evaluate(() => getComputedStyle(document.body).fontFamily);
    expect(family).toMatch(/Source Sans 3/);
    const loaded = await page.evaluate(async () => {
      await document.fonts.ready;
      return [...document.fonts].filter((f) => f.status === 'loaded').map((f) => f.family);
    });
    expect(loaded.some((f) => /Source Sans 3/.test(f))).toBe(true);
    expect(fontRequests.length).toBeGreaterThan(0);
    for (const f of fontResponses) {
      expect(f.url.startsWith(base + '/_astro/')).toBe(true);
      expect(f.status).toBe(200);
    }
    expect(foreignRequests).toEqual([]);
    await page.screenshot({ path: '.test-artifacts/landing.png', fullPage: true });
    await page.close();
  });
});
