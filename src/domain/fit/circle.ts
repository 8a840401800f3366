/**
 * Least-squares circle through measured points (a bore, a spigot, a bolt circle's hole centres).
 *
 * Methods:
 * - 'geometric' (default): minimises the sum of squared orthogonal distances Σ(‖pᵢ − c‖ − r)²
 *   by Levenberg–Marquardt, started from the algebraic fit. Independent of where the origin is
 *   and how the points are rotated.
 * - 'algebraic': the ‖u‖ = 1 form a(x² + y²) + b₁x + b₂y + c = 0, u = right singular vector of
 *   the smallest singular value (Gander, Golub & Strebel). Computed in the caller's coordinates,
 *   exactly as published: like every ‖u‖ = 1 fit it depends on the origin and scale, so it is a
 *   reference and a starting value, not a measurement result.
 * - 'kasa': linear least squares of x² + y² + Dx + Ey + F = 0 (fast, biased towards small
 *   radii on short arcs).
 *
 * The data are centred on their mean (and, for the geometric and Kåsa fits, scaled to unit RMS
 * radius) before fitting, so coordinates far from the origin lose no precision. Every method
 * reports orthogonal-distance statistics: rms and max of |‖pᵢ − c‖ − r| and roundness =
 * max − min radial distance (the least-squares-circle roundness).
 *
 * Large scans: pass a Float64Array of interleaved x, y; no per-point objects are created.
 */
import { DomainError } from '../errors';
import { flatPoints, type Points2 } from './points';
import { GivensTriangle, rightSingular, solveSmall } from './smallMatrix';

export type CircleFitMethod = 'geometric' | 'kasa' | 'algebraic';

export interface CircleFit {
  readonly centerX: number;
  readonly centerY: number;
  readonly radius: number;
  /** √(Σeᵢ²/n), eᵢ = ‖pᵢ − c‖ − r */
  readonly rms: number;
  /** max |eᵢ| */
  readonly maxDeviation: number;
  /** max ‖pᵢ − c‖ − min ‖pᵢ − c‖ */
  readonly roundness: number;
  readonly n: number;
  readonly method: CircleFitMethod;
}

export interface CircleFitOptions {
  readonly method?: CircleFitMethod;
}

/** Smallest/largest eigenvalue of the normalised scatter below this: the points lie on a line. */
const COLLINEAR_RATIO = 1e-14;
const MAX_ITERATIONS = 200;
/** A radius this many times the points' RMS spread is a straight line for every practical purpose. */
const MAX_NORMALISED_RADIUS = 1e7;

interface Frame {
  readonly flat: Float64Array;
  readonly n: number;
  readonly meanX: number;
  readonly meanY: number;
  /** RMS distance from the mean */
  readonly scale: number;
}

function frameOf(points: Points2): Frame {
  const flat = flatPoints(points, 2, 'Circle fit');
  const n = flat.length / 2;
  let sx = 0;
  let sy = 0;
  for (let i = 0; i < flat.length; i += 2) {
    sx += flat[i]!;
    sy += flat[i + 1]!;
  }
  const meanX = sx / n;
  const meanY = sy / n;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (let i = 0; i < flat.length; i += 2) {
    const u = flat[i]! - meanX;
    const v = flat[i + 1]! - meanY;
    sxx += u * u;
    syy += v * v;
    sxy += u * v;
  }
  const scale = Math.sqrt((sxx + syy) / n);
  const magnitude = Math.max(1, Math.abs(meanX), Math.abs(meanY));
  if (!(scale > 1e-12 * magnitude)) {
    throw new DomainError(
      'fit.coincident',
      `Circle fit: all ${n} points are at the same place (${meanX}, ${meanY}); a circle needs points spread around it.`,
      ['points'],
    );
  }
  const tr = sxx + syy;
  const det = sxx * syy - sxy * sxy;
  const lambdaMin = (tr - Math.sqrt(Math.max(0, tr * tr - 4 * det))) / 2;
  if (lambdaMin <= COLLINEAR_RATIO * tr) {
    throw new DomainError(
      'fit.collinear',
      `Circle fit: the ${n} points lie on a straight line; a circle needs points that are not collinear.`,
      ['points'],
    );
  }
  return { flat, n, meanX, meanY, scale };
}

/** Circle from the ‖u‖ = 1 algebraic parameters; null for a line or an imaginary circle. */
function circleFromU(a: number, b1: number, b2: number, c: number): { cx: number; cy: number; r: number } | null {
  const norm = Math.sqrt(a * a + b1 * b1 + b2 * b2 + c * c);
  if (!(Math.abs(a) > 1e-13 * norm)) return null;
  const cx = -b1 / (2 * a);
  const cy = -b2 / (2 * a);
  const r2 = cx * cx + cy * cy - c / a;
  if (!(r2 > 0)) return null;
  return { cx, cy, r: Math.sqrt(r2) };
}

/**
 * ‖u‖ = 1 algebraic fit of points (x − ox)/s, (y − oy)/s. Rows [x² + y², x, y, 1] are reduced by
 * streaming Givens QR, then the smallest right singular vector of R is taken.
 */
function algebraic(frame: Frame, ox: number, oy: number, s: number): { cx: number; cy: number; r: number } {
  const { flat } = frame;
  const tri = new GivensTriangle(4);
  const row = new Float64Array(4);
  const inv = 1 / s;
  for (let i = 0; i < flat.length; i += 2) {
    const x = (flat[i]! - ox) * inv;
    const y = (flat[i + 1]! - oy) * inv;
    row[0] = x * x + y * y;
    row[1] = x;
    row[2] = y;
    row[3] = 1;
    tri.add(row);
  }
  const { vectors } = rightSingular(tri.r, 4);
  // column 0 = smallest singular value
  const c = circleFromU(vectors[0]!, vectors[4]!, vectors[8]!, vectors[12]!);
  if (!c) {
    throw new DomainError(
      'fit.collinear',
      `Circle fit: the ${frame.n} points are too close to a straight line for an algebraic circle.`,
      ['points'],
    );
  }
  return { cx: ox + c.cx * s, cy: oy + c.cy * s, r: c.r * s };
}

/** Kåsa fit in the centred, scaled frame. Returns the circle in that frame. */
function kasa(frame: Frame): { cx: number; cy: number; r: number } {
  const { flat, meanX, meanY, scale, n } = frame;
  const inv = 1 / scale;
  let suu = 0;
  let svv = 0;
  let suv = 0;
  let suz = 0;
  let svz = 0;
  let sz = 0;
  for (let i = 0; i < flat.length; i += 2) {
    const u = (flat[i]! - meanX) * inv;
    const v = (flat[i + 1]! - meanY) * inv;
    const z = u * u + v * v;
    suu += u * u;
    svv += v * v;
    suv += u * v;
    suz += u * z;
    svz += v * z;
    sz += z;
  }
  // Σu = Σv = 0 in this frame, so F decouples: F = −Σz/n.
  const sol = solveSmall(Float64Array.of(suu, suv, suv, svv), Float64Array.of(-suz, -svz), 2);
  if (!sol) {
    throw new DomainError('fit.collinear', `Circle fit: the ${n} points lie on a straight line.`, ['points']);
  }
  const D = sol[0]!;
  const E = sol[1]!;
  const F = -sz / n;
  const cx = -D / 2;
  const cy = -E / 2;
  const r2 = cx * cx + cy * cy - F;
  return { cx, cy, r: Math.sqrt(r2) };
}

/** Sum of squared orthogonal residuals in the centred, scaled frame. */
function sse(frame: Frame, a: number, b: number, r: number): number {
  const { flat, meanX, meanY, scale } = frame;
  const inv = 1 / scale;
  let sum = 0;
  for (let i = 0; i < flat.length; i += 2) {
    const du = (flat[i]! - meanX) * inv - a;
    const dv = (flat[i + 1]! - meanY) * inv - b;
    const e = Math.sqrt(du * du + dv * dv) - r;
    sum += e * e;
  }
  return sum;
}

/** Levenberg–Marquardt on (a, b, r) in the centred, scaled frame. */
function geometric(frame: Frame, start: { cx: number; cy: number; r: number }): { cx: number; cy: number; r: number } {
  const { flat, meanX, meanY, scale, n } = frame;
  const inv = 1 / scale;
  let a = start.cx;
  let b = start.cy;
  let r = start.r;
  let cost = sse(frame, a, b, r);
  let lambda = 1e-3;
  const jtj = new Float64Array(9);
  const jte = new Float64Array(3);
  const lhs = new Float64Array(9);

  for (let iter = 0; iter < MAX_ITERATIONS; iter++) {
    jtj.fill(0);
    jte.fill(0);
    for (let i = 0; i < flat.length; i += 2) {
      const du = (flat[i]! - meanX) * inv - a;
      const dv = (flat[i + 1]! - meanY) * inv - b;
      const d = Math.sqrt(du * du + dv * dv);
      const e = d - r;
      // ∂e/∂a = −du/d, ∂e/∂b = −dv/d, ∂e/∂r = −1 (a point on the centre contributes only to r)
      const ja = d > 0 ? -du / d : 0;
      const jb = d > 0 ? -dv / d : 0;
      jtj[0] += ja * ja;
      jtj[1] += ja * jb;
      jtj[2] -= ja;
      jtj[4] += jb * jb;
      jtj[5] -= jb;
      jte[0] += ja * e;
      jte[1] += jb * e;
      jte[2] -= e;
    }
    jtj[3] = jtj[1]!;
    jtj[6] = jtj[2]!;
    jtj[7] = jtj[5]!;
    jtj[8] = n;

    let improved = false;
    while (lambda < 1e16) {
      lhs.set(jtj);
      for (let d = 0; d < 3; d++) lhs[d * 4] = jtj[d * 4]! * (1 + lambda);
      const step = solveSmall(lhs, Float64Array.of(-jte[0]!, -jte[1]!, -jte[2]!), 3);
      if (!step) {
        lambda *= 10;
        continue;
      }
      const na = a + step[0]!;
      const nb = b + step[1]!;
      const nr = r + step[2]!;
      const newCost = sse(frame, na, nb, nr);
      if (newCost <= cost) {
        const stepNorm = Math.sqrt(step[0]! ** 2 + step[1]! ** 2 + step[2]! ** 2);
        a = na;
        b = nb;
        r = nr;
        const relDrop = cost > 0 ? (cost - newCost) / cost : 0;
        cost = newCost;
        lambda = Math.max(lambda / 10, 1e-12);
        improved = true;
        if (stepNorm <= 1e-12 * (1 + Math.abs(r)) || relDrop < 1e-15 || cost <= 1e-30 * n) {
          return finish();
        }
        if (Math.abs(r) > MAX_NORMALISED_RADIUS) {
          throw new DomainError(
            'fit.collinear',
            `Circle fit: the best-fitting circle grows without bound — the ${n} points are closer to a straight line than to any circle.`,
            ['points'],
          );
        }
        break;
      }
      lambda *= 10;
    }
    // no step lowers the cost any further: at the minimum to machine precision
    if (!improved) return finish();
  }
  throw new DomainError(
    'fit.notConverged',
    `Circle fit: the geometric fit did not settle in ${MAX_ITERATIONS} iterations; the points do not define a clear circle (nearly a straight line, or a tight cluster with a few outliers).`,
    ['points'],
  );

  function finish(): { cx: number; cy: number; r: number } {
    if (!(Math.abs(r) > 0) || !Number.isFinite(r)) {
      throw new DomainError('fit.notConverged', 'Circle fit: the geometric fit ended without a valid radius.', ['points']);
    }
    return { cx: a, cy: b, r: Math.abs(r) };
  }
}

function report(
  frame: Frame,
  method: CircleFitMethod,
  // circle relative to the mean, in input units
  rel: { cx: number; cy: number; r: number },
): CircleFit {
  const { flat, n, meanX, meanY } = frame;
  let sum = 0;
  let maxDev = 0;
  let minD = Infinity;
  let maxD = -Infinity;
  for (let i = 0; i < flat.length; i += 2) {
    const du = flat[i]! - meanX - rel.cx;
    const dv = flat[i + 1]! - meanY - rel.cy;
    const d = Math.sqrt(du * du + dv * dv);
    const e = d - rel.r;
    sum += e * e;
    const ae = Math.abs(e);
    if (ae > maxDev) maxDev = ae;
    if (d < minD) minD = d;
    if (d > maxD) maxD = d;
  }
  const result: CircleFit = {
    centerX: meanX + rel.cx,
    centerY: meanY + rel.cy,
    radius: rel.r,
    rms: Math.sqrt(sum / n),
    maxDeviation: maxDev,
    roundness: maxD - minD,
    n,
    method,
  };
  for (const [key, value] of Object.entries(result)) {
    if (typeof value === 'number' && !Number.isFinite(value)) {
      throw new DomainError('fit.notConverged', `Circle fit: the ${method} fit produced a non-finite ${key}; check the points.`, ['points']);
    }
  }
  return Object.freeze(result);
}

/** Fits a circle; see the module comment for the methods. */
export function fitCircle(points: Points2, opts: CircleFitOptions = {}): CircleFit {
  const method = opts.method ?? 'geometric';
  if (method !== 'geometric' && method !== 'kasa' && method !== 'algebraic') {
    throw new DomainError('fit.method', `Unknown circle fit method "${String(method)}": use geometric, algebraic or kasa.`, ['method']);
  }
  const frame = frameOf(points);
  const { meanX, meanY, scale } = frame;

  if (method === 'algebraic') {
    // published form: the caller's origin and scale
    const c = algebraic(frame, 0, 0, 1);
    return report(frame, method, { cx: c.cx - meanX, cy: c.cy - meanY, r: c.r });
  }
  if (method === 'kasa') {
    const c = kasa(frame);
    return report(frame, method, { cx: c.cx * scale, cy: c.cy * scale, r: c.r * scale });
  }
  // start: the algebraic fit in the centred, scaled frame (origin- and scale-independent)
  const s = algebraic(frame, meanX, meanY, scale);
  const start = { cx: (s.cx - meanX) / scale, cy: (s.cy - meanY) / scale, r: s.r / scale };
  const g = geometric(frame, start);
  return report(frame, method, { cx: g.cx * scale, cy: g.cy * scale, r: g.r * scale });
}
