/**
 * The dominant plane of a scan: a flange face among points on hole walls, bores, fixtures and
 * stray returns. Robust in two steps:
 *
 * 1. RANSAC on a random subsample: planes through 3 random points, each scored by the median
 *    squared distance of the subsample (least median of squares, so no threshold is needed up
 *    front). The best one gives a robust noise scale σ = 1.4826·(1 + 5/(m − 3))·√median.
 * 2. Least-squares refinement: every point within `k·σ` of the plane is an inlier; the
 *    orthogonal least-squares plane of the inliers (centroid + smallest eigenvector of the
 *    scatter, as `fitPlane`) replaces it, σ is re-estimated from the inliers, and this repeats
 *    until the inlier set no longer changes.
 *
 * Deterministic: the random numbers come from a seeded generator, so the browser worker and the
 * server get the same plane from the same points. Works over the interleaved Float64Array in
 * place; the only per-point memory is one byte of inlier mask.
 */
import { DomainError } from '../errors';
import { flatPoints } from './points';
import type { PlaneFit, Vector3 } from './plane';
import { symmetricEigen } from './smallMatrix';

export interface RansacPlaneOptions {
  /** inlier distance; default k·σ from the data */
  readonly thresholdMm?: number;
  /** k of the automatic threshold; default 3 */
  readonly sigmaMultiple?: number;
  /** RANSAC hypotheses; default 400 */
  readonly iterations?: number;
  /** points scored per hypothesis; default 3000 */
  readonly sampleSize?: number;
  readonly seed?: number;
}

export interface RobustPlaneFit extends PlaneFit {
  /** all points given */
  readonly total: number;
  /** points farther than the threshold */
  readonly outliers: number;
  readonly thresholdMm: number;
  /** robust noise estimate of the face */
  readonly sigmaMm: number;
  /** 1 for an inlier, per point */
  readonly inliers: Uint8Array;
  readonly refinements: number;
}

/** mulberry32: small, fast, good enough to pick samples. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** k-th smallest of a[0..n) (a is reordered). */
function select(a: Float64Array, n: number, k: number): number {
  let lo = 0;
  let hi = n - 1;
  while (lo < hi) {
    const pivot = a[(lo + hi) >> 1]!;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        const t = a[i]!;
        a[i] = a[j]!;
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k]!;
  }
  return a[k]!;
}

/** The orientation rule of `fitPlane`: z > 0, else y > 0, else x > 0. */
function orient(x: number, y: number, z: number): Vector3 {
  const len = Math.sqrt(x * x + y * y + z * z);
  let nx = x / len;
  let ny = y / len;
  let nz = z / len;
  const tol = 1e-12;
  const flip = Math.abs(nz) > tol ? nz < 0 : Math.abs(ny) > tol ? ny < 0 : nx < 0;
  if (flip) {
    nx = -nx;
    ny = -ny;
    nz = -nz;
  }
  return Object.freeze({ x: nx + 0, y: ny + 0, z: nz + 0 });
}

interface Plane {
  nx: number;
  ny: number;
  nz: number;
  /** n·p = d */
  d: number;
}

/** Least-squares plane of the masked points; null when they do not span a plane. */
function leastSquares(flat: Float64Array, mask: Uint8Array): { plane: Plane; centroid: Vector3; count: number; normal: Vector3 } | null {
  let sx = 0;
  let sy = 0;
  let sz = 0;
  let count = 0;
  for (let i = 0, p = 0; p < flat.length; i++, p += 3) {
    if (mask[i] === 0) continue;
    sx += flat[p]!;
    sy += flat[p + 1]!;
    sz += flat[p + 2]!;
    count++;
  }
  if (count < 3) return null;
  const mx = sx / count;
  const my = sy / count;
  const mz = sz / count;
  let xx = 0;
  let yy = 0;
  let zz = 0;
  let xy = 0;
  let xz = 0;
  let yz = 0;
  for (let i = 0, p = 0; p < flat.length; i++, p += 3) {
    if (mask[i] === 0) continue;
    const u = flat[p]! - mx;
    const v = flat[p + 1]! - my;
    const w = flat[p + 2]! - mz;
    xx += u * u;
    yy += v * v;
    zz += w * w;
    xy += u * v;
    xz += u * w;
    yz += v * w;
  }
  const { values, vectors } = symmetricEigen(Float64Array.of(xx, xy, xz, xy, yy, yz, xz, yz, zz), 3);
  if (!(values[1]! > 1e-14 * values[2]!)) return null;
  const normal = orient(vectors[0]!, vectors[3]!, vectors[6]!);
  return {
    plane: { nx: normal.x, ny: normal.y, nz: normal.z, d: normal.x * mx + normal.y * my + normal.z * mz },
    centroid: Object.freeze({ x: mx, y: my, z: mz }),
    count,
    normal,
  };
}

/** Robust dominant plane of interleaved x, y, z points. */
export function fitPlaneRansac(points: Float64Array, opts: RansacPlaneOptions = {}): RobustPlaneFit {
  const flat = flatPoints(points, 3, 'Face plane fit');
  const n = flat.length / 3;
  const k = opts.sigmaMultiple ?? 3;
  const random = seededRandom(opts.seed ?? 0x5eed);
  const m = Math.min(n, opts.sampleSize ?? 3000);

  // subsample (with replacement for large n; all points for small n)
  const sample = new Int32Array(m);
  for (let i = 0; i < m; i++) sample[i] = m === n ? i : Math.floor(random() * n);

  let extent = 0;
  for (let i = 0; i < m; i++) {
    const p = sample[i]! * 3;
    const q = sample[(i * 7919) % m]! * 3;
    extent = Math.max(extent, Math.abs(flat[p]! - flat[q]!), Math.abs(flat[p + 1]! - flat[q + 1]!), Math.abs(flat[p + 2]! - flat[q + 2]!));
  }
  if (!(extent > 0)) {
    throw new DomainError('fit.coincident', `Face plane fit: all ${n} points are at the same place.`, ['points']);
  }

  const d2 = new Float64Array(m);
  let best: Plane | null = null;
  let bestScore = Infinity;
  const iterations = opts.iterations ?? 400;
  const fixed = opts.thresholdMm;
  for (let it = 0; it < iterations; it++) {
    const a = sample[Math.floor(random() * m)]! * 3;
    const b = sample[Math.floor(random() * m)]! * 3;
    const c = sample[Math.floor(random() * m)]! * 3;
    const ux = flat[b]! - flat[a]!;
    const uy = flat[b + 1]! - flat[a + 1]!;
    const uz = flat[b + 2]! - flat[a + 2]!;
    const vx = flat[c]! - flat[a]!;
    const vy = flat[c + 1]! - flat[a + 1]!;
    const vz = flat[c + 2]! - flat[a + 2]!;
    let nx = uy * vz - uz * vy;
    let ny = uz * vx - ux * vz;
    let nz = ux * vy - uy * vx;
    const len = Math.sqrt(nx * nx + ny * ny + nz * nz);
    // a degenerate (nearly collinear) triple says nothing about the plane
    if (!(len > 1e-6 * extent * extent)) continue;
    nx /= len;
    ny /= len;
    nz /= len;
    const d = nx * flat[a]! + ny * flat[a + 1]! + nz * flat[a + 2]!;
    let score: number;
    if (fixed !== undefined) {
      // MSAC: truncated squared distances
      const t2 = fixed * fixed;
      score = 0;
      for (let i = 0; i < m; i++) {
        const p = sample[i]! * 3;
        const e = nx * flat[p]! + ny * flat[p + 1]! + nz * flat[p + 2]! - d;
        score += Math.min(e * e, t2);
      }
    } else {
      for (let i = 0; i < m; i++) {
        const p = sample[i]! * 3;
        const e = nx * flat[p]! + ny * flat[p + 1]! + nz * flat[p + 2]! - d;
        d2[i] = e * e;
      }
      score = select(d2, m, m >> 1);
    }
    if (score < bestScore) {
      bestScore = score;
      best = { nx, ny, nz, d };
    }
  }
  if (!best) {
    throw new DomainError('fit.collinear', `Face plane fit: the ${n} points lie on a straight line; a face needs points spread over an area.`, ['points']);
  }

  const floor = 1e-9 * extent;
  let sigma = fixed !== undefined ? fixed / k : 1.4826 * (1 + 5 / Math.max(1, m - 3)) * Math.sqrt(bestScore);
  let threshold = fixed ?? Math.max(k * sigma, floor);
  const mask = new Uint8Array(n);
  let plane = best;
  let result: ReturnType<typeof leastSquares> = null;
  let refinements = 0;
  for (; refinements < 12; refinements++) {
    let count = 0;
    let changed = 0;
    for (let i = 0, p = 0; i < n; i++, p += 3) {
      const e = plane.nx * flat[p]! + plane.ny * flat[p + 1]! + plane.nz * flat[p + 2]! - plane.d;
      const inside = e <= threshold && e >= -threshold ? 1 : 0;
      if (inside !== mask[i]) changed++;
      mask[i] = inside;
      count += inside;
    }
    if (count < 3) {
      throw new DomainError('fit.tooFewPoints', `Face plane fit: only ${count} of ${n} points lie within ${threshold.toPrecision(3)} mm of the best plane; the points do not show one face.`, ['points']);
    }
    // settled: (almost) no point changed sides
    if (refinements > 0 && changed <= Math.max(0, Math.floor(n * 1e-5))) break;
    const ls = leastSquares(flat, mask);
    if (!ls) {
      throw new DomainError('fit.collinear', 'Face plane fit: the points near the best plane lie on a line; a face needs points spread over an area.', ['points']);
    }
    result = ls;
    plane = ls.plane;
    if (fixed === undefined) {
      let sum = 0;
      for (let i = 0, p = 0; i < n; i++, p += 3) {
        if (mask[i] === 0) continue;
        const e = plane.nx * flat[p]! + plane.ny * flat[p + 1]! + plane.nz * flat[p + 2]! - plane.d;
        sum += e * e;
      }
      // inliers are the normal distribution cut at ±kσ: its RMS is σ·√(1 − 2kφ(k)/(2Φ(k) − 1))
      sigma = Math.sqrt(sum / ls.count) / truncatedSdFactor(k);
      threshold = Math.max(k * sigma, floor);
    }
  }
  if (!result) throw new DomainError('fit.notConverged', 'Face plane fit did not settle.', ['points']);

  // final statistics from the refined plane over its inliers
  let minD = Infinity;
  let maxD = -Infinity;
  let sum = 0;
  let count = 0;
  for (let i = 0, p = 0; i < n; i++, p += 3) {
    if (mask[i] === 0) continue;
    const e = plane.nx * flat[p]! + plane.ny * flat[p + 1]! + plane.nz * flat[p + 2]! - plane.d;
    sum += e * e;
    if (e < minD) minD = e;
    if (e > maxD) maxD = e;
    count++;
  }
  return Object.freeze({
    normal: result.normal,
    centroid: result.centroid,
    flatness: maxD - minD,
    rms: Math.sqrt(sum / count),
    n: count,
    total: n,
    outliers: n - count,
    thresholdMm: threshold,
    sigmaMm: sigma,
    inliers: mask,
    refinements,
  });
}

/** RMS of a standard normal cut at ±k, relative to σ. */
function truncatedSdFactor(k: number): number {
  const phi = Math.exp(-0.5 * k * k) / Math.sqrt(2 * Math.PI);
  const inside = erf(k / Math.SQRT2);
  return Math.sqrt(Math.max(1e-6, 1 - (2 * k * phi) / inside));
}

/** Error function (rational approximation, absolute error < 1.5e-7). */
function erf(x: number): number {
  const t = 1 / (1 + 0.3275911 * Math.abs(x));
  const y = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-x * x);
  return x >= 0 ? y : -y;
}
