import { describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { DEMO_PASSWORD, E2E_BASE, SHOTS, useBrowser } from '../support/e2e';
import { readFileSync } from 'node:fs';
import DxfParser from 'dxf-parser';

const base = E2E_BASE;
const PASSWORD = DEMO_PASSWORD;
const demoSpec = JSON.parse(readFileSync(new URL('../../templates/plates/demo.json', import.meta.url), 'utf8'));
const browser = useBrowser();

async function signedIn(email: string, viewport = { width: 1366, height: 768 }): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser().newContext({ viewport, acceptDownloads: true });
  const page = await context.newPage();
  const r = await page.request.post(`${base}/api/auth/sign-in`, { data: { email, password: PASSWORD }, headers: { origin: base } });
  expect(r.status(), await r.text()).toBe(200);
  return { context, page };
}

/** A fresh plate with the demo spec as revision 1, made through the API the way the app does. */
async function demoPlate(page: Page, title: string): Promise<{ plateId: number; revisionId: number }> {
  const p = await page.request.post(`${base}/api/projects`, { data: { name: `Editor test ${title}` }, headers: { origin: base } });
  expect(p.status(), await p.text()).toBe(201);
  const projectId = (await p.json()).project.id;
  const pl = await page.request.post(`${base}/api/projects/${projectId}/plates`, { data: { title }, headers: { origin: base } });
  expect(pl.status(), await pl.text()).toBe(201);
  const plateId = (await pl.json()).plate.id;
  const r = await page.request.post(`${base}/api/plates/${plateId}/revisions`, { data: { spec: demoSpec, message: 'demo start', parentRevisionId: null }, headers: { origin: base } });
  expect(r.status(), await r.text()).toBe(201);
  return { plateId, revisionId: (await r.json()).revision.id };
}

async function openEditor(page: Page, plateId: number): Promise<void> {
  await page.goto(`${base}/plates/${plateId}/edit`, { waitUntil: 'networkidle' });
  await page.getByTestId('plate-drawing').waitFor();
}

const count = async (page: Page, kind: 'error' | 'warning') => Number((await page.locator(`[data-count="${kind}"]`).innerText()).match(/\d+/)![0]);

describe('plate editor in Chromium', () => {
  it('edits the demo plate: bolt circle, overlap found and fixed, bad input, units, save, DXF export', async () => {
    const { context, page } = await signedIn('designer@example.test');
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    const { plateId } = await demoPlate(page, 'Editor walk-through');
    await openEditor(page, plateId);

    // safety panel on the first open of a plate
    const safety = page.getByTestId('safety-panel');
    await expect(safety.isVisible()).resolves.toBe(true);
    expect(await safety.innerText()).toMatch(/dial indicator/);
    await page.screenshot({ path: `${SHOTS}/editor-safety-1366.png` });
    await page.getByRole('button', { name: /I understand/ }).click();
    await expect(safety.count()).resolves.toBe(0);
    expect(await count(page, 'error')).toBe(0);

    // a bolt circle from the helper: 4 tapped M8 holes on 330 mm, first at 45°
    await page.getByRole('button', { name: '+ Bolt circle' }).click();
    await page.getByLabel('Bolt circle diameter').fill('330');
    await page.getByLabel('Hole count').fill('4');
    await page.getByLabel('Start angle').fill('45');
    await page.getByLabel('Hole role').selectOption('tapped');
    await page.getByLabel('Fastener', { exact: true }).fill('M8x1.25');
    await page.getByRole('button', { name: 'Add holes' }).click();
    for (const id of ['E9', 'E10', 'E11', 'E12']) {
      await page.locator(`[data-row="${id}"]`).waitFor();
      await expect(page.locator(`[data-testid="plate-drawing"] [data-feature="${id}"]`).count()).resolves.toBe(1);
    }
    // E9 at r = 165, 45°: x = y = 116.673 mm (as typed into the pattern)
    expect(Number(await page.getByLabel('E9 X').inputValue())).toBeCloseTo(165 * Math.SQRT1_2, 3);

    const errorsWithCircle = await count(page, 'error');
    expect(await page.locator('[data-finding-code="layout.overlap"]').count()).toBe(0);

    // move E1 onto E2: an overlap, in the panel and on the drawing
    const e2x = await page.getByLabel('E2 X').inputValue();
    const e2y = Number(await page.getByLabel('E2 Y').inputValue());
    const e1x = await page.getByLabel('E1 X').inputValue();
    const e1y = await page.getByLabel('E1 Y').inputValue();
    await page.getByLabel('E1 X').fill(e2x);
    await page.getByLabel('E1 Y').fill(String(e2y - 4));
    const panelFinding = page.locator('[data-testid="findings-panel"] [data-finding-code="layout.overlap"]').first();
    await panelFinding.waitFor({ state: 'attached' });
    expect(await panelFinding.innerText()).toMatch(/E1 and E2 overlap/);
    await expect(page.locator('[data-testid="plate-drawing"] [data-finding="layout.overlap"]').count()).resolves.toBeGreaterThan(0);
    expect(await count(page, 'error')).toBeGreaterThan(errorsWithCircle);
    // clicking the finding selects both holes: the dimension of the first shows
    await panelFinding.click();
    await page.getByTestId('dimension').waitFor();
    expect(await page.locator('[data-row="E2"][data-hot="true"]').count()).toBe(1);
    await page.screenshot({ path: `${SHOTS}/editor-overlap-1366.png` });

    // put it back: the finding goes away
    await page.getByLabel('E1 X').fill(e1x);
    await page.getByLabel('E1 Y').fill(e1y);
    await page.locator('[data-finding-code="layout.overlap"]').first().waitFor({ state: 'detached' });
    expect(await page.locator('[data-testid="plate-drawing"] [data-finding="layout.overlap"]').count()).toBe(0);
    expect(await count(page, 'error')).toBe(errorsWithCircle);

    // garbage is refused inline and changes nothing
    const before = await page.locator('[data-testid="plate-drawing"] [data-feature="E3"] circle').last().getAttribute('cx');
    await page.getByLabel('E3 X').fill('12,5');
    const alert = page.getByRole('alert').filter({ hasText: 'use a dot' });
    await alert.waitFor();
    expect(await page.locator('[data-testid="plate-drawing"] [data-feature="E3"] circle').last().getAttribute('cx')).toBe(before);
    await page.getByLabel('E3 X').press('Escape');
    await alert.waitFor({ state: 'detached' });

    // both units in a length cell: the other unit under the value (1 in = 25.4 mm)
    const e2Alt = await page.locator('[data-row="E2"] [data-alt-unit]').first().innerText();
    expect(e2Alt).toMatch(/ in$/);
    expect(Number(e2Alt.replace(' in', ''))).toBeCloseTo(Number(e2x) / 25.4, 3);
    // inch text typed in mm mode is read as inch: 4.5" = 114.3 mm
    await page.getByLabel('E3 X').fill('4.5"');
    await expect.poll(async () => Number(await page.locator('[data-testid="plate-drawing"] [data-feature="E3"] circle').last().getAttribute('cx'))).toBeCloseTo(114.3, 6);
    await page.keyboard.press('Control+z');
    await expect.poll(async () => page.locator('[data-testid="plate-drawing"] [data-feature="E3"] circle').last().getAttribute('cx')).toBe(before);

    // units: inch shown everywhere, the stored value unchanged
    const mmMessages = await page.locator('[data-finding-message]').allInnerTexts();
    await page.getByTestId('units-toggle').click();
    expect(await page.locator('th', { hasText: 'X (in)' }).count()).toBe(1);
    const e2xIn = Number(await page.getByLabel('E2 X').inputValue());
    expect(e2xIn).toBeCloseTo(Number(e2x) / 25.4, 3); // 1 in = 25.4 mm
    expect(await page.locator('[data-row="E2"] [data-alt-unit]').first().innerText()).toMatch(/^-?\d+\.\d\d mm$/);
    // findings in inch too: every "N mm" figure of the mm text now reads "X in [N mm]"
    const withMm = mmMessages.find((m) => /\d mm\b/.test(m));
    expect(withMm, 'the demo plate has a finding with a length in it').toBeDefined();
    const inchMessages = await page.locator('[data-finding-message]').allInnerTexts();
    const figure = /(\d+(?:\.\d+)?) mm/.exec(withMm!)![1]!;
    const inInch = inchMessages.find((m) => m.includes(`in [${figure} mm]`));
    expect(inInch, inchMessages.join('\n')).toBeDefined();
    expect(inInch).toContain(`${(Number(figure) / 25.4).toFixed(Math.max(3, (figure.split('.')[1]?.length ?? 0) + 1))} in [${figure} mm]`);
    await page.screenshot({ path: `${SHOTS}/editor-inch-1366.png` });

    // large monitor
    await page.setViewportSize({ width: 1920, height: 1080 });
    await page.waitForTimeout(200);
    await page.screenshot({ path: `${SHOTS}/editor-1920.png` });

    // save: a message is required, then it is revision 2 and shows in the history
    await page.getByTestId('save-button').click();
    await page.getByTestId('save-dialog').getByRole('button', { name: 'Save revision' }).click();
    await page.getByRole('alert').filter({ hasText: 'needs a message' }).waitFor();
    await page.getByLabel('What changed and why').fill('four tapped holes on 330 mm; inch display');
    await page.getByTestId('save-dialog').getByRole('button', { name: 'Save revision' }).click();
    const toast = page.getByTestId('toast');
    await toast.waitFor();
    expect(await toast.innerText()).toMatch(/Saved as revision 2/);
    const plate = await (await page.request.get(`${base}/api/plates/${plateId}`)).json();
    expect(plate.plate.revisions.map((r: { number: number }) => r.number)).toContain(2);
    const rev2 = plate.plate.revisions.find((r: { number: number }) => r.number === 2);
    const saved = (await (await page.request.get(`${base}/api/revisions/${rev2.id}`)).json()).revision.spec;
    expect(saved.engineFace.holes.map((h: { id: string }) => h.id)).toEqual(expect.arrayContaining(['E9', 'E10', 'E11', 'E12']));
    expect(saved.displayUnits.length).toBe('in');

    // DXF of the current state: every round feature is a circle
    await page.getByTestId('export-button').click();
    const [dl] = await Promise.all([page.waitForEvent('download'), page.locator('[data-export="dxf"]').click()]);
    expect(dl.suggestedFilename()).toMatch(/\.dxf$/);
    const text = readFileSync((await dl.path())!, 'utf8');
    const dxf = new DxfParser().parseSync(text)!;
    const circles = dxf.entities.filter((e) => e.type === 'CIRCLE' && !e.layer.startsWith('PW_CBORE'));
    // demo: 10 engine + 9 transmission + centre bore + starter bore + 2 starter holes = 23, plus the 4 new
    expect(circles.length).toBe(27);

    // the drawing PDF of the current state is a draft
    const pdf = await page.request.post(`${base}/api/plates/${plateId}/preview/drawing.pdf`, { data: { spec: saved, basedOnRevisionId: rev2.id }, headers: { origin: base } });
    expect(pdf.status(), pdf.status() === 200 ? '' : await pdf.text()).toBe(200);
    expect(pdf.headers()['content-disposition']).toMatch(/DRAFT-not-released\.pdf/);
    expect((await pdf.body()).subarray(0, 5).toString('latin1')).toBe('%PDF-');
    // a bad spec is refused with the field named, not drawn
    const badPdf = await page.request.post(`${base}/api/plates/${plateId}/preview/drawing.pdf`, { data: { spec: { ...saved, thicknessMm: 0 } }, headers: { origin: base } });
    expect(badPdf.status()).toBe(400);
    expect((await badPdf.json()).error.message).toMatch(/thicknessMm/);

    // 3D: the kernel's solid from the worker, rebuilt after an edit; STEP from the same solid
    await page.getByRole('tab', { name: '3D' }).click();
    await page.locator('[data-testid="plate-3d"][data-source="kernel"]').waitFor({ timeout: 90_000 });
    // the view is drawn: the canvas has pixels that are not the background
    await expect.poll(() => page.locator('[data-testid="plate-3d"] canvas').count()).toBe(1);
    await page.waitForTimeout(300);
    await page.screenshot({ path: `${SHOTS}/editor-3d-1920.png` });
    await page.getByRole('tab', { name: 'Drawing' }).click();
    await page.getByTestId('export-button').click();
    const [step] = await Promise.all([page.waitForEvent('download', { timeout: 60_000 }), page.locator('[data-export="step"]').click()]);
    expect(step.suggestedFilename()).toMatch(/DRAFT-not-released\.step$/);
    expect(readFileSync((await step.path())!, 'latin1').slice(0, 13)).toBe('ISO-10303-21;');

    await page.goto(`${base}/plates/${plateId}`);
    expect(await page.getByTestId('timeline').innerText()).toMatch(/rev 2/);
    expect(errors).toEqual([]);
    await context.close();
  });

  it('edits an own polygon outline: corner table, paste, drag, and clear messages for bad outlines', async () => {
    const { context, page } = await signedIn('designer@example.test');
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    const { plateId } = await demoPlate(page, 'Editor outline');
    await openEditor(page, plateId);
    await page.getByRole('button', { name: /I understand/ }).click();
    await page.getByRole('tab', { name: /Plate · outline/ }).click();
    await page.getByTestId('outline-polygon').check();
    const rows = page.locator('[data-testid="vertex-table"] tbody tr');
    await expect.poll(() => rows.count()).toBe(4);
    const arcsBefore = await page.getByTestId('outline').getAttribute('d');
    expect(await count(page, 'error')).toBe(0);

    // own radius on corner 1; the other unit shows under it (20 mm = 0.787 in)
    await page.getByLabel('Corner 1 radius').fill('20');
    expect(await page.locator('[data-vertex="1"] [data-alt-unit]').last().innerText()).toBe('0.787 in');
    await expect.poll(() => page.getByTestId('outline').getAttribute('d')).not.toBe(arcsBefore);

    // a radius too large for its corner: said in words, nothing crashes, the drawing keeps the last plate
    await page.getByLabel('Corner 1 radius').fill('900');
    const problems = page.getByTestId('outline-problems');
    await problems.waitFor();
    expect(await problems.innerText()).toMatch(/corner radii are too large for the edge from corner \d to corner \d/);
    await page.getByLabel('Corner 1 radius').fill('');
    await problems.waitFor({ state: 'detached' });

    // a bow tie: corners 3 and 4 swapped cross the outline
    await page.getByRole('button', { name: 'Move corner 3 down' }).click();
    await problems.waitFor();
    expect(await problems.innerText()).toMatch(/crosses itself: the edge from corner \d to \d crosses the edge from corner \d to \d/);
    await page.getByRole('button', { name: 'Move corner 3 down' }).click();
    await problems.waitFor({ state: 'detached' });

    // fewer than 3 corners
    await page.getByRole('button', { name: 'Delete corner 4' }).click();
    await page.getByRole('button', { name: 'Delete corner 3' }).click();
    await problems.waitFor();
    expect(await problems.innerText()).toMatch(/at least 3 corners; it has 2/);
    await page.keyboard.press('Control+z');
    await page.keyboard.press('Control+z');
    await problems.waitFor({ state: 'detached' });

    // paste a smaller outline (inch header): holes end up outside it, a check finding names them
    await page.getByTestId('vertex-paste').locator('summary').click();
    await page.getByLabel('Corner rows to paste').fill('X (in)\tY (in)\n-3\t-3\n3\t-3\n3\t3\n-3\t3');
    await page.getByRole('button', { name: 'Replace the corners' }).click();
    await expect.poll(() => rows.count()).toBe(4);
    // 3 in = 76.2 mm
    expect(await page.getByLabel('Corner 2 X').inputValue()).toBe('76.2');
    await page.locator('[data-testid="findings-panel"] [data-finding-code="outline.breakthrough"]').first().waitFor();
    expect(await count(page, 'error')).toBeGreaterThan(0);
    await page.screenshot({ path: `${SHOTS}/editor-outline-1366.png` });

    // drag corner 3 on the drawing: its X and Y follow the pointer (on a 0.5 mm grid)
    const handle = page.locator('[data-corner="3"] rect');
    const box = (await handle.boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width / 2 + 60, box.y + box.height / 2 - 40, { steps: 6 });
    await page.mouse.up();
    const x3 = Number(await page.getByLabel('Corner 3 X').inputValue());
    const y3 = Number(await page.getByLabel('Corner 3 Y').inputValue());
    expect(x3).toBeGreaterThan(76.2);
    expect(y3).toBeGreaterThan(76.2);
    expect((x3 * 2) % 1).toBe(0);
    // one undo step for the whole drag
    await page.keyboard.press('Control+z');
    await expect.poll(async () => page.getByLabel('Corner 3 X').inputValue()).toBe('76.2');

    // back to automatic: no vertex table, no outline errors
    await page.getByRole('radio', { name: /Automatic/ }).check();
    await expect.poll(() => page.getByTestId('vertex-table').count()).toBe(0);
    await expect.poll(() => count(page, 'error')).toBe(0);
    await page.setViewportSize({ width: 1920, height: 1080 });
    await page.getByTestId('outline-polygon').check();
    await page.waitForTimeout(200);
    await page.screenshot({ path: `${SHOTS}/editor-outline-1920.png` });
    expect(errors).toEqual([]);
    await context.close();
  });

  it('a stale save offers to reload and re-apply, or to save a branch; nothing typed is lost', async () => {
    const { context, page } = await signedIn('designer@example.test');
    const { plateId, revisionId } = await demoPlate(page, 'Editor conflict');
    await openEditor(page, plateId);
    await page.getByRole('button', { name: /I understand/ }).click();
    // someone else saves revision 2 meanwhile (thicker plate)
    const other = await page.request.post(`${base}/api/plates/${plateId}/revisions`, {
      data: { spec: { ...demoSpec, notes: 'changed elsewhere' }, message: 'other change', parentRevisionId: revisionId },
      headers: { origin: base },
    });
    expect(other.status()).toBe(201);
    await page.getByLabel('E1 X').fill('118');
    await page.getByTestId('save-button').click();
    await page.getByLabel('What changed and why').fill('nudge E1');
    await page.getByTestId('save-dialog').getByRole('button', { name: 'Save revision' }).click();
    const dialog = page.getByTestId('conflict-dialog');
    await dialog.waitFor();
    expect(await dialog.innerText()).toMatch(/revision 2/);
    await page.getByRole('button', { name: /Load revision 2 and re-apply/ }).click();
    await dialog.waitFor({ state: 'detached' });
    expect(await page.getByLabel('E1 X').inputValue()).toBe('118');
    await page.getByTestId('save-button').click();
    await page.getByLabel('What changed and why').fill('nudge E1 on top of rev 2');
    await page.getByTestId('save-dialog').getByRole('button', { name: 'Save revision' }).click();
    await page.getByTestId('toast').filter({ hasText: 'Saved as revision 3' }).waitFor();
    const plate = await (await page.request.get(`${base}/api/plates/${plateId}`)).json();
    const rev3 = plate.plate.revisions.find((r: { number: number }) => r.number === 3);
    const spec = (await (await page.request.get(`${base}/api/revisions/${rev3.id}`)).json()).revision.spec;
    expect(spec.notes).toBe('changed elsewhere'); // theirs kept
    expect(spec.engineFace.holes[0].x).toBe(118); // mine re-applied
    await context.close();
  });
});
