/**
 * Small, exact helpers for closed chains of lines and true arcs (plate outlines and pocket
 * outlines). Pure: used by the DXF/SVG writers, the analytic volume and the CAD build alike.
 * Angles in radians inside this module (names end in `Rad`); lengths in millimetres.
 */
import { outlineBBox } from '../outline';
import type { OutlineSegment, Point2 } from '../profileTypes';

const TWO_PI = 2 * Math.PI;

export function angleOfRad(center: Point2, p: Point2): number {
  return Math.atan2(p.y - center.y, p.x - center.x);
}

/**
 * Signed sweep of an arc: positive counter-clockwise, in (0, 2π] for ccw and [−2π, 0) for cw.
 * An arc whose start equals its end is a full circle.
 */
export function arcSweepRad(seg: Extract<OutlineSegment, { kind: 'arc' }>): number {
  const a0 = angleOfRad(seg.center, seg.start);
  const a1 = angleOfRad(seg.center, seg.end);
  let d = a1 - a0;
  if (seg.ccw) {
    while (d <= 1e-12) d += TWO_PI;
    while (d > TWO_PI + 1e-12) d -= TWO_PI;
  } else {
    while (d >= -1e-12) d -= TWO_PI;
    while (d < -TWO_PI - 1e-12) d += TWO_PI;
  }
  return d;
}

/** DXF/LWPOLYLINE bulge of a segment: tan(sweep / 4), positive for ccw arcs, 0 for lines. */
export function segmentBulge(seg: OutlineSegment): number {
  return seg.kind === 'line' ? 0 : Math.tan(arcSweepRad(seg) / 4);
}

export function segmentLengthMm(seg: OutlineSegment): number {
  if (seg.kind === 'line') return Math.hypot(seg.end.x - seg.start.x, seg.end.y - seg.start.y);
  return Math.abs(arcSweepRad(seg)) * seg.radiusMm;
}

/**
 * This segment's share of the signed area of a closed chain: ½∮(x dy − y dx) along it.
 * Exact for lines and for arcs (closed form of the integral on a circle).
 */
export function segmentAreaTerm(seg: OutlineSegment): number {
  if (seg.kind === 'line') return 0.5 * (seg.start.x * seg.end.y - seg.end.x * seg.start.y);
  const { center: c, radiusMm: r } = seg;
  const a0 = angleOfRad(c, seg.start);
  const sweep = arcSweepRad(seg);
  const a1 = a0 + sweep;
  return 0.5 * (r * c.x * (Math.sin(a1) - Math.sin(a0)) - r * c.y * (Math.cos(a1) - Math.cos(a0)) + r * r * sweep);
}

/** Signed area of a closed chain (positive when counter-clockwise). */
export function chainSignedAreaMm2(chain: readonly OutlineSegment[]): number {
  let a = 0;
  for (const s of chain) a += segmentAreaTerm(s);
  return a;
}

export function chainPerimeterMm(chain: readonly OutlineSegment[]): number {
  let p = 0;
  for (const s of chain) p += segmentLengthMm(s);
  return p;
}

/** Largest gap between one segment's end and the next one's start (0 for a closed chain). */
export function chainClosureGapMm(chain: readonly OutlineSegment[]): number {
  let gap = 0;
  for (let i = 0; i < chain.length; i++) {
    const a = chain[i]!.end;
    const b = chain[(i + 1) % chain.length]!.start;
    gap = Math.max(gap, Math.hypot(a.x - b.x, a.y - b.y));
  }
  return gap;
}

/** Point at parameter u ∈ [0, 1] along a segment. */
export function pointOnSegment(seg: OutlineSegment, u: number): Point2 {
  if (seg.kind === 'line') {
    return { x: seg.start.x + (seg.end.x - seg.start.x) * u, y: seg.start.y + (seg.end.y - seg.start.y) * u };
  }
  const a = angleOfRad(seg.center, seg.start) + arcSweepRad(seg) * u;
  return { x: seg.center.x + seg.radiusMm * Math.cos(a), y: seg.center.y + seg.radiusMm * Math.sin(a) };
}

/** Unit tangent (direction of travel) of a segment at u ∈ [0, 1]. */
export function tangentOnSegment(seg: OutlineSegment, u: number): Point2 {
  if (seg.kind === 'line') {
    const dx = seg.end.x - seg.start.x;
    const dy = seg.end.y - seg.start.y;
    const l = Math.hypot(dx, dy);
    return { x: dx / l, y: dy / l };
  }
  const a = angleOfRad(seg.center, seg.start) + arcSweepRad(seg) * u;
  const s = seg.ccw ? 1 : -1;
  return { x: -Math.sin(a) * s, y: Math.cos(a) * s };
}

/** Exact axis-aligned bounds of a chain (arcs contribute their extreme quadrant points). */
export function chainBounds(chain: readonly OutlineSegment[]): { minX: number; minY: number; maxX: number; maxY: number } {
  return outlineBBox(chain);
}

/** Shortest distance from a point to a segment. */
export function distanceToSegmentMm(seg: OutlineSegment, p: Point2): number {
  if (seg.kind === 'line') {
    const dx = seg.end.x - seg.start.x;
    const dy = seg.end.y - seg.start.y;
    const l2 = dx * dx + dy * dy;
    const u = l2 === 0 ? 0 : Math.max(0, Math.min(1, ((p.x - seg.start.x) * dx + (p.y - seg.start.y) * dy) / l2));
    return Math.hypot(p.x - (seg.start.x + u * dx), p.y - (seg.start.y + u * dy));
  }
  const a0 = angleOfRad(seg.center, seg.start);
  const sweep = arcSweepRad(seg);
  const ap = angleOfRad(seg.center, p);
  // is the direction of p inside the arc's angular span?
  let rel = (ap - a0) * Math.sign(sweep);
  rel = ((rel % TWO_PI) + TWO_PI) % TWO_PI;
  if (rel <= Math.abs(sweep)) {
    return Math.abs(Math.hypot(p.x - seg.center.x, p.y - seg.center.y) - seg.radiusMm);
  }
  return Math.min(Math.hypot(p.x - seg.start.x, p.y - seg.start.y), Math.hypot(p.x - seg.end.x, p.y - seg.end.y));
}

const polygonCache = new WeakMap<readonly OutlineSegment[], Float64Array>();

/** A fine polygon through a chain (arcs every ≤ 2.8°), cached per chain array. */
export function chainPolygon(chain: readonly OutlineSegment[]): Float64Array {
  const hit = polygonCache.get(chain);
  if (hit) return hit;
  const pts: number[] = [];
  for (const s of chain) {
    if (s.kind === 'line') {
      pts.push(s.start.x, s.start.y);
      continue;
    }
    const sweep = arcSweepRad(s);
    const a0 = angleOfRad(s.center, s.start);
    const n = Math.max(8, Math.ceil(Math.abs(sweep) / (Math.PI / 64)));
    for (let i = 0; i < n; i++) {
      const a = a0 + (sweep * i) / n;
      pts.push(s.center.x + s.radiusMm * Math.cos(a), s.center.y + s.radiusMm * Math.sin(a));
    }
  }
  const poly = Float64Array.from(pts);
  polygonCache.set(chain, poly);
  return poly;
}

/**
 * Point-in-closed-chain test (even–odd rule on the fine polygon). Exact away from the boundary;
 * callers that care about points near the boundary also check the distance to it.
 */
export function pointInChain(chain: readonly OutlineSegment[], p: Point2): boolean {
  const poly = chainPolygon(chain);
  const n = poly.length / 2;
  let inside = false;
  for (let i = 0, j = n - 1; i < n; j = i++) {
    const ax = poly[2 * i]!;
    const ay = poly[2 * i + 1]!;
    const bx = poly[2 * j]!;
    const by = poly[2 * j + 1]!;
    if (ay > p.y !== by > p.y && p.x < ((bx - ax) * (p.y - ay)) / (by - ay) + ax) inside = !inside;
  }
  return inside;
}
