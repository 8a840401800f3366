/**
 * One measurement, loaded: its points in mm and the fits asked of it. The browser worker and the
 * server run this same code on the same points, so their answers agree.
 *
 * The dominant face plane is fitted once (robust, deterministic) and everything else is in its
 * face coordinates: u, v along the face (u = global X projected onto it), w the distance from
 * it. The face frame is returned with every answer so a client can map results back to space:
 * p = origin + u·U + v·V + w·W.
 */
import { DomainError } from '../errors';
import { fitCylinder, type CylinderFit } from '../fit/cylinder';
import { faceAxes, type FaceAxes } from '../fit/plane';
import { fitPlaneRansac, type RobustPlaneFit } from '../fit/ransacPlane';
import type { FitRequest } from './fitRequest';
import { findHoles, fitHoleFromIndices, fitHoleInRegion, type FittedHole } from './holes';
import type { HoleLimits } from './holeQuality';
import { axisOnFace, likelyPatternHoles } from './pattern';
import { pointsInRegion, type Region } from './region';
import { snapHoleSize, type SnappedSize } from './snap';

export interface HoleResult {
  readonly id: string;
  readonly centerU: number;
  readonly centerV: number;
  readonly diameterMm: number;
  readonly rmsMm: number;
  readonly maxDeviationMm: number;
  readonly roundnessMm: number;
  readonly n: number;
  readonly arcCoverageDeg: number;
  readonly ovalityMm: number;
  readonly ovalityAxisDeg: number;
  readonly dentMm: number;
  readonly dentAtDeg: number;
  readonly noiseMm: number;
  readonly flags: string[];
  readonly polar: FittedHole['quality']['polar'];
  readonly sizes: SnappedSize[];
}

export interface PlaneResult {
  readonly normal: { x: number; y: number; z: number };
  readonly centroid: { x: number; y: number; z: number };
  readonly flatnessMm: number;
  readonly rmsMm: number;
  readonly n: number;
  readonly total: number;
  readonly outliers: number;
  readonly thresholdMm: number;
  readonly sigmaMm: number;
}

export type FitResponse =
  | { kind: 'plane'; face: FaceAxes; plane: PlaneResult }
  | { kind: 'holes'; face: FaceAxes; plane: PlaneResult; holes: HoleResult[]; rejected: { centerU: number; centerV: number; sizeMm: number; reason: string }[]; cellMm: number; spacingMm: number; suggestedPattern: string[] }
  | { kind: 'circle'; face: FaceAxes; hole: HoleResult }
  | { kind: 'cylinder'; face: FaceAxes; cylinder: CylinderFit; trimmed: number; axisOnFace: { u: number; v: number; tiltDeg: number } };

interface Face {
  fit: RobustPlaneFit;
  axes: FaceAxes;
  /** u, v of the face's points (inliers), interleaved */
  uv: Float64Array;
  /** index in `points` of each face point */
  index: Int32Array;
  thresholdMm?: number;
}

export function holeResult(h: FittedHole): HoleResult {
  return {
    id: h.id,
    centerU: h.centerU,
    centerV: h.centerV,
    diameterMm: h.diameterMm,
    rmsMm: h.rmsMm,
    maxDeviationMm: h.maxDeviationMm,
    roundnessMm: h.roundnessMm,
    n: h.n,
    arcCoverageDeg: h.quality.arcCoverageDeg,
    ovalityMm: h.quality.ovalityMm,
    ovalityAxisDeg: h.quality.ovalityAxisDeg,
    dentMm: h.quality.dentMm,
    dentAtDeg: h.quality.dentAtDeg,
    noiseMm: h.quality.noiseMm,
    flags: [...h.quality.flags],
    polar: h.quality.polar,
    // a standard size only where one is near: a bore is no bolt hole
    sizes: snapHoleSize(h.diameterMm).filter((z) => Math.abs(z.differenceMm) <= Math.max(1, 0.1 * h.diameterMm)),
  };
}

function planeResult(p: RobustPlaneFit): PlaneResult {
  return {
    normal: p.normal,
    centroid: p.centroid,
    flatnessMm: p.flatness,
    rmsMm: p.rms,
    n: p.n,
    total: p.total,
    outliers: p.outliers,
    thresholdMm: p.thresholdMm,
    sigmaMm: p.sigmaMm,
  };
}

export class MeasureSession {
  private face: Face | null = null;

  /**
   * @param points interleaved x, y, z in mm (not copied)
   * @param labels label per point (0 = none, k = names[k − 1]) of a labelled file
   */
  constructor(
    readonly points: Float64Array,
    readonly labels: { readonly names: readonly string[]; readonly index: Uint16Array | null } = { names: [], index: null },
  ) {}

  get count(): number {
    return this.points.length / 3;
  }

  /** The dominant face (fitted on first use, or again with another threshold). */
  faceFit(thresholdMm?: number): Face {
    if (this.face && this.face.thresholdMm === thresholdMm) return this.face;
    const fit = fitPlaneRansac(this.points, { thresholdMm });
    const axes = faceAxes(fit);
    const n = this.count;
    const uv = new Float64Array(2 * fit.n);
    const index = new Int32Array(fit.n);
    const p = this.points;
    const { origin: o, u, v } = axes;
    for (let i = 0, k = 0; i < n; i++) {
      if (fit.inliers[i] === 0) continue;
      const dx = p[3 * i]! - o.x;
      const dy = p[3 * i + 1]! - o.y;
      const dz = p[3 * i + 2]! - o.z;
      uv[2 * k] = dx * u.x + dy * u.y + dz * u.z;
      uv[2 * k + 1] = dx * v.x + dy * v.y + dz * v.z;
      index[k++] = i;
    }
    this.face = { fit, axes, uv, index, thresholdMm };
    return this.face;
  }

  /** u, v of arbitrary points (by index), interleaved. */
  private project(indices: Int32Array): Float64Array {
    const { axes } = this.faceFit();
    const { origin: o, u, v } = axes;
    const p = this.points;
    const out = new Float64Array(indices.length * 2);
    for (let k = 0; k < indices.length; k++) {
      const i = indices[k]!;
      const dx = p[3 * i]! - o.x;
      const dy = p[3 * i + 1]! - o.y;
      const dz = p[3 * i + 2]! - o.z;
      out[2 * k] = dx * u.x + dy * u.y + dz * u.z;
      out[2 * k + 1] = dx * v.x + dy * v.y + dz * v.z;
    }
    return out;
  }

  private labelIndices(label: string): Int32Array {
    const k = this.labels.names.indexOf(label);
    if (k < 0 || !this.labels.index) {
      const known = this.labels.names.length ? this.labels.names.join(', ') : 'none — the file has no label column';
      throw new DomainError('measure.label', `No points are labelled "${label}" (labels: ${known}).`, ['label']);
    }
    const id = k + 1;
    const idx = this.labels.index;
    let count = 0;
    for (let i = 0; i < idx.length; i++) if (idx[i] === id) count++;
    const out = new Int32Array(count);
    for (let i = 0, j = 0; i < idx.length; i++) if (idx[i] === id) out[j++] = i;
    return out;
  }

  run(request: FitRequest): FitResponse {
    switch (request.kind) {
      case 'plane': {
        const f = this.faceFit(request.thresholdMm);
        return { kind: 'plane', face: f.axes, plane: planeResult(f.fit) };
      }
      case 'holes': {
        const f = this.faceFit();
        const found = findHoles(f.uv, { minDiameterMm: request.minDiameterMm, maxDiameterMm: request.maxDiameterMm, limits: request.limits as Partial<HoleLimits> });
        const holes = found.holes.map(holeResult);
        return {
          kind: 'holes',
          face: f.axes,
          plane: planeResult(f.fit),
          holes,
          rejected: found.rejected,
          cellMm: found.cellMm,
          spacingMm: found.spacingMm,
          suggestedPattern: likelyPatternHoles(holes),
        };
      }
      case 'circle': {
        const f = this.faceFit();
        const limits = request.limits as Partial<HoleLimits> | undefined;
        if (request.label !== undefined) {
          const idx = this.labelIndices(request.label);
          const uv = this.project(idx);
          const all = Int32Array.from({ length: idx.length }, (_, k) => k);
          const hole = fitHoleFromIndices(uv, all, { rim: request.rim ?? 'all', limits, id: request.label });
          return { kind: 'circle', face: f.axes, hole: holeResult(hole) };
        }
        const hole = fitHoleInRegion(f.uv, request.region as Region, { rim: request.rim ?? 'edge', limits, id: 'H' });
        return { kind: 'circle', face: f.axes, hole: holeResult(hole) };
      }
      case 'cylinder': {
        const f = this.faceFit();
        const xyz = this.cylinderPoints(request);
        const { cylinder, trimmed } = robustCylinder(xyz, f.axes.w);
        return { kind: 'cylinder', face: f.axes, cylinder, trimmed, axisOnFace: axisOnFace(cylinder, f.axes) };
      }
    }
  }

  /** Points of a bore: in the selection (by their place on the face), off the face unless asked. */
  private cylinderPoints(request: Extract<FitRequest, { kind: 'cylinder' }>): Float64Array {
    const f = this.faceFit();
    let candidates: Int32Array;
    if (request.label !== undefined) candidates = this.labelIndices(request.label);
    else {
      const all = this.project(Int32Array.from({ length: this.count }, (_, i) => i));
      candidates = pointsInRegion(all, request.region as Region);
    }
    const { origin: o, w } = f.axes;
    const p = this.points;
    const keep: number[] = [];
    const wMin = request.wMinMm ?? -Infinity;
    const wMax = request.wMaxMm ?? Infinity;
    for (let k = 0; k < candidates.length; k++) {
      const i = candidates[k]!;
      if (!request.includeFace && request.label === undefined && f.fit.inliers[i] === 1) continue;
      const d = (p[3 * i]! - o.x) * w.x + (p[3 * i + 1]! - o.y) * w.y + (p[3 * i + 2]! - o.z) * w.z;
      if (d < wMin || d > wMax) continue;
      keep.push(i);
    }
    if (keep.length < 6) {
      throw new DomainError(
        'measure.cylinder.tooFewPoints',
        `The selection holds ${keep.length} point${keep.length === 1 ? '' : 's'} off the face; a bore needs points on its wall (at least 6). Select around the bore, or include the face points.`,
        ['region'],
      );
    }
    const xyz = new Float64Array(keep.length * 3);
    keep.forEach((i, k) => {
      xyz[3 * k] = p[3 * i]!;
      xyz[3 * k + 1] = p[3 * i + 1]!;
      xyz[3 * k + 2] = p[3 * i + 2]!;
    });
    return xyz;
  }
}

/**
 * Least-squares cylinder, then points farther than 3 robust σ (1.4826 · median |eᵢ|) from it are
 * set aside and the cylinder refitted, until none are: stray points in a selection around a bore
 * (a fixture, a face point) must not tilt its axis.
 */
export function robustCylinder(xyz: Float64Array, axisHint: { x: number; y: number; z: number }): { cylinder: CylinderFit; trimmed: number } {
  let pts = xyz;
  let cylinder = fitCylinder(pts, { axisHint });
  for (let round = 0; round < 6; round++) {
    const n = pts.length / 3;
    const { axisPoint: a, axisDirection: d, radius } = cylinder;
    const err = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const x = pts[3 * i]! - a.x;
      const y = pts[3 * i + 1]! - a.y;
      const z = pts[3 * i + 2]! - a.z;
      const t = x * d.x + y * d.y + z * d.z;
      err[i] = Math.abs(Math.hypot(x - t * d.x, y - t * d.y, z - t * d.z) - radius);
    }
    const sorted = Float64Array.from(err).sort();
    const limit = Math.max(3 * 1.4826 * sorted[n >> 1]!, 1e-9 * radius);
    let keep = 0;
    for (let i = 0; i < n; i++) if (err[i]! <= limit) keep++;
    if (keep === n || keep < 6) break;
    const next = new Float64Array(keep * 3);
    for (let i = 0, k = 0; i < n; i++) {
      if (err[i]! > limit) continue;
      next[3 * k] = pts[3 * i]!;
      next[3 * k + 1] = pts[3 * i + 1]!;
      next[3 * k + 2] = pts[3 * i + 2]!;
      k++;
    }
    pts = next;
    cylinder = fitCylinder(pts, { axisHint });
  }
  return { cylinder, trimmed: xyz.length / 3 - cylinder.n };
}

/** Scales points from file units to mm in place. */
export function scaleToMm(points: Float64Array, mmPerUnit: number): Float64Array {
  if (mmPerUnit !== 1) for (let i = 0; i < points.length; i++) points[i] = points[i]! * mmPerUnit;
  return points;
}
