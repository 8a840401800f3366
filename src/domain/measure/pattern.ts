/**
 * From fitted holes to a bolt pattern as the builder sees it.
 *
 * View: the flattened face is drawn in face coordinates (u right, v up, looking at the face from
 * the side its normal points to). The builder may flip it (seen from the other side: u → −u) and
 * turn it (degrees, counter-clockwise) so it shows the part the way it sits in the car; every
 * angle and position of the pattern is in that view.
 *
 * Concentricity: the bore's cylinder axis meets the face plane at one point; its offset from the
 * bolt circle's centre is what the plate must correct (TIR = 2 × offset).
 */
import { DomainError } from '../errors';
import { fitBoltCircle, type BoltCircleFit } from '../fit/boltCircleFit';
import type { CylinderFit } from '../fit/cylinder';
import type { FaceAxes } from '../fit/plane';
import { cosDeg, sinDeg } from '../geometry/degrees';
import { snapHoleSize, type SnappedSize, type SnapOptions } from './snap';

export interface FaceView {
  /** seen from the other side of the face */
  readonly flip: boolean;
  /** counter-clockwise turn of the view, degrees */
  readonly rotateDeg: number;
}

export const PLAIN_VIEW: FaceView = Object.freeze({ flip: false, rotateDeg: 0 });

/** Face coordinates (u, v) → view coordinates (x, y). */
export function toView(view: FaceView, u: number, v: number): { x: number; y: number } {
  const a = view.flip ? -u : u;
  const c = cosDeg(view.rotateDeg);
  const s = sinDeg(view.rotateDeg);
  return { x: a * c - v * s, y: a * s + v * c };
}

/** View coordinates → face coordinates. */
export function fromView(view: FaceView, x: number, y: number): { u: number; v: number } {
  const c = cosDeg(view.rotateDeg);
  const s = sinDeg(view.rotateDeg);
  const a = x * c + y * s;
  const v = -x * s + y * c;
  return { u: view.flip ? -a : a, v };
}

/** Where a cylinder's axis meets the face plane, in face coordinates, and its tilt from the normal. */
export function axisOnFace(cylinder: Pick<CylinderFit, 'axisPoint' | 'axisDirection'>, axes: FaceAxes): { u: number; v: number; tiltDeg: number } {
  const { origin, u, v, w } = axes;
  const d = cylinder.axisDirection;
  const p = cylinder.axisPoint;
  const dn = d.x * w.x + d.y * w.y + d.z * w.z;
  if (Math.abs(dn) < 1e-6) {
    throw new DomainError('measure.axis', 'The bore axis lies in the face plane; it does not cross the face.', ['cylinder']);
  }
  // p + t·d on the plane: (p − origin + t·d)·w = 0
  const t = -((p.x - origin.x) * w.x + (p.y - origin.y) * w.y + (p.z - origin.z) * w.z) / dn;
  const x = p.x + t * d.x - origin.x;
  const y = p.y + t * d.y - origin.y;
  const z = p.z + t * d.z - origin.z;
  const tiltDeg = (Math.acos(Math.min(1, Math.abs(dn))) * 180) / Math.PI;
  return { u: x * u.x + y * u.y + z * u.z, v: x * v.x + y * v.y + z * v.z, tiltDeg };
}

export interface PatternHoleInput {
  readonly id: string;
  readonly centerU: number;
  readonly centerV: number;
  readonly diameterMm: number;
}

export interface PatternHole {
  readonly id: string;
  /** position in the view */
  readonly x: number;
  readonly y: number;
  readonly angleDeg: number;
  readonly deviationDeg: number;
  readonly radialDeviationMm: number;
  readonly diameterMm: number;
  readonly sizes: SnappedSize[];
}

export interface MeasuredPattern {
  readonly boltCircle: BoltCircleFit;
  readonly holes: PatternHole[];
  /** shaft axis (bore) in the view, when a bore was fitted */
  readonly axis: { readonly x: number; readonly y: number; readonly tiltDeg: number } | null;
  /** bolt circle centre − shaft axis, in the view */
  readonly offset: { readonly dxMm: number; readonly dyMm: number; readonly distanceMm: number; readonly tirMm: number } | null;
}

export interface PatternOptions {
  readonly view?: FaceView;
  /** positions of the regular pattern (≥ holes), default one per hole */
  readonly count?: number;
  /** bore axis on the face, face coordinates */
  readonly axis?: { readonly u: number; readonly v: number; readonly tiltDeg?: number } | null;
  readonly snap?: SnapOptions;
}

/** Bolt circle through the chosen holes, in the view, with each hole's standard size. */
export function measuredPattern(holes: readonly PatternHoleInput[], opts: PatternOptions = {}): MeasuredPattern {
  const view = opts.view ?? PLAIN_VIEW;
  const pts = holes.map((h) => toView(view, h.centerU, h.centerV));
  const bc = fitBoltCircle(pts, { count: opts.count });
  const axis = opts.axis ? { ...toView(view, opts.axis.u, opts.axis.v), tiltDeg: opts.axis.tiltDeg ?? 0 } : null;
  const offset = axis
    ? (() => {
        const dx = bc.centerX - axis.x;
        const dy = bc.centerY - axis.y;
        const distanceMm = Math.hypot(dx, dy);
        return { dxMm: dx, dyMm: dy, distanceMm, tirMm: 2 * distanceMm };
      })()
    : null;
  return {
    boltCircle: bc,
    holes: holes.map((h, i) => ({
      id: h.id,
      x: pts[i]!.x,
      y: pts[i]!.y,
      angleDeg: bc.angles[i]!.angleDeg,
      deviationDeg: bc.angles[i]!.deviationDeg,
      radialDeviationMm: bc.angles[i]!.radialDeviationMm,
      diameterMm: h.diameterMm,
      sizes: snapHoleSize(h.diameterMm, opts.snap),
    })),
    axis,
    offset,
  };
}

/**
 * Which holes belong to the bolt pattern, by default: the largest group of similar size
 * (within 5 %, at least 0.5 mm), so a centre bore and odd dowels stay out.
 */
export function likelyPatternHoles(holes: readonly { readonly id: string; readonly diameterMm: number }[]): string[] {
  let best: string[] = [];
  for (const h of holes) {
    const tol = Math.max(0.5, 0.05 * h.diameterMm);
    const group = holes.filter((o) => Math.abs(o.diameterMm - h.diameterMm) <= tol).map((o) => o.id);
    if (group.length > best.length) best = group;
  }
  return best.length >= 3 ? best : [];
}
