/**
 * Inward offset of a closed counter-clockwise outline (the edge chamfer's inset wire).
 * Lines move along their left normal; arcs keep their centre and change radius
 * (ccw arcs shrink, cw arcs grow). Junctions must be tangent, or sharp line–line corners
 * (these are mitred, which is exactly what a 45° chamfer along both edges produces).
 */
import type { OutlineSegment, Point2 } from '../domain/profileTypes';
import { tangentOnSegment } from '../domain/exports/outlineMath';
import { PlateBuildError } from './errors';

const TANGENT_TOL = 1e-7;

function leftNormal(seg: OutlineSegment, u: number): Point2 {
  const t = tangentOnSegment(seg, u);
  return { x: -t.y, y: t.x };
}

function shift(p: Point2, n: Point2, d: number): Point2 {
  return { x: p.x + n.x * d, y: p.y + n.y * d };
}

function intersectLines(p1: Point2, d1: Point2, p2: Point2, d2: Point2): Point2 | null {
  const den = d1.x * d2.y - d1.y * d2.x;
  if (Math.abs(den) < 1e-12) return null;
  const t = ((p2.x - p1.x) * d2.y - (p2.y - p1.y) * d2.x) / den;
  return { x: p1.x + d1.x * t, y: p1.y + d1.y * t };
}

/** Sharp corners of a chain: index i means the junction between segment i and segment i+1. */
export interface CornerInfo {
  readonly index: number;
  readonly at: Point2;
  readonly tangent: boolean;
  /** turning angle at the junction, radians, positive = left (convex on a ccw outline) */
  readonly turnRad: number;
}

export function chainCorners(chain: readonly OutlineSegment[]): CornerInfo[] {
  const out: CornerInfo[] = [];
  for (let i = 0; i < chain.length; i++) {
    const a = chain[i]!;
    const b = chain[(i + 1) % chain.length]!;
    const ta = tangentOnSegment(a, 1);
    const tb = tangentOnSegment(b, 0);
    const cross = ta.x * tb.y - ta.y * tb.x;
    const dot = ta.x * tb.x + ta.y * tb.y;
    const turnRad = Math.atan2(cross, dot);
    out.push({ index: i, at: a.end, tangent: Math.abs(turnRad) < TANGENT_TOL, turnRad });
  }
  return out;
}

export function offsetOutlineInward(chain: readonly OutlineSegment[], dMm: number): OutlineSegment[] {
  if (dMm === 0) return chain.slice();
  const n = chain.length;
  const corners = chainCorners(chain);
  // start/end of every offset segment before corner resolution
  const starts: Point2[] = [];
  const ends: Point2[] = [];
  for (const s of chain) {
    starts.push(shift(s.start, leftNormal(s, 0), dMm));
    ends.push(shift(s.end, leftNormal(s, 1), dMm));
  }
  for (const c of corners) {
    if (c.tangent) continue;
    const a = chain[c.index]!;
    const j = (c.index + 1) % n;
    const b = chain[j]!;
    if (a.kind !== 'line' || b.kind !== 'line') {
      throw new PlateBuildError(
        'outline-corner',
        `The outline corner at (${c.at.x.toFixed(2)}, ${c.at.y.toFixed(2)}) mm joins an arc without a tangent: the edge chamfer needs tangent arcs or straight-line corners there. Round the corner or set the edge chamfer to 0.`,
      );
    }
    const p = intersectLines(ends[c.index]!, tangentOnSegment(a, 1), starts[j]!, tangentOnSegment(b, 0));
    if (!p) continue;
    ends[c.index] = p;
    starts[j] = p;
  }
  const out: OutlineSegment[] = [];
  for (let i = 0; i < n; i++) {
    const s = chain[i]!;
    const start = starts[i]!;
    const end = ends[i]!;
    if (s.kind === 'line') {
      const dot = (end.x - start.x) * (s.end.x - s.start.x) + (end.y - start.y) * (s.end.y - s.start.y);
      if (dot <= 0) {
        throw new PlateBuildError(
          'chamfer-too-large',
          `The edge chamfer of ${dMm} mm is larger than the straight outline edge from (${s.start.x.toFixed(2)}, ${s.start.y.toFixed(2)}) allows. Reduce the edge chamfer.`,
        );
      }
      out.push({ kind: 'line', start, end });
    } else {
      const r = s.radiusMm + (s.ccw ? -dMm : dMm);
      if (r <= 1e-6) {
        throw new PlateBuildError(
          'chamfer-too-large',
          `The edge chamfer of ${dMm} mm is not smaller than the outline corner radius of ${s.radiusMm} mm at (${s.center.x.toFixed(2)}, ${s.center.y.toFixed(2)}). Reduce the edge chamfer or enlarge the corner radius.`,
        );
      }
      out.push({ kind: 'arc', start, end, center: s.center, radiusMm: r, ccw: s.ccw });
    }
  }
  return out;
}
