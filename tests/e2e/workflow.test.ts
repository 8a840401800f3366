import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { E2E_BASE, islandReady, SHOTS, signInThroughForm, useBrowser } from '../support/e2e';
import { readFileSync } from 'node:fs';
import DxfParser from 'dxf-parser';
import { parsePlateSpec, plateProfile } from '../../src/domain/index';

const base = E2E_BASE;
const demoSpec = JSON.parse(readFileSync(new URL('../../templates/plates/demo.json', import.meta.url), 'utf8'));
const browser = useBrowser();

const signedIn = (email: string) => signInThroughForm(browser(), email, { viewport: { width: 1366, height: 900 }, acceptDownloads: true });

/** Save a revision the way the editor does (same session cookie, same endpoint). */
async function saveRevision(page: Page, plateId: number, spec: unknown, message: string, parentRevisionId: number | null): Promise<number> {
  const r = await page.request.post(`${base}/api/plates/${plateId}/revisions`, { data: { spec, message, parentRevisionId }, headers: { origin: base } });
  expect(r.status(), await r.text()).toBe(201);
  return (await r.json()).revision.id;
}

describe('designer → engineer → machinist in Chromium', () => {
  it('drafts, submits, gets changes requested, resubmits, is approved, and the machinist downloads the DXF', async () => {
    const designer = await signedIn('designer@example.test');
    const engineer = await signedIn('engineer@example.test');
    const machinist = await signedIn('machinist@example.test');
    const d = designer.page;

    // designer: a new project and a plate, from the projects screen
    await d.goto(base + '/projects');
    await islandReady(d.getByLabel('Name'));
    await d.getByLabel('Name').fill('E2E swap: invented roadster');
    await d.getByLabel(/Swap/).fill('Invented test engine into an invented roadster.');
    await Promise.all([d.waitForURL(/\/projects\/\d+$/), d.getByRole('button', { name: 'Create project' }).click()]);
    await islandReady(d.getByLabel('Title'));
    await d.getByLabel('Title').fill('E2E adapter plate');
    await Promise.all([d.waitForURL(/\/plates\/\d+/), d.getByRole('button', { name: 'Add plate' }).click()]);
    const plateId = Number(new URL(d.url()).pathname.split('/').pop());
    const partNumber = (await d.locator('h1').innerText()).trim();
    expect(partNumber).toMatch(/^PW-\d{4}$/);

    const rev1 = await saveRevision(d, plateId, demoSpec, 'First layout', null);
    await d.goto(`${base}/plates/${plateId}`);
    await islandReady(d.getByRole('button', { name: 'Submit revision 1 for review' }));
    await d.getByRole('button', { name: 'Submit revision 1 for review' }).click();
    await d.getByText('In review', { exact: true }).first().waitFor();
    await d.screenshot({ path: `${SHOTS}/workflow-1-submitted.png`, fullPage: true });

    // engineer: the queue shows it; requests changes with a comment
    const e = engineer.page;
    await e.goto(base + '/review');
    const row = e.getByTestId('review-queue').locator('tr', { hasText: partNumber });
    await expect(row.innerText()).resolves.toMatch(/rev 1/);
    await e.screenshot({ path: `${SHOTS}/workflow-2-queue.png`, fullPage: true });
    await Promise.all([e.waitForURL(/\/plates\/\d+/), row.getByRole('link', { name: partNumber }).click()]);
    await islandReady(e.getByRole('button', { name: 'Request changes' }));
    await e.getByRole('button', { name: 'Request changes' }).click();
    await expect(e.getByRole('alert').innerText()).resolves.toMatch(/comment|change/i); // no comment yet: refused inline
    await e.getByLabel(/Comment/).fill('Widen the edge margin to 14 mm around the starter.');
    await e.getByRole('button', { name: 'Request changes' }).click();
    await e.getByText('Changes requested', { exact: true }).first().waitFor();

    // designer: sees the comment, saves rev 2 and submits it
    await d.goto(`${base}/plates/${plateId}`);
    await expect(d.getByTestId('history').innerText()).resolves.toContain('Widen the edge margin');
    const rev2 = await saveRevision(d, plateId, { ...demoSpec, outline: { ...demoSpec.outline, edgeMarginMm: 14 } }, 'Edge margin 14 mm', rev1);
    await d.goto(`${base}/plates/${plateId}?rev=${rev2}`);
    await islandReady(d.getByRole('button', { name: 'Submit revision 2 for review' }));
    await d.getByRole('button', { name: 'Submit revision 2 for review' }).click();
    await d.getByText('In review', { exact: true }).first().waitFor();

    // engineer: approves rev 2 (files are generated and stored)
    await e.goto(`${base}/plates/${plateId}?rev=${rev2}`);
    await islandReady(e.getByLabel(/Comment/));
    await e.getByLabel(/Comment/).fill('Margin fixed; released.');
    await e.getByRole('button', { name: 'Approve revision 2' }).click();
    await e.getByText('Released', { exact: true }).first().waitFor({ timeout: 60_000 });
    await e.screenshot({ path: `${SHOTS}/workflow-3-approved.png`, fullPage: true });

    // machinist: the shop lists it; the DXF downloads and parses
    const m = machinist.page;
    await m.goto(base + '/shop');
    const card = m.locator(`article[data-part="${partNumber}"]`);
    await expect(card.innerText()).resolves.toMatch(/rev 2/);
    await m.screenshot({ path: `${SHOTS}/workflow-4-shop.png`, fullPage: true });
    const [download] = await Promise.all([m.waitForEvent('download'), card.getByRole('link', { name: 'Profile (DXF)' }).click()]);
    expect(download.suggestedFilename()).toBe(`${partNumber}-rev2.dxf`);
    const path = await download.path();
    const dxf = new DxfParser().parseSync(readFileSync(path!, 'utf8'))!;
    expect(dxf.header.$INSUNITS).toBe(4); // DXF reference: $INSUNITS 4 = millimetres
    const circles = dxf.entities.filter((x) => x.type === 'CIRCLE').length;
    const holes = plateProfile(parsePlateSpec({ ...demoSpec, outline: { ...demoSpec.outline, edgeMarginMm: 14 } })).holes;
    // one CIRCLE per hole, plus one per counterbore (on its own layer)
    expect(circles).toBe(holes.length + holes.filter((h) => h.counterbore).length);
    // and the machinist cannot open the first, unreleased revision
    const hidden = await m.request.get(`${base}/api/revisions/${rev1}`);
    expect(hidden.status()).toBe(404);

    await designer.context.close();
    await engineer.context.close();
    await machinist.context.close();
  });
});
