/**
 * Kernel benchmark (not a test): `npm run bench:kernel`.
 *
 * The reference plate (≈ 320 × 280 × 12.7 mm, 31 round features, 10 counterbores, 4 dowels, a
 * starter pocket, 2 mm edge chamfer, filleted outline) through:
 *  - buildPlate's construction, warm (≥ 30 warm-ups, median / p90 of ≥ 20), and the full
 *    verified build (validity check, volume against the 2D computation, face count);
 *  - STEP export, display mesh, DXF write;
 *  - wasm heap growth over 200 builds, scaled to 1000;
 *  - baseline in the same run: the same plate built natively by OpenCASCADE's DRAW (occt-draw,
 *    when installed) the way a CAD user's model would be — blank, then boolean cuts.
 * The last line printed is one JSON object with the figures; ratio = ours ÷ native (wall-clock
 * medians); cpuRatio compares CPU time per build, which holds up better on a busy machine.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, symlinkSync, writeFileSync, mkdtempSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildPlate, constructPlateSolidUnverified } from '../src/cad/buildPlate';
import { heapBytesOf, startKernelInstance } from '../src/cad/kernel.node.ts';
import { plateMeshFast } from '../src/cad/fastMesh';
import { DISPLAY_ANGULAR_TOLERANCE_RAD, DISPLAY_TOLERANCE_MM, displayToleranceMm, plateMesh, plateSizeMm, sizeOfBox } from '../src/cad/mesh';
import { plateStep } from '../src/cad/step';
import { plateDxf } from '../src/domain/exports/dxf';
import { analyticVolumeMm3 } from '../src/cad/analyticVolume';
import { referencePlate } from '../tests/fixtures/profiles';
import { drawPlateScript } from './drawScript';

const WARMUPS = 40;
const RUNS = 30;

function stats(xs: number[]): { median: number; p90: number } {
  const s = [...xs].sort((a, b) => a - b);
  const at = (q: number) => s[Math.min(s.length - 1, Math.floor(q * (s.length - 1) + 0.5))]!;
  return { median: at(0.5), p90: at(0.9) };
}

function time(fn: () => void): number {
  const t0 = performance.now();
  fn();
  return performance.now() - t0;
}

const r2 = (v: number | null) => (v === null ? null : Math.round(v * 100) / 100);
const r4 = (v: number | null) => (v === null ? null : Math.round(v * 10000) / 10000);

/** Runs the DRAW baseline; returns per-build milliseconds, or why it could not run. */
function nativeBaseline(): { ms: number[]; cpuMsMean: number | null; volumeMm3: number | null } | { unavailable: string } {
  const exe = ['/usr/bin/occt-draw', '/usr/bin/DRAWEXE'].find((p) => existsSync(p));
  if (!exe) return { unavailable: 'occt-draw is not installed (apt-get install -y occt-draw)' };
  // DRAW's `pload` opens plug-in libraries by their unversioned names, which only the -dev
  // packages provide: point it at versioned ones through a private folder of links
  const dir = mkdtempSync(join(tmpdir(), 'pw-occt-'));
  const libDir = '/usr/lib/x86_64-linux-gnu';
  const libs = join(dir, 'lib');
  mkdirSync(libs);
  for (const f of existsSync(libDir) ? readdirSync(libDir) : []) {
    const m = /^(libTK\w+\.so)\.\d+$/.exec(f);
    if (m) symlinkSync(join(libDir, f), join(libs, m[1]!));
  }
  const script = join(dir, 'plate.tcl');
  writeFileSync(script, drawPlateScript(referencePlate, RUNS, 5));
  const res = spawnSync(exe, ['-b', '-f', script], {
    encoding: 'utf8',
    env: { ...process.env, LD_LIBRARY_PATH: `${libs}${process.env.LD_LIBRARY_PATH ? `:${process.env.LD_LIBRARY_PATH}` : ''}` },
    timeout: 600_000,
  });
  const out = `${res.stdout ?? ''}${res.stderr ?? ''}`;
  const ms = [...out.matchAll(/PWTIME (\d+)/g)].map((m) => Number(m[1]) / 1000);
  if (ms.length === 0) return { unavailable: `occt-draw ran but printed no timings: ${out.slice(0, 300)}` };
  const mass = /Mass :\s+([-\d.e+]+)/.exec(out);
  const user = /CPU user time: ([\d.e+-]+) seconds/.exec(out);
  const sys = /CPU system time: ([\d.e+-]+) seconds/.exec(out);
  const cpuMsMean = user ? ((Number(user[1]) + Number(sys?.[1] ?? 0)) * 1000) / ms.length : null;
  return { ms, cpuMsMean, volumeMm3: mass ? Number(mass[1]) : null };
}

async function main() {
  const plate = referencePlate;
  const tStart = performance.now();
  const oc = await startKernelInstance();
  console.log(`kernel started in ${(performance.now() - tStart).toFixed(0)} ms`);

  // ---- construction (what a native script does), warm
  for (let i = 0; i < WARMUPS; i++) constructPlateSolidUnverified(oc, plate, 'direct').delete();
  const build: number[] = [];
  let cpuUs = 0;
  for (let i = 0; i < RUNS; i++) {
    let s: { delete(): void } | null = null;
    const c0 = process.cpuUsage();
    build.push(time(() => (s = constructPlateSolidUnverified(oc, plate, 'direct'))));
    const c1 = process.cpuUsage(c0);
    cpuUs += c1.user + c1.system;
    s!.delete();
  }
  const buildCpuMsMean = cpuUs / 1000 / RUNS;
  const b = stats(build);
  console.log(`direct B-rep construction: median ${b.median.toFixed(2)} ms, p90 ${b.p90.toFixed(2)} ms`);

  // ---- the full, verified build (what the app runs every time)
  for (let i = 0; i < 10; i++) buildPlate(oc, plate).dispose();
  const verified: number[] = [];
  for (let i = 0; i < 20; i++) {
    let p: { dispose(): void } | null = null;
    verified.push(time(() => (p = buildPlate(oc, plate))));
    p!.dispose();
  }
  const v = stats(verified);
  console.log(`verified buildPlate (validity, volume, faces): median ${v.median.toFixed(2)} ms, p90 ${v.p90.toFixed(2)} ms`);

  // ---- one-face fallback, for reference
  for (let i = 0; i < 5; i++) constructPlateSolidUnverified(oc, plate, 'oneFace').delete();
  const oneFace: number[] = [];
  for (let i = 0; i < 10; i++) {
    let s: { delete(): void } | null = null;
    oneFace.push(time(() => (s = constructPlateSolidUnverified(oc, plate, 'oneFace'))));
    s!.delete();
  }
  console.log(`one-face fallback construction: median ${stats(oneFace).median.toFixed(2)} ms`);

  // ---- STEP, display mesh (a fresh solid each time: the kernel triangulates on every mesh call),
  // DXF. The mesh is made as the worker makes it: chordal deflection from the plate's size; for
  // comparison the fixed finest display deflection, and the box-only size lookup on its own.
  const step: number[] = [];
  const mesh: number[] = [];
  const meshFine: number[] = [];
  const meshFast: number[] = [];
  const sizeLookup: number[] = [];
  let meshTriangles = 0;
  let meshFineTriangles = 0;
  let meshTolerance = 0;
  for (let i = 0; i < 13; i++) {
    const p = buildPlate(oc, plate);
    const ts = time(() => plateStep(oc, p.shape, { partNumber: 'PW-0042', revision: 3 }));
    const p2 = buildPlate(oc, plate);
    const sizeMm = sizeOfBox(p2.verification.bbox);
    meshTolerance = displayToleranceMm(sizeMm);
    let tris = 0;
    const tm = time(() => (tris = plateMesh(oc, p2.shape, { sizeMm }).indices.length / 3));
    const p3 = buildPlate(oc, plate);
    let fineTris = 0;
    const tf = time(() => (fineTris = plateMesh(oc, p3.shape, { toleranceMm: DISPLAY_TOLERANCE_MM }).indices.length / 3));
    const tz = time(() => plateSizeMm(oc, p3.shape));
    // the worker's mesher: plate faces triangulated from their boundary, the rest by the kernel
    const p4 = buildPlate(oc, plate);
    const tq = time(() => plateMeshFast(oc, p4.shape, { sizeMm, box: p4.verification.bbox }));
    p4.dispose();
    if (i >= 3) {
      step.push(ts);
      mesh.push(tm);
      meshFine.push(tf);
      meshFast.push(tq);
      sizeLookup.push(tz);
    }
    meshTriangles = tris;
    meshFineTriangles = fineTris;
    p.dispose();
    p2.dispose();
    p3.dispose();
  }
  for (let i = 0; i < 20; i++) plateDxf(plate, { partNumber: 'PW-0042', revision: 3 });
  const dxf: number[] = [];
  for (let i = 0; i < 30; i++) dxf.push(time(() => plateDxf(plate, { partNumber: 'PW-0042', revision: 3 })));
  console.log(
    `STEP ${stats(step).median.toFixed(2)} ms, mesh ${stats(mesh).median.toFixed(2)} ms, DXF ${stats(dxf).median.toFixed(2)} ms (medians)`,
  );
  console.log(
    `display mesh at ${meshTolerance.toFixed(3)} mm / ${DISPLAY_ANGULAR_TOLERANCE_RAD} rad: ${meshTriangles} triangles, ${stats(mesh).median.toFixed(2)} ms; ` +
      `at the fixed ${DISPLAY_TOLERANCE_MM} mm: ${meshFineTriangles} triangles, ${stats(meshFine).median.toFixed(2)} ms; box-only size lookup ${stats(sizeLookup).median.toFixed(2)} ms`,
  );
  console.log(
    `worker's display mesh (plate faces from their boundary): ${stats(meshFast).median.toFixed(2)} ms, ratio to the kernel mesher alone ${(stats(meshFast).median / stats(mesh).median).toFixed(2)}`,
  );

  // ---- heap growth: 200 verified builds in this instance
  const heap0 = heapBytesOf(oc);
  for (let i = 0; i < 200; i++) buildPlate(oc, plate).dispose();
  const heapGrowthMbPer1000 = ((heapBytesOf(oc) - heap0) / (1024 * 1024)) * (1000 / 200);
  console.log(`wasm heap ${(heapBytesOf(oc) / 1048576).toFixed(0)} MB, growth ${heapGrowthMbPer1000.toFixed(2)} MB per 1000 builds`);

  // ---- native baseline
  const native = nativeBaseline();
  let nativeBuildMsMedian: number | null = null;
  let nativeCpuMsMean: number | null = null;
  if ('unavailable' in native) {
    console.log(`native baseline: none — ${native.unavailable}`);
  } else {
    nativeBuildMsMedian = stats(native.ms).median;
    nativeCpuMsMean = native.cpuMsMean;
    const analytic = analyticVolumeMm3(plate);
    console.log(
      `native DRAW (OCCT 7.6, blank + 4 boolean cuts): median ${nativeBuildMsMedian.toFixed(2)} ms, p90 ${stats(native.ms).p90.toFixed(2)} ms; ` +
        `its volume ${native.volumeMm3 ?? '?'} mm³ vs ours ${analytic.toFixed(3)} mm³`,
    );
  }
  const result = {
    buildMsMedian: r2(b.median),
    buildMsP90: r2(b.p90),
    nativeBuildMsMedian: r2(nativeBuildMsMedian),
    ratio: nativeBuildMsMedian ? r4(b.median / nativeBuildMsMedian) : null,
    stepMs: r2(stats(step).median),
    meshMs: r2(stats(mesh).median),
    meshTriangles,
    meshToleranceMm: r4(meshTolerance),
    meshFixedFineMs: r2(stats(meshFine).median),
    meshWorkerMs: r2(stats(meshFast).median),
    meshWorkerToKernelMesherRatio: r4(stats(meshFast).median / stats(mesh).median),
    dxfMs: r2(stats(dxf).median),
    heapGrowthMbPer1000: r2(heapGrowthMbPer1000),
    buildCpuMsMean: r2(buildCpuMsMean),
    nativeCpuMsMean: r2(nativeCpuMsMean),
    cpuRatio: nativeCpuMsMean ? r4(buildCpuMsMean / nativeCpuMsMean) : null,
    loadAverage1m: r2(loadavg()[0]!),
    verifiedBuildMsMedian: r2(v.median),
    verifiedBuildMsP90: r2(v.p90),
    verifiedRatio: nativeBuildMsMedian ? r4(v.median / nativeBuildMsMedian) : null,
    oneFaceBuildMsMedian: r2(stats(oneFace).median),
  };
  console.log(JSON.stringify(result));
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
