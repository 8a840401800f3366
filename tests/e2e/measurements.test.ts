import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readFileSync } from 'node:fs';
import { eq } from 'drizzle-orm';
import { launchBrowser } from '../support/browser';
import { testAppPort } from '../support/server';
import { makeUser, TEST_PASSWORD } from '../support/users';
import { closeDb, getDb } from '../../src/server/db/client';
import { revisions, uploads } from '../../src/server/db/schema';
import { createProject } from '../../src/server/repos/projects';
import { createPlate } from '../../src/server/repos/plates';
import { saveRevision } from '../../src/server/repos/revisions';
import { BELL_FACE, makeFace, writePlyBinary } from '../fixtures/measure/syntheticFace';

// A builder uploads a scan of a bell-housing face, finds its holes, fits the bore and the bolt
// circle and applies the pattern to the transmission face of a plate as a new draft revision.

const base = process.env.E2E_BASE_URL ?? `http://127.0.0.1:${testAppPort()}`;
const SHOTS = '.test-artifacts/screens';
const dir = mkdtempSync(join(tmpdir(), 'platewright-measure-e2e-'));
const scan = join(dir, 'bell-face-scan.ply');
let browser: Browser;
let projectId: number;
let plateId: number;
let firstRevisionId: number;
let email: string;
let pointCount = 0;

beforeAll(async () => {
  mkdirSync(SHOTS, { recursive: true });
  const face = makeFace(BELL_FACE);
  pointCount = face.points.length / 3;
  writeFileSync(scan, writePlyBinary(face.points));
  const db = getDb();
  const user = await makeUser(db, 'designer', 'builder');
  email = user.email;
  ({ id: projectId } = await createProject(db, user, { name: `Bell face scan ${Date.now().toString(36)}`, swapDescription: 'Invented: a scanned bell housing behind an invented four' }));
  const plate = await createPlate(db, user, projectId, { title: 'Scanned adapter', material: '6061-T651 aluminium' });
  plateId = plate.id;
  const blank = JSON.parse(readFileSync(new URL('../../templates/plates/blank.json', import.meta.url), 'utf8'));
  firstRevisionId = (await saveRevision(db, user, plateId, { spec: blank, message: 'blank start', parentRevisionId: null })).id;
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
  rmSync(dir, { recursive: true, force: true });
});

describe('measurements in Chromium', () => {
  it('uploads a scan, finds the holes, fits bore and bolt circle, and saves the pattern as a draft revision', async () => {
    const context = await browser.newContext({ viewport: { width: 1400, height: 1000 } });
    const page = await context.newPage();
    const problems: string[] = [];
    page.on('pageerror', (e) => problems.push(e.message));

    await page.goto(base + '/sign-in');
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Password').fill(TEST_PASSWORD);
    await Promise.all([page.waitForURL(/\/projects/), page.getByRole('button', { name: /sign in/i }).click()]);

    await page.goto(`${base}/projects/${projectId}`);
    await page.getByRole('link', { name: /Measurements/ }).click();
    await page.waitForURL(/\/measurements$/);
    await expect.poll(() => page.getByText('No measurements yet').count()).toBe(1);

    await page.locator('input[type=file]').setInputFiles(scan);
    await page.getByLabel('Units in the file').selectOption('mm');
    await page.getByRole('button', { name: 'Upload' }).click();
    const plane = page.getByTestId('plane-summary');
    await plane.waitFor({ timeout: 60_000 });
    const planeText = await plane.innerText();
    expect(planeText).toMatch(/Face plane from [\d,]+ of [\d,]+ points · flatness 0\.\d{3} mm/);
    await expect.poll(() => page.getByTestId('uploads-table').locator('tbody tr').count()).toBe(1);
    expect(await page.getByTestId('uploads-table').innerText()).toMatch(new RegExp(`bell-face-scan\\.ply\\s+[\\d.]+ MB\\s+PLY binary\\s+${pointCount.toLocaleString('en-GB')}\\s+mm\\s+Builder Tester`));
    await page.screenshot({ path: `${SHOTS}/measurements-1-face.png`, fullPage: true });

    await page.getByRole('button', { name: 'Find holes' }).click();
    const rows = page.getByTestId('holes-table').locator('tbody tr');
    await expect.poll(() => rows.count(), { timeout: 30_000 }).toBe(11);
    const table = await page.getByTestId('holes-table').innerText();
    expect(table.match(/\boval\b/g)?.length).toBe(1);
    expect(table.match(/\bdented\b/g)?.length).toBe(1);
    expect(table).toMatch(/M10\s+ISO 273 medium/);

    const canvas = page.getByTestId('face-view');
    const box = (await canvas.boundingBox())!;
    const k = box.width / 640;

    // a lasso around one bolt hole, drawn by hand: the face (Ø300) fills 92 % of the 640 px view
    await page.getByRole('button', { name: 'Lasso' }).click();
    const h1 = /H1\s+(-?\d+\.\d+), (-?\d+\.\d+)\s+(\d+\.\d+)/.exec(table)!;
    const s = (640 * 0.92) / 300;
    const at = (u: number, v: number) => [box.x + (320 + u * s) * k, box.y + (320 - v * s) * k] as const;
    const [u1, v1] = [Number(h1[1]), Number(h1[2])];
    for (let j = 0; j <= 12; j++) {
      const t = (2 * Math.PI * j) / 12;
      const [x, y] = at(u1 + 12 * Math.cos(t), v1 + 12 * Math.sin(t));
      if (j === 0) {
        await page.mouse.move(x, y);
        await page.mouse.down();
      } else await page.mouse.move(x, y, { steps: 2 });
    }
    await page.mouse.up();
    await page.getByRole('button', { name: 'Fit hole in selection' }).click();
    await expect.poll(() => rows.count()).toBe(12);
    const s1 = await rows.filter({ hasText: 'S1' }).innerText();
    expect(Math.abs(Number(/S1\s+[-\d.]+, [-\d.]+\s+(\d+\.\d+)/.exec(s1)![1]) - Number(h1[3]))).toBeLessThan(0.01);
    await page.getByRole('checkbox', { name: 'Use S1 in the bolt pattern' }).waitFor();
    await page.getByRole('button', { name: 'Box' }).click();

    // the bore sits in the middle of the face: box around it, then fit the bore
    await page.mouse.move(box.x + (320 - 140) * k, box.y + (320 - 140) * k);
    await page.mouse.down();
    await page.mouse.move(box.x + 320 * k, box.y + 320 * k, { steps: 4 });
    await page.mouse.move(box.x + (320 + 140) * k, box.y + (320 + 140) * k, { steps: 4 });
    await page.mouse.up();
    await page.getByRole('button', { name: 'Fit bore in selection' }).click();
    const bore = page.getByTestId('bore-result');
    await bore.waitFor({ timeout: 30_000 });
    expect(await bore.innerText()).toMatch(/Ø 1(09\.99\d|10\.00\d) mm/);

    const bc = page.getByTestId('bolt-circle');
    await bc.waitFor();
    const bcText = await bc.innerText();
    // invented face: 8 holes on Ø240, bolt circle 0.403 mm from the bore (0.35, −0.2)
    expect(bcText).toMatch(/Bolt circle Ø 2(39\.99\d|40\.00\d) mm through 8 holes/);
    const offset = Number(/centre (\d+\.\d+) mm from the bore axis/.exec(bcText)?.[1]);
    expect(Math.abs(offset - Math.hypot(0.35, 0.2))).toBeLessThan(0.01);
    await page.getByTestId('holes-table').getByText('H4', { exact: true }).click();
    await page.screenshot({ path: `${SHOTS}/measurements-2-pattern.png`, fullPage: true });

    await page.getByLabel('Face', { exact: true }).selectOption('transmission');
    await page.getByRole('button', { name: 'Apply to the plate as a new draft' }).click();
    const saved = page.getByRole('status').filter({ hasText: 'Saved as draft revision' });
    await saved.waitFor({ timeout: 30_000 });
    expect(await saved.innerText()).toMatch(/Saved as draft revision 2/);
    await page.screenshot({ path: `${SHOTS}/measurements-3-applied.png`, fullPage: true });

    // the engineer's view: the new draft in the editor, its transmission holes with their source
    await Promise.all([page.waitForURL(/\/plates\/\d+\/edit\?rev=\d+$/), saved.getByRole('link', { name: 'Open it in the editor' }).click()]);
    // the cautions come first on the first open of a plate
    const safety = page.getByTestId('safety-panel');
    await safety.waitFor({ timeout: 30_000 });
    expect(await safety.innerText()).toMatch(/dial indicator/);
    await safety.getByRole('button', { name: /I understand/ }).click();
    await page.getByTestId('face-transmissionFace').click();
    const holeTable = page.getByTestId('hole-table-transmissionFace');
    await holeTable.waitFor({ timeout: 30_000 });
    await expect.poll(() => holeTable.locator('tbody tr[data-row]').count()).toBe(8);
    const source = page.getByTestId('measured-source-transmissionFace');
    await source.waitFor();
    const sourceText = await source.innerText();
    expect(sourceText).toMatch(/MEASURED\s*8 holes fitted from upload \d+ · 2 flagged — check before release/i);
    // invented face: bolt circle Ø240 about a bore 0.403 mm off (TIR 0.806 mm)
    const pl = /Bolt circle TB: Ø 2(?:39\.99\d|40\.00\d) mm through 8 measured holes · rms 0\.\d{3} mm · angular rms \d\.\d{3}° · centre (\d\.\d{3}) mm from the bore axis \(TIR (\d\.\d{3}) mm\), bore Ø 1(?:09\.99\d|10\.00\d) mm/.exec(sourceText);
    expect(pl, sourceText).not.toBeNull();
    expect(Math.abs(Number(pl![1]) - Math.hypot(0.35, 0.2))).toBeLessThan(0.01);
    expect(Number(pl![2])).toBeCloseTo(2 * Number(pl![1]), 2);
    const measuredRows = source.locator('tbody tr');
    expect(await measuredRows.count()).toBe(8);
    for (let i = 1; i <= 8; i++) {
      expect(await source.locator(`tr[data-measured="T${i}"]`).innerText()).toMatch(new RegExp(`^T${i}\\s+1[01]\\.\\d{3}\\s+0\\.\\d{3}\\s+0\\.\\d{3}\\s+\\d+ · \\d+°\\s+[+−]?\\d\\.\\d{3} [+−]?\\d\\.\\d{3}°\\s+ISO 273 medium M10`));
    }
    expect(sourceText.match(/⚠ [^\n]*\boval\b/g)).toHaveLength(1);
    expect(sourceText.match(/⚠ [^\n]*\bdented\b/g)).toHaveLength(1);
    expect(sourceText.match(/✓ good fit/g)).toHaveLength(6);
    // hovering a hole in the table marks its measured row
    await holeTable.locator('tr[data-row="T3"]').hover();
    await expect.poll(() => source.locator('tr[data-measured="T3"]').getAttribute('class')).toMatch(/bg-brass/);
    await source.scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${SHOTS}/measurements-4-editor-source.png`, fullPage: true });
    await page.goBack();
    await page.waitForURL(/\/measurements$/);

    // later: open the stored upload again (the worker reads it from the server)
    await page.reload();
    await page.getByTestId('uploads-table').getByRole('button', { name: 'Open' }).click();
    await page.getByTestId('plane-summary').waitFor({ timeout: 60_000 });
    expect(await page.getByTestId('plane-summary').innerText()).toBe(planeText);
    expect(problems).toEqual([]);
    await context.close();

    // the saved draft holds the holes with where they came from
    const db = getDb();
    const [upload] = await db.select().from(uploads).where(eq(uploads.projectId, projectId));
    const [rev] = await db.select().from(revisions).where(eq(revisions.plateId, plateId)).orderBy(revisions.number).limit(2).offset(1);
    expect(rev!.parentRevisionId).toBe(firstRevisionId);
    expect(rev!.status).toBe('draft');
    const spec = (typeof rev!.spec === 'string' ? JSON.parse(rev!.spec) : rev!.spec) as any;
    const tf = spec.transmissionFace;
    expect(tf.viewedFrom).toBe('front');
    expect(tf.patterns).toHaveLength(1);
    expect(tf.patterns[0].id).toBe('TB');
    expect(tf.patterns[0].anglesDeg).toHaveLength(8);
    expect(Math.abs(tf.patterns[0].diameterMm - 240)).toBeLessThan(0.02);
    expect(tf.patterns[0].fitted.fromUploadId).toBe(String(upload!.id));
    expect(Math.hypot(tf.patterns[0].fitted.centerX, tf.patterns[0].fitted.centerY)).toBeCloseTo(Math.hypot(0.35, 0.2), 2);
    expect(tf.holes.map((h: { id: string }) => h.id)).toEqual(['T1', 'T2', 'T3', 'T4', 'T5', 'T6', 'T7', 'T8']);
    expect(tf.patterns[0].fitted.holeCount).toBe(8);
    // invented bore offset (0.35, −0.2): the fitted offset within 0.01 mm as above, TIR = 2 × offset
    expect(Math.abs(tf.patterns[0].fitted.bore.offsetMm - Math.hypot(0.35, 0.2))).toBeLessThan(0.01);
    expect(tf.patterns[0].fitted.bore.tirMm).toBeCloseTo(2 * tf.patterns[0].fitted.bore.offsetMm, 3);
    for (const h of tf.holes) {
      expect(h.patternId).toBe('TB');
      expect(h.fitted.fromUploadId).toBe(String(upload!.id));
      expect(h.fitted.points).toBeGreaterThan(12);
      expect(Math.abs(h.fitted.diameterMm - 11)).toBeLessThan(1);
      expect(h.note).toMatch(new RegExp(`^fitted from upload ${upload!.id} \\(bell-face-scan\\.ply\\): Ø1[01]\\.\\d{3} mm, rms`));
    }
    expect(tf.holes.filter((h: { note: string }) => /flagged: .*oval/.test(h.note))).toHaveLength(1);
    expect(tf.holes.filter((h: { note: string }) => /flagged: .*dented/.test(h.note))).toHaveLength(1);
    expect(tf.holes.filter((h: { fitted: { flags: string[] } }) => h.fitted.flags.includes('oval'))).toHaveLength(1);
    expect(tf.holes.filter((h: { fitted: { flags: string[] } }) => h.fitted.flags.includes('dent'))).toHaveLength(1);
  });
});
