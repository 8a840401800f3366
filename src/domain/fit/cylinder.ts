/**
 * Least-squares cylinder through points on a bore or a shaft: minimises Σ(dᵢ − r)², dᵢ the
 * distance of point i from the axis. Five parameters (axis position across the axis, axis
 * direction, radius), refined by Levenberg–Marquardt in a frame re-aligned with the current axis
 * at every step, so the linearisation is always about a = b = 0.
 *
 * Start: the axis along `axisHint` (e.g. the face normal — a bore is square to its face) or, if
 * none is given, each of the three principal directions of the points; the points are projected
 * across that direction and a geometric circle fit gives the start position and radius. The
 * start with the lowest residual wins.
 *
 * cylindricity = max dᵢ − min dᵢ (the least-squares value; the minimum-zone value is ≤ this).
 */
import { DomainError } from '../errors';
import { fitCircle } from './circle';
import type { Vector3 } from './plane';
import { flatPoints } from './points';
import { solveSmall, symmetricEigen } from './smallMatrix';

export interface CylinderFit {
  /** point on the axis nearest the points' centroid */
  readonly axisPoint: Vector3;
  /** unit direction, oriented like `axisHint` when given, else with z ≥ 0 */
  readonly axisDirection: Vector3;
  readonly radius: number;
  readonly diameterMm: number;
  /** √(Σeᵢ²/n), eᵢ = dᵢ − r */
  readonly rms: number;
  readonly maxDeviation: number;
  /** max dᵢ − min dᵢ */
  readonly cylindricity: number;
  /** span of the points along the axis */
  readonly lengthMm: number;
  /** how much of the circumference the points cover, degrees */
  readonly arcCoverageDeg: number;
  readonly n: number;
  readonly iterations: number;
}

export interface CylinderFitOptions {
  readonly axisHint?: Vector3;
}

const MAX_ITERATIONS = 100;

interface Axis {
  px: number;
  py: number;
  pz: number;
  dx: number;
  dy: number;
  dz: number;
  r: number;
}

/** Two unit vectors completing d to a right-handed frame. */
function across(dx: number, dy: number, dz: number): [number, number, number, number, number, number] {
  // pick the global axis least aligned with d
  const ax = Math.abs(dx);
  const ay = Math.abs(dy);
  const az = Math.abs(dz);
  let tx = 0;
  let ty = 0;
  let tz = 0;
  if (ax <= ay && ax <= az) tx = 1;
  else if (ay <= az) ty = 1;
  else tz = 1;
  // e1 = normalise(t − (t·d)d), e2 = d × e1
  const dot = tx * dx + ty * dy + tz * dz;
  let e1x = tx - dot * dx;
  let e1y = ty - dot * dy;
  let e1z = tz - dot * dz;
  const l = Math.sqrt(e1x * e1x + e1y * e1y + e1z * e1z);
  e1x /= l;
  e1y /= l;
  e1z /= l;
  return [e1x, e1y, e1z, dy * e1z - dz * e1y, dz * e1x - dx * e1z, dx * e1y - dy * e1x];
}

function sse(flat: Float64Array, a: Axis): number {
  let sum = 0;
  for (let p = 0; p < flat.length; p += 3) {
    const x = flat[p]! - a.px;
    const y = flat[p + 1]! - a.py;
    const z = flat[p + 2]! - a.pz;
    const t = x * a.dx + y * a.dy + z * a.dz;
    const qx = x - t * a.dx;
    const qy = y - t * a.dy;
    const qz = z - t * a.dz;
    const e = Math.sqrt(qx * qx + qy * qy + qz * qz) - a.r;
    sum += e * e;
  }
  return sum;
}

function startFrom(flat: Float64Array, cx: number, cy: number, cz: number, dx: number, dy: number, dz: number): Axis | null {
  const [e1x, e1y, e1z, e2x, e2y, e2z] = across(dx, dy, dz);
  const n = flat.length / 3;
  const uv = new Float64Array(2 * n);
  for (let i = 0, p = 0; i < n; i++, p += 3) {
    const x = flat[p]! - cx;
    const y = flat[p + 1]! - cy;
    const z = flat[p + 2]! - cz;
    uv[2 * i] = x * e1x + y * e1y + z * e1z;
    uv[2 * i + 1] = x * e2x + y * e2y + z * e2z;
  }
  try {
    const c = fitCircle(uv);
    return {
      px: cx + c.centerX * e1x + c.centerY * e2x,
      py: cy + c.centerX * e1y + c.centerY * e2y,
      pz: cz + c.centerX * e1z + c.centerY * e2z,
      dx,
      dy,
      dz,
      r: c.radius,
    };
  } catch {
    return null;
  }
}

function refine(flat: Float64Array, start: Axis, scale: number): { axis: Axis; cost: number; iterations: number } {
  let axis = { ...start };
  let cost = sse(flat, axis);
  let lambda = 1e-3;
  const jtj = new Float64Array(25);
  const jte = new Float64Array(5);
  const lhs = new Float64Array(25);
  const rhs = new Float64Array(5);
  const j = new Float64Array(5);
  let iterations = 0;
  for (; iterations < MAX_ITERATIONS; iterations++) {
    const [e1x, e1y, e1z, e2x, e2y, e2z] = across(axis.dx, axis.dy, axis.dz);
    jtj.fill(0);
    jte.fill(0);
    for (let p = 0; p < flat.length; p += 3) {
      const x0 = flat[p]! - axis.px;
      const y0 = flat[p + 1]! - axis.py;
      const z0 = flat[p + 2]! - axis.pz;
      // frame: u, v across the axis, w along it (scaled to ~1 for conditioning)
      const u = (x0 * e1x + y0 * e1y + z0 * e1z) / scale;
      const v = (x0 * e2x + y0 * e2y + z0 * e2z) / scale;
      const w = (x0 * axis.dx + y0 * axis.dy + z0 * axis.dz) / scale;
      const d = Math.sqrt(u * u + v * v);
      const e = d - axis.r / scale;
      const cu = d > 0 ? u / d : 0;
      const cv = d > 0 ? v / d : 0;
      // ∂e/∂(u0, v0, a, b, r) at a = b = 0 for axis (u0 + a·w, v0 + b·w, w)
      j[0] = -cu;
      j[1] = -cv;
      j[2] = -w * cu;
      j[3] = -w * cv;
      j[4] = -1;
      for (let r = 0; r < 5; r++) {
        jte[r] += j[r]! * e;
        for (let c = r; c < 5; c++) jtj[r * 5 + c] += j[r]! * j[c]!;
      }
    }
    for (let r = 0; r < 5; r++) for (let c = 0; c < r; c++) jtj[r * 5 + c] = jtj[c * 5 + r]!;
    let improved = false;
    while (lambda < 1e16) {
      lhs.set(jtj);
      for (let d = 0; d < 5; d++) lhs[d * 6] = jtj[d * 6]! * (1 + lambda) + 1e-300;
      for (let d = 0; d < 5; d++) rhs[d] = -jte[d]!;
      const step = solveSmall(lhs, rhs, 5);
      if (!step) {
        lambda *= 10;
        continue;
      }
      const [su, sv, sa, sb, sr] = [step[0]! * scale, step[1]! * scale, step[2]!, step[3]!, step[4]! * scale];
      // new direction (a, b, 1) in the frame, normalised
      const len = Math.sqrt(sa * sa + sb * sb + 1);
      const ndx = (sa * e1x + sb * e2x + axis.dx) / len;
      const ndy = (sa * e1y + sb * e2y + axis.dy) / len;
      const ndz = (sa * e1z + sb * e2z + axis.dz) / len;
      const next: Axis = {
        px: axis.px + su * e1x + sv * e2x,
        py: axis.py + su * e1y + sv * e2y,
        pz: axis.pz + su * e1z + sv * e2z,
        dx: ndx,
        dy: ndy,
        dz: ndz,
        r: axis.r + sr,
      };
      const nextCost = sse(flat, next);
      if (nextCost <= cost) {
        const stepNorm = Math.sqrt(step[0]! ** 2 + step[1]! ** 2 + step[2]! ** 2 + step[3]! ** 2 + step[4]! ** 2);
        const drop = cost > 0 ? (cost - nextCost) / cost : 0;
        axis = next;
        cost = nextCost;
        lambda = Math.max(lambda / 10, 1e-12);
        improved = true;
        if (stepNorm < 1e-13 || drop < 1e-15) return { axis, cost, iterations: iterations + 1 };
        break;
      }
      lambda *= 10;
    }
    if (!improved) break;
  }
  return { axis, cost, iterations };
}

/** Fits a cylinder to interleaved x, y, z points (at least 6). */
export function fitCylinder(points: Float64Array, opts: CylinderFitOptions = {}): CylinderFit {
  const flat = flatPoints(points, 3, 'Cylinder fit', 6);
  const n = flat.length / 3;
  let cx = 0;
  let cy = 0;
  let cz = 0;
  for (let p = 0; p < flat.length; p += 3) {
    cx += flat[p]!;
    cy += flat[p + 1]!;
    cz += flat[p + 2]!;
  }
  cx /= n;
  cy /= n;
  cz /= n;
  let xx = 0;
  let yy = 0;
  let zz = 0;
  let xy = 0;
  let xz = 0;
  let yz = 0;
  for (let p = 0; p < flat.length; p += 3) {
    const u = flat[p]! - cx;
    const v = flat[p + 1]! - cy;
    const w = flat[p + 2]! - cz;
    xx += u * u;
    yy += v * v;
    zz += w * w;
    xy += u * v;
    xz += u * w;
    yz += v * w;
  }
  const scale = Math.sqrt((xx + yy + zz) / n);
  if (!(scale > 0)) throw new DomainError('fit.coincident', `Cylinder fit: all ${n} points are at the same place.`, ['points']);

  const starts: [number, number, number][] = [];
  const hint = opts.axisHint;
  if (hint) {
    const l = Math.hypot(hint.x, hint.y, hint.z);
    if (!(l > 0)) throw new DomainError('fit.input', 'Cylinder fit: the axis hint must be a non-zero direction.', ['axisHint']);
    starts.push([hint.x / l, hint.y / l, hint.z / l]);
  } else {
    const { vectors } = symmetricEigen(Float64Array.of(xx, xy, xz, xy, yy, yz, xz, yz, zz), 3);
    for (let c = 0; c < 3; c++) starts.push([vectors[c]!, vectors[3 + c]!, vectors[6 + c]!]);
  }

  let best: { axis: Axis; cost: number; iterations: number } | null = null;
  for (const [dx, dy, dz] of starts) {
    const s = startFrom(flat, cx, cy, cz, dx, dy, dz);
    if (!s) continue;
    const r = refine(flat, s, scale);
    if (!Number.isFinite(r.cost) || !(r.axis.r > 0)) continue;
    if (!best || r.cost < best.cost) best = r;
  }
  if (!best) {
    throw new DomainError('fit.notConverged', `Cylinder fit: no cylinder fits the ${n} points (they may lie on a plane or a line, not around a bore).`, ['points']);
  }
  const a = best.axis;
  // orient the direction: like the hint, else z ≥ 0 (then y, then x)
  let { dx, dy, dz } = a;
  const ref = hint ? hint.x * dx + hint.y * dy + hint.z * dz : Math.abs(dz) > 1e-12 ? dz : Math.abs(dy) > 1e-12 ? dy : dx;
  if (ref < 0) {
    dx = -dx;
    dy = -dy;
    dz = -dz;
  }
  // axis point nearest the centroid; statistics
  const tc = (cx - a.px) * dx + (cy - a.py) * dy + (cz - a.pz) * dz;
  const px = a.px + tc * dx;
  const py = a.py + tc * dy;
  const pz = a.pz + tc * dz;
  const [e1x, e1y, e1z, e2x, e2y, e2z] = across(dx, dy, dz);
  const bins = new Uint8Array(1440);
  let sum = 0;
  let maxDev = 0;
  let minD = Infinity;
  let maxD = -Infinity;
  let minT = Infinity;
  let maxT = -Infinity;
  for (let p = 0; p < flat.length; p += 3) {
    const x = flat[p]! - px;
    const y = flat[p + 1]! - py;
    const z = flat[p + 2]! - pz;
    const t = x * dx + y * dy + z * dz;
    const u = x * e1x + y * e1y + z * e1z;
    const v = x * e2x + y * e2y + z * e2z;
    const d = Math.sqrt(u * u + v * v);
    const e = d - a.r;
    sum += e * e;
    if (Math.abs(e) > maxDev) maxDev = Math.abs(e);
    if (d < minD) minD = d;
    if (d > maxD) maxD = d;
    if (t < minT) minT = t;
    if (t > maxT) maxT = t;
    const angle = Math.atan2(v, u);
    bins[Math.min(1439, Math.floor(((angle + Math.PI) / (2 * Math.PI)) * 1440))] = 1;
  }
  const result: CylinderFit = {
    axisPoint: Object.freeze({ x: px, y: py, z: pz }),
    axisDirection: Object.freeze({ x: dx + 0, y: dy + 0, z: dz + 0 }),
    radius: a.r,
    diameterMm: 2 * a.r,
    rms: Math.sqrt(sum / n),
    maxDeviation: maxDev,
    cylindricity: maxD - minD,
    lengthMm: maxT - minT,
    arcCoverageDeg: coverageFromBins(bins),
    n,
    iterations: best.iterations,
  };
  for (const [key, value] of Object.entries(result)) {
    if (typeof value === 'number' && !Number.isFinite(value)) {
      throw new DomainError('fit.notConverged', `Cylinder fit produced a non-finite ${key}; check the points.`, ['points']);
    }
  }
  return Object.freeze(result);
}

/** 360° minus the longest run of empty bins (circular), from an occupancy histogram. */
export function coverageFromBins(bins: Uint8Array): number {
  const m = bins.length;
  let longest = 0;
  let run = 0;
  let any = false;
  for (let k = 0; k < 2 * m; k++) {
    if (bins[k % m] === 0) {
      run++;
      if (run > longest) longest = Math.min(run, m);
    } else {
      any = true;
      run = 0;
    }
  }
  if (!any) return 0;
  // a single point covers one bin: report the bins' span, not 0
  return 360 * (1 - longest / m);
}
