/**
 * The plate's 2D layout as the CAD kernel needs it: whether every feature stands apart from every
 * other and inside the outline with the minimum wall. The checks use the same rules for their
 * findings; the kernel worker uses them to choose how to build the solid. Only geometry here (no
 * spec schema), so the kernel worker loads it without the rest of the domain.
 */
import type { Disc } from './outline';
import { distanceToOutline, pointInOutline, segmentLengthMm } from './outline';
import type { OutlineSegment, PlateProfile, Point2, ProfileHole, ProfilePocket } from './profileTypes';
import { formatLength } from './units';

/** Thinnest wall between two features, or between a feature and the edge (mm). */
export const MIN_WALL_MM = 0.8;

const LENGTH_TOLERANCE_MM = 1e-9;

const f2 = (mm: number): string => formatLength(mm, 'mm');

/** The circle a round feature occupies in the plan view (its counterbore, if wider). */
export function featureDisc(h: ProfileHole): Disc {
  const d = Math.max(h.diameterMm, h.counterbore?.diameterMm ?? 0);
  return { center: h.center, radiusMm: d / 2 };
}

/** Points along a chain, no further apart than `stepMm` (for clearance checks between chains). */
export function sampleChain(chain: readonly OutlineSegment[], stepMm: number): Point2[] {
  const pts: Point2[] = [];
  for (const s of chain) {
    const n = Math.max(1, Math.ceil(segmentLengthMm(s) / stepMm));
    for (let k = 0; k < n; k++) {
      const u = k / n;
      if (s.kind === 'line') {
        pts.push({ x: s.start.x + (s.end.x - s.start.x) * u, y: s.start.y + (s.end.y - s.start.y) * u });
      } else {
        const a0 = Math.atan2(s.start.y - s.center.y, s.start.x - s.center.x);
        const a1 = Math.atan2(s.end.y - s.center.y, s.end.x - s.center.x);
        let sweep = a1 - a0;
        if (s.ccw && sweep <= 0) sweep += 2 * Math.PI;
        if (!s.ccw && sweep >= 0) sweep -= 2 * Math.PI;
        const a = a0 + sweep * u;
        pts.push({ x: s.center.x + s.radiusMm * Math.cos(a), y: s.center.y + s.radiusMm * Math.sin(a) });
      }
    }
  }
  return pts;
}

/**
 * The least signed distance of `samples` to `outline` (inside +, outside −) and the first sample
 * where it is — exact whenever it is below `below`; otherwise some distance ≥ `below` (callers
 * that only act below a limit pass it). The signed distance changes by no more than the distance
 * moved, so a sample nearer to the last one measured than that one's margin over the smaller of
 * the worst so far and `below` is not measured.
 */
export function leastEdgeDistance(
  outline: readonly OutlineSegment[],
  samples: readonly Point2[],
  below = Infinity,
): { readonly distanceMm: number; readonly at: Point2 | null } {
  let worst = Infinity;
  let at: Point2 | null = null;
  let last: Point2 | null = null;
  let lastD = 0;
  for (const q of samples) {
    if (last && lastD - Math.hypot(q.x - last.x, q.y - last.y) >= Math.min(worst, below)) continue;
    const d = pointInOutline(outline, q) ? distanceToOutline(outline, q) : -distanceToOutline(outline, q);
    last = q;
    lastD = d;
    if (d < worst) {
      worst = d;
      at = q;
    }
  }
  return { distanceMm: worst, at };
}

/** Where a disc lies relative to a pocket: fully inside / outside with the wall, or crossing its edge. */
export function discVsPocket(
  pocket: ProfilePocket,
  center: Point2,
  radiusMm: number,
  minWallMm: number,
): { readonly relation: 'inside' | 'outside' | 'crossing'; readonly wallMm: number } {
  const inside = pointInOutline(pocket.outline, center);
  const d = distanceToOutline(pocket.outline, center);
  const wallMm = d - radiusMm;
  if (wallMm >= minWallMm - LENGTH_TOLERANCE_MM) return { relation: inside ? 'inside' : 'outside', wallMm };
  return { relation: 'crossing', wallMm };
}

/**
 * Why a profile's layout is not "disjoint": features overlapping or closer than the wall, outside
 * the outline's inset (wall + edge chamfer), crossing a pocket's edge, counterbores/pockets/blind
 * holes as deep as the plate. Empty when the layout is disjoint.
 */
export function layoutProblems(profile: PlateProfile, opts: { readonly minWallMm?: number } = {}): string[] {
  const wall = opts.minWallMm ?? MIN_WALL_MM;
  const t = profile.thicknessMm;
  const problems: string[] = [];
  const holes = profile.holes;
  const discs = holes.map(featureDisc);
  for (let i = 0; i < holes.length; i++) {
    const h = holes[i]!;
    const d = discs[i]!;
    const inside = pointInOutline(profile.outline, h.center);
    const edge = distanceToOutline(profile.outline, h.center) - d.radiusMm;
    if (!inside || edge < wall + profile.edgeChamferMm - LENGTH_TOLERANCE_MM) {
      problems.push(`${h.id} is not inside the outline by ${f2(wall + profile.edgeChamferMm)}`);
    }
    if (h.counterbore) {
      if (h.counterbore.diameterMm <= h.diameterMm + LENGTH_TOLERANCE_MM) problems.push(`${h.id}: counterbore not wider than its hole`);
      if (h.counterbore.depthMm > t - wall + LENGTH_TOLERANCE_MM) problems.push(`${h.id}: counterbore leaves less than ${f2(wall)} floor`);
    }
    if (h.depthMm !== null && h.depthMm > t - wall + LENGTH_TOLERANCE_MM) problems.push(`${h.id}: blind hole leaves less than ${f2(wall)} floor`);
    for (let j = i + 1; j < holes.length; j++) {
      const o = holes[j]!;
      const gap = Math.hypot(h.center.x - o.center.x, h.center.y - o.center.y) - d.radiusMm - discs[j]!.radiusMm;
      if (gap < wall - LENGTH_TOLERANCE_MM) problems.push(`${h.id} and ${o.id} are closer than ${f2(wall)}`);
    }
    for (const p of profile.pockets) {
      const rel = discVsPocket(p, h.center, d.radiusMm, wall);
      if (rel.relation === 'crossing') problems.push(`${h.id} crosses the edge of pocket ${p.id}`);
      if (rel.relation === 'inside') {
        if (h.counterbore && h.counterbore.fromSide === p.fromSide) problems.push(`${h.id}: counterbore inside pocket ${p.id}`);
        if (h.depthMm !== null) problems.push(`${h.id}: blind hole inside pocket ${p.id}`);
      }
    }
  }
  profile.pockets.forEach((p, i) => {
    if (p.depthMm > t - wall + LENGTH_TOLERANCE_MM) problems.push(`pocket ${p.id} leaves less than ${f2(wall)} floor`);
    const need = wall + profile.edgeChamferMm - LENGTH_TOLERANCE_MM;
    if (leastEdgeDistance(profile.outline, sampleChain(p.outline, 0.5), need).distanceMm < need) {
      problems.push(`pocket ${p.id} is not inside the outline by ${f2(wall + profile.edgeChamferMm)}`);
    }
    for (const o of profile.pockets.slice(i + 1)) {
      if (sampleChain(o.outline, 0.5).some((q) => pointInOutline(p.outline, q) || distanceToOutline(p.outline, q) < wall)) {
        problems.push(`pockets ${p.id} and ${o.id} touch`);
      }
    }
  });
  return problems;
}

/**
 * True when every feature is apart from every other and inside the outline's inset by the
 * minimum wall (default 0.8 mm, plus the edge chamfer), holes inside a pocket are plain through
 * holes, and no depth reaches through the plate — the condition for building the solid directly
 * face by face.
 */
export function layoutIsDisjoint(profile: PlateProfile, opts: { readonly minWallMm?: number } = {}): boolean {
  return layoutProblems(profile, opts).length === 0;
}
