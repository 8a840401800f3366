/**
 * Closed plate and pocket outlines made of lines and true arcs (plate coordinates, see
 * `profileTypes.ts`): the automatic outline (exact convex hull of discs), the filleted polygon
 * outline, and exact measures of any such chain — area, perimeter, bounding box, point
 * containment and distance.
 *
 * Lengths in millimetres. Angles are radians inside this module (names end in `Rad`) and degrees
 * at its surface (names end in `Deg`). Every chain produced here is closed (each segment's end is
 * the very same point as the next segment's start) and counter-clockwise.
 */
import { DomainError } from './errors';
import type { BoundingBox, OutlineSegment, Point2 } from './profileTypes';

type ArcSegment = Extract<OutlineSegment, { kind: 'arc' }>;

const TWO_PI = 2 * Math.PI;

/** Lengths closer than this are the same (mm). */
export const OUTLINE_LENGTH_TOLERANCE_MM = 1e-9;

/** Angles closer than this are the same (rad); also the smallest arc kept in a chain. */
const ANGLE_TOLERANCE_RAD = 1e-12;

/**
 * A disc sticking out of a larger one by no more than this is merged into it (mm): a nanometre
 * bump would only give the CAD kernel a sliver edge.
 */
export const DISC_MERGE_TOLERANCE_MM = 1e-6;

/** A turn this small either way counts as going straight on (rad). */
const STRAIGHT_AHEAD_RAD = 1e-9;

/** A circle that an outline must enclose: a feature grown by its margin. */
export interface Disc {
  readonly center: Point2;
  readonly radiusMm: number;
}

const point = (x: number, y: number): Point2 => Object.freeze({ x, y });

function line(start: Point2, end: Point2): OutlineSegment {
  return Object.freeze({ kind: 'line' as const, start, end });
}

function arc(start: Point2, end: Point2, center: Point2, radiusMm: number, ccw: boolean): OutlineSegment {
  return Object.freeze({ kind: 'arc' as const, start, end, center, radiusMm, ccw });
}

/** Angle in [0, 2π). */
function normaliseRad(a: number): number {
  const r = a % TWO_PI;
  return r < 0 ? r + TWO_PI : r;
}

function angleAtRad(center: Point2, p: Point2): number {
  return Math.atan2(p.y - center.y, p.x - center.x);
}

/**
 * The chain as segments this module measures: a chain of one arc whose start equals its end
 * (how the exports and the kernel may hold a full circle) becomes two half arcs in the same
 * direction; every other chain is returned as it is.
 */
function chainSegments(segments: readonly OutlineSegment[]): readonly OutlineSegment[] {
  if (segments.length !== 1) return segments;
  const s = segments[0]!;
  if (s.kind !== 'arc' || !(s.radiusMm > OUTLINE_LENGTH_TOLERANCE_MM)) return segments;
  if (Math.hypot(s.end.x - s.start.x, s.end.y - s.start.y) > OUTLINE_LENGTH_TOLERANCE_MM) return segments;
  const c = s.center;
  const opposite = point(2 * c.x - s.start.x, 2 * c.y - s.start.y);
  return [arc(s.start, opposite, c, s.radiusMm, s.ccw), arc(opposite, s.start, c, s.radiusMm, s.ccw)];
}

/**
 * Signed sweep of an arc in radians: in (0, 2π) for counter-clockwise arcs, in (−2π, 0) for
 * clockwise ones. Inside a chain a start equal to its end means a vanishing arc; a chain of ONE
 * such arc is a full circle (see `chainSegments`).
 */
export function arcSweepRad(seg: ArcSegment): number {
  const d = normaliseRad(angleAtRad(seg.center, seg.end) - angleAtRad(seg.center, seg.start));
  if (seg.ccw) return d;
  return d === 0 ? 0 : d - TWO_PI;
}

/** Signed sweep of an arc in degrees (positive counter-clockwise). */
export function arcSweepDeg(seg: ArcSegment): number {
  return (arcSweepRad(seg) * 180) / Math.PI;
}

/** Length of one segment (mm); arcs by radius × sweep. */
export function segmentLengthMm(seg: OutlineSegment): number {
  if (seg.kind === 'line') return Math.hypot(seg.end.x - seg.start.x, seg.end.y - seg.start.y);
  return Math.abs(arcSweepRad(seg)) * seg.radiusMm;
}

/** Perimeter of a chain (mm), exact for arcs. */
export function outlinePerimeterMm(segments: readonly OutlineSegment[]): number {
  let p = 0;
  for (const s of chainSegments(segments)) p += segmentLengthMm(s);
  return p;
}

/**
 * This segment's share of ½∮(x dy − y dx). Lines: the shoelace term. Arcs: the closed form
 * ½[cx·(By − Ay) − cy·(Bx − Ax) + r²·Δ] (integral of the circle's parametric form).
 */
function segmentAreaTermMm2(seg: OutlineSegment): number {
  const { start: a, end: b } = seg;
  if (seg.kind === 'line') return 0.5 * (a.x * b.y - b.x * a.y);
  const c = seg.center;
  const r = seg.radiusMm;
  return 0.5 * (c.x * (b.y - a.y) - c.y * (b.x - a.x) + r * r * arcSweepRad(seg));
}

/** Signed area of a closed chain (mm², positive when counter-clockwise). */
export function outlineSignedAreaMm2(segments: readonly OutlineSegment[]): number {
  let a = 0;
  for (const s of chainSegments(segments)) a += segmentAreaTermMm2(s);
  return a;
}

/** Area enclosed by a closed chain (mm²): shoelace terms plus exact circular-segment terms. */
export function outlineArea(segments: readonly OutlineSegment[]): number {
  return Math.abs(outlineSignedAreaMm2(segments));
}

/** Exact bounding box: end points and every arc's extreme (quadrant) points inside its sweep. */
export function outlineBBox(segments: readonly OutlineSegment[]): BoundingBox {
  if (segments.length === 0) {
    throw new DomainError('outline.empty', 'The outline has no segments, so it has no bounding box.');
  }
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  const add = (p: Point2) => {
    minX = Math.min(minX, p.x);
    minY = Math.min(minY, p.y);
    maxX = Math.max(maxX, p.x);
    maxY = Math.max(maxY, p.y);
  };
  for (const s of chainSegments(segments)) {
    add(s.start);
    add(s.end);
    if (s.kind === 'arc') {
      const a0 = angleAtRad(s.center, s.start);
      const sweep = arcSweepRad(s);
      for (let k = 0; k < 4; k++) {
        const q = (k * Math.PI) / 2;
        // angular distance from the start to the quadrant point, in the arc's direction
        const along = s.ccw ? normaliseRad(q - a0) : normaliseRad(a0 - q);
        if (along <= Math.abs(sweep)) {
          add(point(s.center.x + s.radiusMm * Math.cos(q), s.center.y + s.radiusMm * Math.sin(q)));
        }
      }
    }
  }
  return Object.freeze({ minX, minY, maxX, maxY });
}

/** Is the direction of `p` seen from the arc's centre inside the arc's sweep? */
function withinSweep(seg: ArcSegment, p: Point2): boolean {
  const a0 = angleAtRad(seg.center, seg.start);
  const ap = angleAtRad(seg.center, p);
  const along = seg.ccw ? normaliseRad(ap - a0) : normaliseRad(a0 - ap);
  return along <= Math.abs(arcSweepRad(seg)) + ANGLE_TOLERANCE_RAD;
}

/** Closest point of one segment to `p`. */
export function closestPointOnSegment(seg: OutlineSegment, p: Point2): Point2 {
  if (seg.kind === 'line') {
    const dx = seg.end.x - seg.start.x;
    const dy = seg.end.y - seg.start.y;
    const l2 = dx * dx + dy * dy;
    const u = l2 === 0 ? 0 : Math.max(0, Math.min(1, ((p.x - seg.start.x) * dx + (p.y - seg.start.y) * dy) / l2));
    return point(seg.start.x + u * dx, seg.start.y + u * dy);
  }
  const dc = Math.hypot(p.x - seg.center.x, p.y - seg.center.y);
  if (dc > OUTLINE_LENGTH_TOLERANCE_MM && withinSweep(seg, p)) {
    const k = seg.radiusMm / dc;
    return point(seg.center.x + (p.x - seg.center.x) * k, seg.center.y + (p.y - seg.center.y) * k);
  }
  if (dc <= OUTLINE_LENGTH_TOLERANCE_MM) return seg.start; // every arc point is equally far
  const ds = Math.hypot(p.x - seg.start.x, p.y - seg.start.y);
  const de = Math.hypot(p.x - seg.end.x, p.y - seg.end.y);
  return ds <= de ? seg.start : seg.end;
}

/** The outline point nearest to `p`, its distance and the segment it lies on. */
export function closestPointOnOutline(
  segments: readonly OutlineSegment[],
  p: Point2,
): { readonly point: Point2; readonly distanceMm: number; readonly segmentIndex: number } {
  if (segments.length === 0) {
    throw new DomainError('outline.empty', 'The outline has no segments, so no point lies on it.');
  }
  let best = { point: segments[0]!.start, distanceMm: Infinity, segmentIndex: 0 };
  // a one-arc full circle is measured as its two halves; both are segment 0 of the caller's chain
  chainSegments(segments).forEach((s, i) => {
    const q = closestPointOnSegment(s, p);
    const d = Math.hypot(q.x - p.x, q.y - p.y);
    if (d < best.distanceMm) best = { point: q, distanceMm: d, segmentIndex: Math.min(i, segments.length - 1) };
  });
  return Object.freeze(best);
}

/** Shortest distance from `p` to the outline's boundary (mm, ≥ 0, inside or outside). */
export function distanceToOutline(segments: readonly OutlineSegment[], p: Point2): number {
  return closestPointOnOutline(segments, p).distanceMm;
}

/**
 * Winding number of the chain around `p`, exact for arcs: each segment adds the angle its chord
 * subtends at `p`, and an arc adds one more full turn (±) when `p` lies in the circular segment
 * between the arc and its chord (arc followed by the reversed chord is a loop around exactly
 * those points).
 */
export function windingNumber(segments: readonly OutlineSegment[], p: Point2): number {
  let total = 0;
  for (const s of chainSegments(segments)) {
    const ax = s.start.x - p.x;
    const ay = s.start.y - p.y;
    const bx = s.end.x - p.x;
    const by = s.end.y - p.y;
    // side > 0: p left of the chord start → end; the same number decides the chord's angle
    const side = ax * by - ay * bx;
    const dot = ax * bx + ay * by;
    if (s.kind === 'arc' && side === 0 && dot < 0) {
      // p on the chord itself (e.g. the centre of a half circle): the arc sweeps half a turn round it
      total += s.ccw ? Math.PI : -Math.PI;
      continue;
    }
    total += Math.atan2(side, dot);
    if (s.kind === 'arc') {
      const inDisc = Math.hypot(p.x - s.center.x, p.y - s.center.y) < s.radiusMm;
      // a ccw arc bulges to the right of its chord, a cw arc to the left
      if (inDisc && (s.ccw ? side < 0 : side > 0)) total += s.ccw ? TWO_PI : -TWO_PI;
    }
  }
  return Math.round(total / TWO_PI);
}

/** Is `p` inside the closed chain? (Points on the boundary may go either way; use distances.) */
export function pointInOutline(segments: readonly OutlineSegment[], p: Point2): boolean {
  return windingNumber(segments, p) !== 0;
}

/**
 * Signed distance of `p` from the boundary: negative inside, positive outside (mm).
 */
export function signedDistanceToOutline(segments: readonly OutlineSegment[], p: Point2): number {
  const d = distanceToOutline(segments, p);
  return pointInOutline(segments, p) ? -d : d;
}

/** A full circle as two counter-clockwise half arcs (a closed chain). */
export function circleOutline(center: Point2, radiusMm: number): OutlineSegment[] {
  if (!(radiusMm > 0) || !Number.isFinite(radiusMm)) {
    throw new DomainError('outline.radius', `A circle outline needs a positive radius, got ${String(radiusMm)} mm.`);
  }
  const c = point(center.x, center.y);
  const right = point(c.x + radiusMm, c.y);
  const left = point(c.x - radiusMm, c.y);
  return [arc(right, left, c, radiusMm, true), arc(left, right, c, radiusMm, true)];
}

// ---------------------------------------------------------------------------------------------
// Convex hull of discs
// ---------------------------------------------------------------------------------------------

/**
 * Discs left after dropping every disc that lies inside another one. A disc that sticks out of a
 * larger one by no more than DISC_MERGE_TOLERANCE_MM is merged into it: the larger disc grows by
 * that bit so it still encloses both — no sliver edge, and nothing pokes out.
 */
function outermostDiscs(discs: readonly Disc[]): Disc[] {
  const order = discs.map((d, i) => ({ d, i })).sort((a, b) => b.d.radiusMm - a.d.radiusMm || a.i - b.i);
  const kept: { center: Point2; radiusMm: number }[] = [];
  for (const { d } of order) {
    const host = kept.find((o) => Math.hypot(d.center.x - o.center.x, d.center.y - o.center.y) + d.radiusMm - o.radiusMm <= DISC_MERGE_TOLERANCE_MM);
    if (host) {
      host.radiusMm = Math.max(host.radiusMm, Math.hypot(d.center.x - host.center.x, d.center.y - host.center.y) + d.radiusMm);
    } else {
      kept.push({ center: d.center, radiusMm: d.radiusMm });
    }
  }
  return kept;
}

/**
 * Direction (rad) of the outer tangent from disc `a` to disc `b` that keeps both discs on its
 * left: ψ = θ − asin((rb − ra)/d), θ the direction from a's centre to b's.
 */
function tangentDirectionRad(a: Disc, b: Disc): number {
  const dx = b.center.x - a.center.x;
  const dy = b.center.y - a.center.y;
  const d = Math.hypot(dx, dy);
  const s = Math.max(-1, Math.min(1, (b.radiusMm - a.radiusMm) / d));
  return Math.atan2(dy, dx) - Math.asin(s);
}

/** Tangent point on a disc for a supporting line of direction ψ with the disc on its left. */
function tangentPoint(d: Disc, psiRad: number): Point2 {
  // the left normal is (−sin ψ, cos ψ); the touching point is one radius against it
  return point(d.center.x + d.radiusMm * Math.sin(psiRad), d.center.y - d.radiusMm * Math.cos(psiRad));
}

/**
 * The exact convex hull of a set of discs as a closed counter-clockwise chain: straight outer
 * tangents between discs and true arcs where the hull wraps a disc. Discs inside the hull of the
 * others do not appear. Gift wrapping: from the lowest point, the supporting line rolls around
 * the current disc until it touches another disc (the one needing the least turn; on a tie, the
 * farthest along the line).
 */
export function hullOfDiscs(discs: readonly Disc[]): OutlineSegment[] {
  if (discs.length === 0) {
    throw new DomainError('outline.noFeatures', 'An automatic outline needs at least one feature to wrap.');
  }
  discs.forEach((d, i) => {
    if (!Number.isFinite(d.center.x) || !Number.isFinite(d.center.y) || !Number.isFinite(d.radiusMm) || d.radiusMm < 0) {
      throw new DomainError(
        'outline.disc',
        `Feature circle ${i} is not a finite circle (centre ${d.center.x}, ${d.center.y}, radius ${d.radiusMm} mm).`,
      );
    }
  });
  const hull = outermostDiscs(discs);
  if (hull.length === 1) {
    const d = hull[0]!;
    if (d.radiusMm <= OUTLINE_LENGTH_TOLERANCE_MM) {
      throw new DomainError('outline.degenerate', 'The features collapse to a single point: there is no outline to draw.');
    }
    return circleOutline(d.center, d.radiusMm);
  }

  // start at the lowest point (leftmost among exact ties), heading +x: that point is on the hull
  let startIndex = 0;
  hull.forEach((d, i) => {
    const s = hull[startIndex]!;
    const low = d.center.y - d.radiusMm;
    const best = s.center.y - s.radiusMm;
    if (low < best || (low === best && d.center.x < s.center.x)) startIndex = i;
  });
  const start = hull[startIndex]!;
  const startPoint = point(start.center.x, start.center.y - start.radiusMm);

  const segments: OutlineSegment[] = [];
  const addArc = (d: Disc, from: Point2, to: Point2, turnRad: number) => {
    if (turnRad > ANGLE_TOLERANCE_RAD && d.radiusMm > OUTLINE_LENGTH_TOLERANCE_MM) {
      segments.push(arc(from, to, d.center, d.radiusMm, true));
    }
  };

  let current = startIndex;
  let headingRad = 0;
  let turnedRad = 0;
  let at = startPoint;
  const maxSteps = 4 * hull.length + 8;
  for (let step = 0; ; step++) {
    if (step > maxSteps) {
      throw new DomainError('outline.hull', 'The automatic outline could not be closed; check for features at nearly the same place.');
    }
    const c = hull[current]!;
    let next = -1;
    let bestTurn = Infinity;
    let bestLength = -Infinity;
    let bestPsi = 0;
    hull.forEach((d, j) => {
      if (j === current) return;
      const psi = tangentDirectionRad(c, d);
      // a disc straight ahead may come out a hair to the right: that is a turn of 0, not of 2π
      // (safe: a disc that survives the 1e-9 mm containment test needs a turn far above this)
      const turn = normaliseRad(psi - headingRad + STRAIGHT_AHEAD_RAD) - STRAIGHT_AHEAD_RAD;
      const p = tangentPoint(c, psi);
      const q = tangentPoint(d, psi);
      const length = Math.hypot(q.x - p.x, q.y - p.y);
      if (turn < bestTurn - ANGLE_TOLERANCE_RAD || (Math.abs(turn - bestTurn) <= ANGLE_TOLERANCE_RAD && length > bestLength)) {
        next = j;
        bestTurn = turn;
        bestLength = length;
        bestPsi = psi;
      }
    });
    if (step > 0 && turnedRad + bestTurn >= TWO_PI - STRAIGHT_AHEAD_RAD) {
      // heading +x again: roll down to this disc's lowest point, then along the bottom line to the
      // start (the same point when this is the start disc; a line when the bottom is shared)
      const bottom = c === start ? startPoint : tangentPoint(c, 0);
      addArc(c, at, bottom, TWO_PI - turnedRad);
      if (Math.hypot(startPoint.x - bottom.x, startPoint.y - bottom.y) > OUTLINE_LENGTH_TOLERANCE_MM) segments.push(line(bottom, startPoint));
      break;
    }
    const depart = tangentPoint(c, bestPsi);
    addArc(c, at, depart, Math.max(0, bestTurn));
    const arrive = tangentPoint(hull[next]!, bestPsi);
    segments.push(line(depart, arrive));
    turnedRad += Math.max(0, bestTurn);
    headingRad = bestPsi;
    at = arrive;
    current = next;
  }

  return closeChain(mergeArcAcrossStart(segments));
}

/**
 * The chain starts at the lowest point, often inside an arc or a bottom line: join the two halves
 * of that arc (or line) so no extra vertex is left there.
 */
function mergeArcAcrossStart(segments: OutlineSegment[]): OutlineSegment[] {
  if (segments.length < 3) return segments;
  const first = segments[0]!;
  const last = segments[segments.length - 1]!;
  if (first.kind === 'line' && last.kind === 'line') {
    const a = segmentTangent(last, 'end');
    const b = segmentTangent(first, 'start');
    if (Math.abs(a.x * b.y - a.y * b.x) <= 1e-12 && a.x * b.x + a.y * b.y > 0) {
      return [line(last.start, first.end), ...segments.slice(1, -1)];
    }
    return segments;
  }
  if (first.kind !== 'arc' || last.kind !== 'arc') return segments;
  const sameCircle =
    Math.hypot(first.center.x - last.center.x, first.center.y - last.center.y) <= OUTLINE_LENGTH_TOLERANCE_MM &&
    Math.abs(first.radiusMm - last.radiusMm) <= OUTLINE_LENGTH_TOLERANCE_MM &&
    first.ccw === last.ccw;
  if (!sameCircle || Math.abs(arcSweepRad(first)) + Math.abs(arcSweepRad(last)) >= TWO_PI - 1e-6) return segments;
  return [arc(last.start, first.end, first.center, first.radiusMm, first.ccw), ...segments.slice(1, -1)];
}

/** Make each segment start at exactly the previous segment's end point. */
function closeChain(segments: OutlineSegment[]): OutlineSegment[] {
  const out: OutlineSegment[] = [];
  for (let i = 0; i < segments.length; i++) {
    const s = segments[i]!;
    const start = i === 0 ? s.start : out[i - 1]!.end;
    const end = i === segments.length - 1 ? (out[0]?.start ?? s.end) : s.end;
    out.push(s.kind === 'line' ? line(start, end) : arc(start, end, s.center, s.radiusMm, s.ccw));
  }
  return out;
}

/**
 * The automatic outline: every feature circle grown by the edge margin, and to at least the
 * corner radius, then the exact hull of those discs. So every feature keeps at least
 * `edgeMarginMm` of material to the edge, and no corner of the plate is sharper than
 * `cornerRadiusMm`.
 */
export function autoOutline(
  features: readonly Disc[],
  opts: { readonly edgeMarginMm: number; readonly cornerRadiusMm: number },
): OutlineSegment[] {
  if (!(opts.edgeMarginMm >= 0) || !Number.isFinite(opts.edgeMarginMm)) {
    throw new DomainError('outline.edgeMargin', `outline.edgeMarginMm must be zero or more, got ${String(opts.edgeMarginMm)}.`, [
      'outline',
      'edgeMarginMm',
    ]);
  }
  if (!(opts.cornerRadiusMm >= 0) || !Number.isFinite(opts.cornerRadiusMm)) {
    throw new DomainError('outline.cornerRadius', `outline.cornerRadiusMm must be zero or more, got ${String(opts.cornerRadiusMm)}.`, [
      'outline',
      'cornerRadiusMm',
    ]);
  }
  return hullOfDiscs(
    features.map((f) => ({ center: f.center, radiusMm: Math.max(f.radiusMm + opts.edgeMarginMm, opts.cornerRadiusMm) })),
  );
}

// ---------------------------------------------------------------------------------------------
// Polygon outline with fillets
// ---------------------------------------------------------------------------------------------

function cross(ax: number, ay: number, bx: number, by: number): number {
  return ax * by - ay * bx;
}

function segmentsCross(p1: Point2, p2: Point2, q1: Point2, q2: Point2): boolean {
  const d1 = cross(p2.x - p1.x, p2.y - p1.y, q1.x - p1.x, q1.y - p1.y);
  const d2 = cross(p2.x - p1.x, p2.y - p1.y, q2.x - p1.x, q2.y - p1.y);
  const d3 = cross(q2.x - q1.x, q2.y - q1.y, p1.x - q1.x, p1.y - q1.y);
  const d4 = cross(q2.x - q1.x, q2.y - q1.y, p2.x - q1.x, p2.y - q1.y);
  const eps = OUTLINE_LENGTH_TOLERANCE_MM;
  return ((d1 > eps && d2 < -eps) || (d1 < -eps && d2 > eps)) && ((d3 > eps && d4 < -eps) || (d3 < -eps && d4 > eps));
}

/**
 * A user polygon as a closed counter-clockwise chain; with `cornerRadiusMm` > 0 every corner is
 * rounded by a true arc tangent to both edges (convex corners turn counter-clockwise, concave
 * ones clockwise). Points may be given in either direction; a clockwise polygon is reversed.
 * Collinear points are dropped. `cornerRadiiMm[i]` (when given) rounds corner i by its own radius
 * (0 = sharp), overriding `cornerRadiusMm` there.
 *
 * @throws DomainError `outline.polygon` (fewer than 3 corners, repeated points, crossing edges),
 *   `outline.cornerRadius` (a fillet does not fit on its edges)
 */
export function polygonOutline(points: readonly Point2[], cornerRadiusMm = 0, cornerRadiiMm?: readonly (number | null | undefined)[]): OutlineSegment[] {
  const path = ['outline', 'points'];
  if (!(cornerRadiusMm >= 0) || !Number.isFinite(cornerRadiusMm)) {
    throw new DomainError('outline.cornerRadius', `outline.cornerRadiusMm must be zero or more, got ${String(cornerRadiusMm)}.`, [
      'outline',
      'cornerRadiusMm',
    ]);
  }
  if (cornerRadiiMm && cornerRadiiMm.length > points.length) {
    throw new DomainError('outline.cornerRadius', `outline.cornerRadiiMm has ${cornerRadiiMm.length} radii for ${points.length} corners.`, ['outline', 'cornerRadiiMm']);
  }
  cornerRadiiMm?.forEach((r, i) => {
    if (r !== null && r !== undefined && (!(r >= 0) || !Number.isFinite(r))) {
      throw new DomainError('outline.cornerRadius', `The radius at corner ${i + 1} must be zero or more, got ${String(r)}.`, ['outline', 'cornerRadiiMm', i]);
    }
  });
  /** the radius at the user's corner i: its own, else the common one */
  const radiusAt = (i: number): number => cornerRadiiMm?.[i] ?? cornerRadiusMm;
  if (points.length < 3) {
    throw new DomainError('outline.polygon', `outline.points needs at least 3 corners, got ${points.length}.`, path);
  }
  points.forEach((p, i) => {
    const n = points[(i + 1) % points.length]!;
    if (Math.hypot(n.x - p.x, n.y - p.y) <= 1e-6) {
      throw new DomainError(
        'outline.polygon',
        `outline.points.${i} and outline.points.${(i + 1) % points.length} are the same point (${p.x}, ${p.y}).`,
        [...path, i],
      );
    }
  });
  const m = points.length;
  for (let a = 0; a < m; a++) {
    for (let b = a + 2; b < m; b++) {
      if (a === 0 && b === m - 1) continue;
      if (segmentsCross(points[a]!, points[(a + 1) % m]!, points[b]!, points[(b + 1) % m]!)) {
        throw new DomainError(
          'outline.polygon',
          `The outline polygon crosses itself: the edge from corner ${a + 1} to ${((a + 1) % m) + 1} crosses the edge from corner ${b + 1} to ${((b + 1) % m) + 1} (outline.points.${a} and outline.points.${b}).`,
          path,
        );
      }
    }
  }
  let signed = 0;
  points.forEach((p, i) => {
    const n = points[(i + 1) % points.length]!;
    signed += p.x * n.y - n.x * p.y;
  });
  if (Math.abs(signed) / 2 <= 1e-6) {
    throw new DomainError('outline.polygon', 'outline.points enclose no area (all corners on one line).', path);
  }
  // keep the user's numbering for messages
  const indexed = points.map((p, i) => ({ p: point(p.x, p.y), i }));
  const ccwPts = signed > 0 ? indexed : [...indexed].reverse();

  // drop collinear corners
  const corners = ccwPts.filter((v, k) => {
    const a = ccwPts[(k - 1 + ccwPts.length) % ccwPts.length]!.p;
    const b = ccwPts[(k + 1) % ccwPts.length]!.p;
    const ux = v.p.x - a.x;
    const uy = v.p.y - a.y;
    const wx = b.x - v.p.x;
    const wy = b.y - v.p.y;
    const turn = Math.atan2(cross(ux, uy, wx, wy), ux * wx + uy * wy);
    return Math.abs(turn) > 1e-9;
  });
  const n = corners.length;
  if (corners.every((c) => radiusAt(c.i) <= OUTLINE_LENGTH_TOLERANCE_MM)) {
    return closeChain(corners.map((c, k) => line(c.p, corners[(k + 1) % n]!.p)));
  }

  interface Fillet {
    readonly start: Point2;
    readonly end: Point2;
    readonly center: Point2;
    readonly ccw: boolean;
    readonly setbackMm: number;
    readonly radiusMm: number;
  }
  const fillets: Fillet[] = corners.map((v, k) => {
    const cornerRadiusMm = radiusAt(v.i);
    const a = corners[(k - 1 + n) % n]!.p;
    const b = corners[(k + 1) % n]!.p;
    const l1 = Math.hypot(v.p.x - a.x, v.p.y - a.y);
    const l2 = Math.hypot(b.x - v.p.x, b.y - v.p.y);
    const u1 = { x: (v.p.x - a.x) / l1, y: (v.p.y - a.y) / l1 };
    const u2 = { x: (b.x - v.p.x) / l2, y: (b.y - v.p.y) / l2 };
    const turn = Math.atan2(cross(u1.x, u1.y, u2.x, u2.y), u1.x * u2.x + u1.y * u2.y);
    const setbackMm = cornerRadiusMm * Math.tan(Math.abs(turn) / 2);
    const start = point(v.p.x - u1.x * setbackMm, v.p.y - u1.y * setbackMm);
    const end = point(v.p.x + u2.x * setbackMm, v.p.y + u2.y * setbackMm);
    const side = turn > 0 ? 1 : -1; // centre to the left of the edge for a left (ccw) turn
    const center = point(start.x - u1.y * cornerRadiusMm * side, start.y + u1.x * cornerRadiusMm * side);
    return { start, end, center, ccw: turn > 0, setbackMm, radiusMm: cornerRadiusMm };
  });
  for (let k = 0; k < n; k++) {
    const here = corners[k]!;
    const nextK = (k + 1) % n;
    const edge = Math.hypot(corners[nextK]!.p.x - here.p.x, corners[nextK]!.p.y - here.p.y);
    const need = fillets[k]!.setbackMm + fillets[nextK]!.setbackMm;
    if (need > edge + 1e-9 && cornerRadiiMm) {
      throw new DomainError(
        'outline.cornerRadius',
        `The corner radii are too large for the edge from corner ${here.i + 1} to corner ${corners[nextK]!.i + 1}: the fillets need ${need.toFixed(3)} mm of an edge ${edge.toFixed(3)} mm long. Make a radius smaller or the edge longer.`,
        ['outline', 'cornerRadiiMm', fillets[k]!.setbackMm >= fillets[nextK]!.setbackMm ? here.i : corners[nextK]!.i],
      );
    }
    if (need > edge + 1e-9) {
      throw new DomainError(
        'outline.cornerRadius',
        `outline.cornerRadiusMm ${cornerRadiusMm} mm is too large: the fillets at outline.points.${here.i} and outline.points.${corners[nextK]!.i} need ${need.toFixed(3)} mm of an edge ${edge.toFixed(3)} mm long.`,
        ['outline', 'cornerRadiusMm'],
      );
    }
  }
  const segments: OutlineSegment[] = [];
  for (let k = 0; k < n; k++) {
    const f = fillets[k]!;
    const g = fillets[(k + 1) % n]!;
    if (f.radiusMm > OUTLINE_LENGTH_TOLERANCE_MM) segments.push(arc(f.start, f.end, f.center, f.radiusMm, f.ccw));
    if (Math.hypot(g.start.x - f.end.x, g.start.y - f.end.y) > OUTLINE_LENGTH_TOLERANCE_MM) segments.push(line(f.end, g.start));
  }
  return closeChain(segments);
}

/** Unit tangent (direction of travel) at the start or the end of a segment. */
export function segmentTangent(seg: OutlineSegment, at: 'start' | 'end'): Point2 {
  if (seg.kind === 'line') {
    const l = segmentLengthMm(seg);
    return point((seg.end.x - seg.start.x) / l, (seg.end.y - seg.start.y) / l);
  }
  const p = at === 'start' ? seg.start : seg.end;
  const rx = (p.x - seg.center.x) / seg.radiusMm;
  const ry = (p.y - seg.center.y) / seg.radiusMm;
  return seg.ccw ? point(-ry, rx) : point(ry, -rx);
}
