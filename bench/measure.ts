/**
 * Measurement speed: parse + face fit of a 2,000,000-point binary PLY, a hole fit of 50,000 rim
 * points, hole finding on the 2M-point face. Each figure is a median after warm-up, with a ratio
 * to a baseline measured in the same run on the same data (so machines can be compared):
 *   - parse baseline: decoding the same vertex bytes with a bare DataView loop into a Float64Array
 *   - hole fit baseline: the bare geometric circle fit of the same points (no rim, no quality)
 * Targets (issue 8, this machine): parse + plane < 2 s, hole fit < 50 ms.
 *
 *   npm run bench:measure
 */
import { readFileSync } from 'node:fs';
import { MeasureFileParser } from '../src/domain/measure/formats';
import { fitCircle } from '../src/domain/fit/circle';
import { fitPlaneRansac } from '../src/domain/fit/ransacPlane';
import { fitHoleFromIndices } from '../src/domain/measure/holes';
import { MeasureSession } from '../src/domain/measure/session';
import { BELL_FACE, makeFace, seeded, writePlyBinary } from '../tests/fixtures/measure/syntheticFace';

/** the machine's 1-minute load average, printed with the figures (they mean little on a busy machine) */
function loadavg(): number | null {
  try {
    return Number(readFileSync('/proc/loadavg', 'utf8').split(' ')[0]);
  } catch {
    return null;
  }
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

function time<T>(runs: number, warm: number, fn: () => T): { ms: number; last: T } {
  let last!: T;
  for (let i = 0; i < warm; i++) last = fn();
  const t: number[] = [];
  for (let i = 0; i < runs; i++) {
    const s = performance.now();
    last = fn();
    t.push(performance.now() - s);
  }
  return { ms: median(t), last };
}

const line = (name: string, ms: number, base: number, extra = '') => console.log(`${name.padEnd(52)} ${ms.toFixed(1).padStart(8)} ms   ×${(ms / base).toFixed(1).padStart(6)} baseline${extra}`);

// ── 2M-point binary PLY ───────────────────────────────────────────────────────────────────────
const spacing = Math.sqrt((Math.PI * (150 ** 2 - 55 ** 2)) / 1_950_000);
const face = makeFace({ ...BELL_FACE, spacingMm: spacing });
const count = face.points.length / 3;
const ply = writePlyBinary(face.points);
const headerEnd = new TextDecoder().decode(ply.subarray(0, 1000)).indexOf('end_header\n') + 'end_header\n'.length;
const load1AtStart = loadavg();
console.log(`load average at start (1 min): ${load1AtStart ?? 'unknown'}`);
console.log(`binary PLY: ${count.toLocaleString('en-US')} points, ${(ply.length / 1e6).toFixed(1)} MB (float32 x y z + 1 byte)`);

const CHUNK = 1 << 20;
const decodeBaseline = () => {
  // the least a reader can do: one DataView over the whole body, x y z of every vertex
  const out = new Float64Array(count * 3);
  const view = new DataView(ply.buffer, ply.byteOffset + headerEnd);
  for (let v = 0, o = 0; v < count; v++, o += 13) {
    out[3 * v] = view.getFloat32(o, true);
    out[3 * v + 1] = view.getFloat32(o + 4, true);
    out[3 * v + 2] = view.getFloat32(o + 8, true);
  }
  return out;
};
const parse = () => {
  const p = new MeasureFileParser({ fileName: 'face.ply', maxPoints: 5_000_000 });
  for (let at = 0; at < ply.length; at += CHUNK) p.push(ply.subarray(at, Math.min(ply.length, at + CHUNK)));
  return p.end().points!;
};
const base = time(5, 2, decodeBaseline).ms;
line('baseline: bare DataView decode', base, base);
const parsed = time(5, 2, parse);
line('parse (format check, header, vertices, bbox)', parsed.ms, base);
const plane = time(5, 2, () => fitPlaneRansac(parsed.last));
line('face plane (RANSAC + least squares)', plane.ms, base, `   inliers ${plane.last.n.toLocaleString('en-US')}`);
const both = time(3, 1, () => fitPlaneRansac(parse()));
line('parse + face plane  [target < 2000 ms]', both.ms, base);

const before = process.memoryUsage();
const held = parse();
const after = process.memoryUsage();
console.log(`memory while parsing: +${((after.arrayBuffers - before.arrayBuffers) / 1e6).toFixed(0)} MB array buffers for a ${(held.byteLength / 1e6).toFixed(0)} MB Float64Array of the points`);

const holes = time(3, 1, () => {
  const s = new MeasureSession(parsed.last);
  return s.run({ kind: 'holes' });
});
line('face plane + hole finding on the 2M-point face', holes.ms, base, `   holes ${holes.last.kind === 'holes' ? holes.last.holes.length : 0}`);

// ── hole fit of 50 000 points ─────────────────────────────────────────────────────────────────
const n = 50_000;
const rand = seeded(3);
const uv = new Float64Array(2 * n);
for (let i = 0; i < n; i++) {
  const t = 2 * Math.PI * rand();
  const r = 5.5 + 0.02 * (rand() + rand() + rand() - 1.5);
  uv[2 * i] = 110.8 + r * Math.cos(t);
  uv[2 * i + 1] = 45.9 + r * Math.sin(t);
}
const all = Int32Array.from({ length: n }, (_, i) => i);
const sumBase = time(21, 5, () => fitCircle(uv)).ms;
line('baseline: bare geometric circle fit of the 50 000 points', sumBase, sumBase);
const fitAll = time(21, 5, () => fitHoleFromIndices(uv, all, { rim: 'all' }));
line('hole fit, all 50 000 points  [target < 50 ms]', fitAll.ms, sumBase, `   Ø ${fitAll.last.diameterMm.toFixed(4)}`);
const fitEdge = time(21, 5, () => fitHoleFromIndices(uv, all, { rim: 'edge' }));
line('hole fit, rim of 50 000 points (edge)', fitEdge.ms, sumBase, `   rim ${fitEdge.last.n}`);

// ── one JSON line last: figures, ratios to their baselines, targets and the machine's load ────
const r2 = (x: number) => Math.round(x * 100) / 100;
console.log(
  JSON.stringify({
    bench: 'measure',
    points: count,
    parseMs: r2(parsed.ms),
    planeMs: r2(plane.ms),
    parsePlusPlaneMs: r2(both.ms),
    parsePlusPlaneTargetMs: 2000,
    parsePlusPlaneOk: both.ms < 2000,
    parseVsDecodeBaseline: r2(parsed.ms / base),
    holeFindingMs: r2(holes.ms),
    holeFit50kMs: r2(fitAll.ms),
    holeFit50kTargetMs: 50,
    holeFit50kOk: fitAll.ms < 50,
    holeFitVsCircleBaseline: r2(fitAll.ms / sumBase),
    holeFitEdgeMs: r2(fitEdge.ms),
    load1AtStart,
    load1AtEnd: loadavg(),
  }),
);
