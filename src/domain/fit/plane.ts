/**
 * Least-squares plane through measured points (a flange face from a probe or a scan).
 *
 * The plane passes through the centroid; its normal is the eigenvector of the smallest
 * eigenvalue of the 3×3 scatter matrix of the centred points (the least-squares plane by
 * orthogonal distance). The normal is oriented so that z > 0; a normal lying in the XY plane is
 * oriented so that y > 0, and one along X so that x > 0.
 *
 * flatness = max − min signed distance from the plane (the minimum-zone value is ≤ this).
 */
import { DomainError } from '../errors';
import { flatPoints, type Points3 } from './points';
import { symmetricEigen } from './smallMatrix';

export interface Vector3 {
  readonly x: number;
  readonly y: number;
  readonly z: number;
}

export interface PlaneFit {
  /** unit normal */
  readonly normal: Vector3;
  readonly centroid: Vector3;
  /** max − min signed distance from the plane */
  readonly flatness: number;
  /** RMS distance from the plane */
  readonly rms: number;
  readonly n: number;
}

/** Eigenvalue ratios below this mean the points do not span a plane. */
const DEGENERATE_RATIO = 1e-14;
/** A normal component this small counts as zero when orienting the normal. */
const ORIENT_TOLERANCE = 1e-12;

function orient(x: number, y: number, z: number): Vector3 {
  const len = Math.sqrt(x * x + y * y + z * z);
  let nx = x / len;
  let ny = y / len;
  let nz = z / len;
  const flip = Math.abs(nz) > ORIENT_TOLERANCE ? nz < 0 : Math.abs(ny) > ORIENT_TOLERANCE ? ny < 0 : nx < 0;
  if (flip) {
    nx = -nx;
    ny = -ny;
    nz = -nz;
  }
  return Object.freeze({ x: nx + 0, y: ny + 0, z: nz + 0 });
}

/** Fits a plane to points ({x, y, z} objects or an interleaved x, y, z Float64Array). */
export function fitPlane(points3d: Points3): PlaneFit {
  const flat = flatPoints(points3d, 3, 'Plane fit');
  const n = flat.length / 3;
  let sx = 0;
  let sy = 0;
  let sz = 0;
  for (let i = 0; i < flat.length; i += 3) {
    sx += flat[i]!;
    sy += flat[i + 1]!;
    sz += flat[i + 2]!;
  }
  const mx = sx / n;
  const my = sy / n;
  const mz = sz / n;
  let xx = 0;
  let yy = 0;
  let zz = 0;
  let xy = 0;
  let xz = 0;
  let yz = 0;
  for (let i = 0; i < flat.length; i += 3) {
    const u = flat[i]! - mx;
    const v = flat[i + 1]! - my;
    const w = flat[i + 2]! - mz;
    xx += u * u;
    yy += v * v;
    zz += w * w;
    xy += u * v;
    xz += u * w;
    yz += v * w;
  }
  const magnitude = Math.max(1, Math.abs(mx), Math.abs(my), Math.abs(mz));
  const trace = xx + yy + zz;
  if (!(Math.sqrt(trace / n) > 1e-12 * magnitude)) {
    throw new DomainError(
      'fit.coincident',
      `Plane fit: all ${n} points are at the same place; a plane needs points spread over the face.`,
      ['points'],
    );
  }
  const { values, vectors } = symmetricEigen(Float64Array.of(xx, xy, xz, xy, yy, yz, xz, yz, zz), 3);
  if (values[1]! <= DEGENERATE_RATIO * values[2]!) {
    throw new DomainError(
      'fit.collinear',
      `Plane fit: the ${n} points lie on a straight line; a plane needs points that are not collinear.`,
      ['points'],
    );
  }
  const normal = orient(vectors[0]!, vectors[3]!, vectors[6]!);
  let minD = Infinity;
  let maxD = -Infinity;
  let sum = 0;
  for (let i = 0; i < flat.length; i += 3) {
    const d = (flat[i]! - mx) * normal.x + (flat[i + 1]! - my) * normal.y + (flat[i + 2]! - mz) * normal.z;
    sum += d * d;
    if (d < minD) minD = d;
    if (d > maxD) maxD = d;
  }
  return Object.freeze({
    normal,
    centroid: Object.freeze({ x: mx, y: my, z: mz }),
    flatness: maxD - minD,
    rms: Math.sqrt(sum / n),
    n,
  });
}

export interface FaceAxes {
  readonly origin: Vector3;
  /** in-plane axis: global X projected onto the plane (global Y when the normal is along X) */
  readonly u: Vector3;
  /** in-plane axis: normal × u */
  readonly v: Vector3;
  /** the plane normal */
  readonly w: Vector3;
}

/** Right-handed face frame at the centroid: u ≈ global X, v ≈ global Y for a face seen along Z. */
export function faceAxes(plane: Pick<PlaneFit, 'normal' | 'centroid'>): FaceAxes {
  const nrm = plane.normal;
  const len = Math.sqrt(nrm.x ** 2 + nrm.y ** 2 + nrm.z ** 2);
  if (!(Math.abs(len - 1) < 1e-9)) {
    throw new DomainError('fit.input', `Face coordinates need a unit plane normal; its length is ${len}.`, ['plane', 'normal']);
  }
  // project global X; if the normal is (nearly) along X, project global Y instead
  let ux = 1 - nrm.x * nrm.x;
  let uy = -nrm.x * nrm.y;
  let uz = -nrm.x * nrm.z;
  if (Math.sqrt(ux * ux + uy * uy + uz * uz) < 1e-6) {
    ux = -nrm.y * nrm.x;
    uy = 1 - nrm.y * nrm.y;
    uz = -nrm.y * nrm.z;
  }
  const ul = Math.sqrt(ux * ux + uy * uy + uz * uz);
  ux /= ul;
  uy /= ul;
  uz /= ul;
  const vx = nrm.y * uz - nrm.z * uy;
  const vy = nrm.z * ux - nrm.x * uz;
  const vz = nrm.x * uy - nrm.y * ux;
  return Object.freeze({
    origin: plane.centroid,
    u: Object.freeze({ x: ux, y: uy, z: uz }),
    v: Object.freeze({ x: vx, y: vy, z: vz }),
    w: nrm,
  });
}

/**
 * Points in face coordinates (interleaved u, v, w): u, v in the plane from `faceAxes`, w the
 * signed distance from the plane along its normal. Feed u, v to the circle fit.
 */
export function toFaceCoordinates(points: Points3, plane: Pick<PlaneFit, 'normal' | 'centroid'>): Float64Array {
  const flat = flatPoints(points, 3, 'Face coordinates', 0);
  const { origin, u, v, w } = faceAxes(plane);
  const out = new Float64Array(flat.length);
  for (let i = 0; i < flat.length; i += 3) {
    const dx = flat[i]! - origin.x;
    const dy = flat[i + 1]! - origin.y;
    const dz = flat[i + 2]! - origin.z;
    out[i] = dx * u.x + dy * u.y + dz * u.z;
    out[i + 1] = dx * v.x + dy * v.y + dz * v.z;
    out[i + 2] = dx * w.x + dy * w.y + dz * w.z;
  }
  return out;
}
