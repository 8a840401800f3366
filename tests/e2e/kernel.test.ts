import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, readFileSync } from 'node:fs';
import type { Browser } from 'playwright-core';
import { launchBrowser } from '../support/browser';
import { testAppPort } from '../support/server';
import { startKernelInstance, type OC } from '../../src/cad/kernel.node.ts';
import { readStep } from '../../src/cad/step';
import { expectedCylindricalFaces, measureVolumeMm3, verifyPlate } from '../../src/cad/buildPlate';
import { analyseLayout } from '../../src/cad/plateModel';
import { analyticVolumeMm3 } from '../../src/cad/analyticVolume';
import { plateSpecSchema } from '../../src/domain/spec';
import { plateProfile } from '../../src/domain/profile';

const base = process.env.E2E_BASE_URL ?? `http://127.0.0.1:${testAppPort()}`;
let browser: Browser;
let oc: OC;

beforeAll(async () => {
  [browser, oc] = await Promise.all([launchBrowser(), startKernelInstance()]);
});
afterAll(async () => {
  await browser?.close();
});

describe('kernel check page in Chromium', () => {
  it('loads the kernel worker with a progress bar, builds the demo plate and downloads a STEP that reads back', async () => {
    const context = await browser.newContext({ acceptDownloads: true });
    const page = await context.newPage();
    // record every value the progress bar shows
    await page.addInitScript(() => {
      const seen: number[] = [];
      (window as unknown as { __progress: number[] }).__progress = seen;
      new MutationObserver((records) => {
        for (const r of records) {
          const v = (r.target as Element).getAttribute('aria-valuenow');
          if (v !== null) seen.push(Number(v));
        }
      }).observe(document, { subtree: true, attributes: true, attributeFilter: ['aria-valuenow'] });
    });
    const wasm: { status: number; type?: string; cache?: string }[] = [];
    page.on('response', (r) => {
      if (r.url().endsWith('.wasm')) wasm.push({ status: r.status(), type: r.headers()['content-type'], cache: r.headers()['cache-control'] });
    });
    await page.goto(base + '/kernel');
    await expect(page.locator('h1').innerText()).resolves.toBe('Kernel check');
    expect(await page.locator('[role="progressbar"]').isVisible()).toBe(true);

    await page.waitForSelector('#mesh-count[data-triangles]', { timeout: 90_000 });
    const triangles = Number(await page.locator('#mesh-count').getAttribute('data-triangles'));
    expect(triangles).toBeGreaterThan(1000);
    await expect(page.locator('#kernel-phase').innerText()).resolves.toMatch(/Kernel ready/);
    await expect(page.locator('#build-info').innerText()).resolves.toMatch(/direct B-rep, verified/);
    const progress = await page.evaluate(() => (window as unknown as { __progress: number[] }).__progress);
    expect(progress.some((v) => v > 0 && v < 100)).toBe(true); // shown while loading, not only at the end
    expect(progress.at(-1)).toBe(100);
    // the wasm comes from the app, as wasm, cached for good
    expect(wasm[0]?.status).toBe(200);
    expect(wasm[0]?.type).toBe('application/wasm');
    expect(wasm[0]?.cache).toMatch(/immutable/);

    const [download] = await Promise.all([page.waitForEvent('download'), page.locator('#step-download').click()]);
    expect(download.suggestedFilename()).toMatch(/kernel-check\.step$/);
    const bytes = new Uint8Array(readFileSync((await download.path())!));
    expect(new TextDecoder().decode(bytes.slice(0, 13))).toBe('ISO-10303-21;');

    // the kernel (in Node) reads the browser's STEP back: the demo plate's volume and faces
    const profile = plateProfile(plateSpecSchema.parse(JSON.parse(readFileSync('templates/plates/demo.json', 'utf8'))));
    const shape = readStep(oc, bytes);
    try {
      const analytic = analyticVolumeMm3(profile);
      expect(Math.abs(measureVolumeMm3(oc, shape) - analytic) / analytic).toBeLessThan(1e-9);
      const layout = analyseLayout(profile);
      const v = verifyPlate(oc, shape, profile, layout.columns);
      expect(v.valid).toBe(true);
      expect(v.cylindricalFaces).toBe(expectedCylindricalFaces(profile, layout.columns));
    } finally {
      shape.delete();
    }
    await page.screenshot({ path: '.test-artifacts/kernel-check.png', fullPage: true });
    await context.close();
  });

  it('the worker kernel run out of memory answers a clear failure, restarts, and the next build succeeds and verifies', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    let workerUrl: string | null = null;
    page.on('request', (r) => {
      if (/kernel\.worker[^/]*\.js(\?|$)/.test(r.url())) workerUrl ??= r.url();
    });
    await page.goto(base + '/kernel');
    await page.waitForSelector('#mesh-count[data-triangles]', { timeout: 90_000 });
    expect(workerUrl).not.toBeNull();
    const profile = JSON.parse((await page.locator('#kernel-check').getAttribute('data-profile'))!) as ReturnType<typeof plateProfile>;
    // a different plate than the one cached in the worker (1 mm thicker), so the build must allocate
    const thicker = { ...profile, thicknessMm: profile.thicknessMm + 1 };

    // a second worker from the app's own worker bundle, spoken to in comlink's message format
    const result = await page.evaluate(
      async ({ url, first, second }) => {
        const w = new Worker(url, { type: 'module' });
        let n = 0;
        const call = (name: string, ...args: unknown[]) =>
          new Promise<unknown>((resolve, reject) => {
            const id = `t${++n}`;
            const onMessage = (ev: MessageEvent) => {
              if (ev.data?.id !== id) return;
              w.removeEventListener('message', onMessage);
              if (ev.data.type === 'HANDLER' && ev.data.name === 'throw') reject(new Error(ev.data.value?.value?.message ?? 'worker error'));
              else resolve(ev.data.value);
            };
            w.addEventListener('message', onMessage);
            w.postMessage({ id, type: 'APPLY', path: [name], argumentList: args.map((value) => ({ type: 'RAW', value })) });
          });
        type Build = { ok: boolean; code?: string; message?: string; mesh?: { indices: Uint32Array }; verification?: { volumeMm3: number; valid: boolean } };
        await call('init');
        const good = (await call('build', first)) as Build;
        const exhausted = (await call('exhaustHeapForTest')) as { heapBytes: number };
        const failed = (await call('build', second)) as Build;
        const afterFailure = (await call('status')) as { started: boolean; fatalFailures: number; restarts: number };
        const recovered = (await call('build', second)) as Build;
        const afterRecovery = (await call('status')) as { started: boolean; fatalFailures: number; restarts: number };
        w.terminate();
        const summary = (b: Build) => ({
          ok: b.ok,
          code: b.code ?? null,
          message: b.message ?? null,
          triangles: b.mesh ? b.mesh.indices.length / 3 : 0,
          volumeMm3: b.verification?.volumeMm3 ?? null,
          valid: b.verification?.valid ?? null,
        });
        return { good: summary(good), heapBytes: exhausted.heapBytes, failed: summary(failed), afterFailure, recovered: summary(recovered), afterRecovery };
      },
      { url: workerUrl!, first: profile, second: thicker },
    );
    expect(result.good.ok).toBe(true);
    expect(result.heapBytes).toBeGreaterThan(0);
    expect(result.failed.ok).toBe(false);
    expect(result.failed.code).toBe('kernel-out-of-memory');
    expect(result.failed.message).toMatch(/^The CAD kernel ran out of memory while building the plate, so nothing was shown or exported/);
    expect(result.failed.message).toMatch(/try again/);
    expect(result.afterFailure).toMatchObject({ started: false, fatalFailures: 1, restarts: 1 });
    // the fresh kernel builds the thicker plate: valid, its volume the 2D computation's (checked here in Node)
    expect(result.recovered.ok).toBe(true);
    expect(result.recovered.valid).toBe(true);
    expect(result.recovered.triangles).toBeGreaterThan(1000);
    const analytic = analyticVolumeMm3(thicker);
    expect(Math.abs(result.recovered.volumeMm3! - analytic) / analytic).toBeLessThan(1e-9);
    expect(result.afterRecovery).toMatchObject({ started: true, fatalFailures: 1 });
    await context.close();
  });

  it("the editor's 3D view shows the kernel's own mesh of the plate (screenshots, whole plate and zoomed in)", async () => {
    mkdirSync('.test-artifacts/screens', { recursive: true });
    const context = await browser.newContext({ viewport: { width: 1920, height: 1080 } });
    const page = await context.newPage();
    const headers = { origin: base };
    const signIn = await page.request.post(`${base}/api/auth/sign-in`, { data: { email: 'designer@example.test', password: process.env.DEMO_PASSWORD ?? 'platewright-demo' }, headers });
    expect(signIn.status()).toBe(200);
    const project = await page.request.post(`${base}/api/projects`, { data: { name: 'Kernel view check' }, headers });
    expect(project.status()).toBe(201);
    const plate = await page.request.post(`${base}/api/projects/${(await project.json()).project.id}/plates`, { data: { title: 'Kernel view' }, headers });
    expect(plate.status()).toBe(201);
    const plateId = (await plate.json()).plate.id;
    const spec = JSON.parse(readFileSync('templates/plates/demo.json', 'utf8'));
    const rev = await page.request.post(`${base}/api/plates/${plateId}/revisions`, { data: { spec, message: 'view check', parentRevisionId: null }, headers });
    expect(rev.status()).toBe(201);

    await page.goto(`${base}/plates/${plateId}/edit`);
    await page.getByRole('button', { name: /I understand/ }).click();
    await page.getByRole('tab', { name: '3D' }).click();
    const view = page.locator('[data-testid="plate-3d"][data-source="kernel"]');
    await view.waitFor({ timeout: 90_000 });
    await expect(view.innerText()).resolves.toMatch(/CAD kernel solid, verified, built in \d+ ms/);
    await page.waitForTimeout(300);
    await page.screenshot({ path: '.test-artifacts/screens/kernel-3d-1920.png' });
    // zoom in towards the centre bore and the holes around it
    const box = (await view.boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    for (let i = 0; i < 3; i++) {
      await page.mouse.wheel(0, -300);
      await page.waitForTimeout(80);
    }
    await page.waitForTimeout(300);
    await page.screenshot({ path: '.test-artifacts/screens/kernel-3d-zoom-1920.png' });
    await expect(view.getAttribute('data-source')).resolves.toBe('kernel');

    // edits: a second kernel worker (started after the first build from the first one's compiled
    // module) meshes each edit while the first verifies it; the mesh is shown once they agree
    await page.getByLabel('E1 X').click();
    await page.keyboard.press('End');
    let parallel: string | null = null;
    for (let i = 0; i < 12 && parallel !== 'true'; i++) {
      const before = await view.getAttribute('data-updates');
      await page.keyboard.press(i % 2 === 0 ? '1' : 'Backspace');
      await expect.poll(() => view.getAttribute('data-updates'), { timeout: 60_000 }).not.toBe(before);
      await page.locator('[data-testid="rebuilding"]').waitFor({ state: 'detached', timeout: 60_000 });
      parallel = await view.getAttribute('data-parallel');
    }
    expect(parallel).toBe('true');
    expect(page.workers().filter((w) => /kernel\.worker/.test(w.url())).length).toBe(2);
    await expect(view.innerText()).resolves.toMatch(/CAD kernel solid, verified, built in \d+ ms/);
    await context.close();
  });

  it('a kernel worker that cannot load answers a clear message instead of a bar that never ends', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    let blocked = 0;
    await page.route(/kernel\.worker[^/]*\.js(\?|$)/, (route) => {
      blocked++;
      return route.fulfill({ status: 404, body: 'not here' });
    });
    await page.goto(base + '/kernel');
    const error = page.locator('#kernel-error');
    await error.waitFor({ state: 'visible', timeout: 30_000 });
    expect(blocked).toBeGreaterThan(0);
    await expect(error.innerText()).resolves.toMatch(/^The CAD kernel could not start in this browser \(.+\)\. Your plate is not affected: check the connection and reload the page to try again\.$/);
    await page.screenshot({ path: '.test-artifacts/screens/kernel-no-worker.png' });
    await context.close();
  });
});
