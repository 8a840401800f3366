/**
 * Editor benchmark (not a test): `npm run bench:editor`.
 *
 * In headless Chromium against the built app (BENCH_BASE_URL, or the built server started here
 * on the database of the environment — run `npm run db:start` and seed first):
 *  - keystroke in a hole cell → updated 2D drawing (hole moved in the SVG, then one frame), on a
 *    60-hole plate (the demo plate plus a 41-hole bolt circle), median / p90 of 40 keystrokes;
 *  - the live check of that plate in the browser (spec validation + profile + every check);
 *  - keystroke → updated 3D mesh, when the kernel worker is part of the build;
 *  - the JavaScript the editor page loads, gzip, without wasm.
 * The last line printed is one JSON object with the figures.
 */
import { gzipSync } from 'node:zlib';
import { readFileSync } from 'node:fs';
import { launchBrowser } from '../tests/support/browser';
import { startServer, type RunningServer } from '../tests/support/server';

const KEYSTROKES = 40;
const PASSWORD = process.env.DEMO_PASSWORD ?? 'platewright-demo';

function stats(xs: number[]): { median: number; p90: number; n: number } {
  const s = [...xs].sort((a, b) => a - b);
  const q = (p: number) => s[Math.min(s.length - 1, Math.floor(p * s.length))]!;
  return { median: Number(q(0.5).toFixed(2)), p90: Number(q(0.9).toFixed(2)), n: s.length };
}

async function main(): Promise<void> {
  let server: RunningServer | undefined;
  let base = process.env.BENCH_BASE_URL;
  if (!base) {
    server = await startServer(Number(process.env.BENCH_APP_PORT ?? 4399));
    base = server.baseUrl;
  }
  const browser = await launchBrowser();
  try {
    const context = await browser.newContext({ viewport: { width: 1920, height: 1080 } });
    const page = await context.newPage();
    const post = async (url: string, data: unknown) => {
      const r = await page.request.post(base + url, { data, headers: { origin: base! } });
      if (r.status() >= 300) throw new Error(`${url}: ${r.status()} ${await r.text()}`);
      return r.json();
    };
    await post('/api/auth/sign-in', { email: 'designer@example.test', password: PASSWORD });
    const project = (await post('/api/projects', { name: 'Editor benchmark' })).project;
    const plate = (await post(`/api/projects/${project.id}/plates`, { title: 'Benchmark plate, 60 holes' })).plate;
    const spec = JSON.parse(readFileSync(new URL('../templates/plates/demo.json', import.meta.url), 'utf8'));
    // 41 more engine holes on a 380 mm circle: 19 + 41 = 60 flange holes
    spec.engineFace.patterns.push({ id: 'BX', diameterMm: 380, count: 41, startAngleDeg: 2 });
    for (let i = 0; i < 41; i++) spec.engineFace.holes.push({ id: `B${i + 1}`, patternId: 'BX', index: i, role: 'tapped', fastener: 'M6x1' });
    await post(`/api/plates/${plate.id}/revisions`, { spec, message: 'benchmark', parentRevisionId: null });

    const scripts: { url: string; bytes: Buffer }[] = [];
    page.on('response', async (r) => {
      const url = r.url();
      if (r.request().resourceType() === 'script' || url.endsWith('.js')) {
        try {
          scripts.push({ url, bytes: await r.body() });
        } catch {
          /* redirected or aborted */
        }
      }
    });
    await page.addInitScript(() => localStorage.setItem('platewright.safetySeen.' + location.pathname.split('/')[2], 'bench'));
    await page.goto(`${base}/plates/${plate.id}/edit`, { waitUntil: 'networkidle' });
    await page.getByTestId('plate-drawing').waitFor();
    const holes = await page.locator('[data-testid="plate-drawing"] [data-feature]').count();
    const firstLoadCount = scripts.length;

    // keystroke → drawing: keydown seen (capture) to E1's circle moved, plus one animation frame
    await page.getByLabel('E1 X').click();
    await page.keyboard.press('End');
    const drawMs: number[] = [];
    const checkMs: number[] = [];
    for (let i = 0; i < KEYSTROKES; i++) {
      const key = i % 2 === 0 ? '1' : 'Backspace';
      await page.evaluate(() => {
        const w = window as unknown as { __bench: { t0: number; done: Promise<number> } };
        const circle = document.querySelector('[data-testid="plate-drawing"] [data-feature="E1"] circle:nth-of-type(2)') ?? document.querySelector('[data-testid="plate-drawing"] [data-feature="E1"] circle');
        let resolve!: (v: number) => void;
        const done = new Promise<number>((r) => (resolve = r));
        w.__bench = { t0: 0, done };
        document.addEventListener('keydown', () => (w.__bench.t0 = performance.now()), { capture: true, once: true });
        const svg = document.querySelector('[data-testid="plate-drawing"]')!;
        const before = circle?.getAttribute('cx');
        const mo = new MutationObserver(() => {
          const now = document.querySelector('[data-testid="plate-drawing"] [data-feature="E1"] circle:nth-of-type(2)') ?? document.querySelector('[data-testid="plate-drawing"] [data-feature="E1"] circle');
          if (now?.getAttribute('cx') !== before) {
            mo.disconnect();
            requestAnimationFrame(() => resolve(performance.now() - w.__bench.t0));
          }
        });
        mo.observe(svg, { subtree: true, attributes: true, childList: true });
      });
      await page.keyboard.press(key);
      drawMs.push(await page.evaluate(() => (window as unknown as { __bench: { done: Promise<number> } }).__bench.done));
      const ms = await page.locator('[title="time to lay out and check the plate"]').innerText();
      checkMs.push(Number(ms.replace(/[^\d.]/g, '')));
    }

    // keystroke → 3D mesh: open the 3D view, wait for the kernel's solid, then time keydown →
    // the rebuilt mesh on screen (debounce + worker build + mesh transfer + one frame), warm
    const meshMs: number[] = [];
    const workerMs: number[] = [];
    await page.getByRole('tab', { name: '3D' }).click();
    await page.locator('[data-testid="plate-3d"][data-source="kernel"]').waitFor({ timeout: 120_000 });
    await page.getByLabel('E1 X').click();
    await page.keyboard.press('End');
    for (let i = 0; i < 14; i++) {
      const key = i % 2 === 0 ? '1' : 'Backspace';
      await page.evaluate(() => {
        const w = window as unknown as { __mesh: { t0: number; done: Promise<number> } };
        let resolve!: (v: number) => void;
        const done = new Promise<number>((r) => (resolve = r));
        w.__mesh = { t0: 0, done };
        document.addEventListener('keydown', () => (w.__mesh.t0 = performance.now()), { capture: true, once: true });
        let seen = false;
        const mo = new MutationObserver(() => {
          const badge = document.querySelector('[data-testid="rebuilding"]');
          if (badge) seen = true;
          else if (seen) {
            mo.disconnect();
            requestAnimationFrame(() => resolve(performance.now() - w.__mesh.t0));
          }
        });
        mo.observe(document.querySelector('[data-testid="plate-3d"]')!, { subtree: true, childList: true, characterData: true });
      });
      await page.keyboard.press(key);
      const ms = await page.evaluate(() => (window as unknown as { __mesh: { done: Promise<number> } }).__mesh.done);
      if (i >= 4) meshMs.push(ms);
      const label = await page.locator('[data-testid="plate-3d"]').innerText();
      const m = /built in (\d+) ms/.exec(label);
      if (m && i >= 4) workerMs.push(Number(m[1]));
      await page.waitForTimeout(300);
    }

    const appScripts = scripts.filter((s) => s.url.startsWith(base!) && !s.url.endsWith('.wasm'));
    const firstLoad = appScripts.slice(0, firstLoadCount);
    const gzipFirst = firstLoad.reduce((a, s) => a + gzipSync(s.bytes, { level: 9 }).length, 0);
    const gzip = appScripts.reduce((a, s) => a + gzipSync(s.bytes, { level: 9 }).length, 0);
    const raw = appScripts.reduce((a, s) => a + s.bytes.length, 0);
    const result = {
      plate: { flangeHoles: 60, featuresDrawn: holes },
      keystrokeToDrawingMs: stats(drawMs),
      liveCheckInBrowserMs: stats(checkMs.slice(4)),
      keystrokeTo3dMeshMs: stats(meshMs),
      kernelBuildAndMeshInWorkerMs: stats(workerMs),
      editorPageJs: { files: appScripts.length, rawKB: Number((raw / 1024).toFixed(1)), gzipKB: Number((gzip / 1024).toFixed(1)), firstLoadGzipKB: Number((gzipFirst / 1024).toFixed(1)) },
      targets: { keystrokeToDrawingMs: 50, liveCheckMs: 16, keystrokeTo3dMs: 400, gzipKB: 350 },
    };
    console.log(`keystroke → drawing: median ${result.keystrokeToDrawingMs.median} ms, p90 ${result.keystrokeToDrawingMs.p90} ms (target < 50)`);
    console.log(`live check (60 holes, in the browser): median ${result.liveCheckInBrowserMs.median} ms (target < 16)`);
    console.log(`keystroke → 3D mesh (warm, incl. 150 ms pause): median ${result.keystrokeTo3dMeshMs.median} ms, p90 ${result.keystrokeTo3dMeshMs.p90} ms (target < 400); worker build + mesh ${result.kernelBuildAndMeshInWorkerMs.median} ms`);
    console.log(`editor page JS without wasm: ${result.editorPageJs.gzipKB} kB gzip with the 3D view and kernel worker, ${result.editorPageJs.firstLoadGzipKB} kB on first load (target < 350)`);
    console.log(JSON.stringify(result));
  } finally {
    await browser.close();
    await server?.stop();
  }
}

await main();
