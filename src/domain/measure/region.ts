/**
 * Selections on the flattened face: a box or a lasso (polygon) in face coordinates (u, v), or the
 * points of one label of a probed file.
 */
import { DomainError } from '../errors';

export type Region =
  | { readonly kind: 'box'; readonly uMin: number; readonly uMax: number; readonly vMin: number; readonly vMax: number }
  | { readonly kind: 'polygon'; readonly points: readonly { readonly u: number; readonly v: number }[] };

export function regionCentre(region: Region): { u: number; v: number } {
  if (region.kind === 'box') return { u: (region.uMin + region.uMax) / 2, v: (region.vMin + region.vMax) / 2 };
  // area centroid of the polygon (vertex mean if it has no area)
  let a = 0;
  let cu = 0;
  let cv = 0;
  const p = region.points;
  for (let i = 0; i < p.length; i++) {
    const q = p[i]!;
    const r = p[(i + 1) % p.length]!;
    const cross = q.u * r.v - r.u * q.v;
    a += cross;
    cu += (q.u + r.u) * cross;
    cv += (q.v + r.v) * cross;
  }
  if (Math.abs(a) < 1e-12) {
    return { u: p.reduce((s, q) => s + q.u, 0) / p.length, v: p.reduce((s, q) => s + q.v, 0) / p.length };
  }
  return { u: cu / (3 * a), v: cv / (3 * a) };
}

export function regionArea(region: Region): number {
  if (region.kind === 'box') return (region.uMax - region.uMin) * (region.vMax - region.vMin);
  let a = 0;
  const p = region.points;
  for (let i = 0; i < p.length; i++) {
    const q = p[i]!;
    const r = p[(i + 1) % p.length]!;
    a += q.u * r.v - r.u * q.v;
  }
  return Math.abs(a) / 2;
}

export function checkRegion(region: Region): void {
  if (region.kind === 'box') {
    if (!(region.uMax > region.uMin && region.vMax > region.vMin)) {
      throw new DomainError('measure.region', 'The selection box has no area: uMax must be above uMin and vMax above vMin.', ['region']);
    }
  } else if (region.points.length < 3) {
    throw new DomainError('measure.region', 'A lasso selection needs at least 3 corners.', ['region', 'points']);
  }
}

/**
 * Indices of the points of `uv` (interleaved u, v) inside the region; `mask` (one byte per point,
 * 1 = use) restricts to some points, e.g. the face's inliers.
 */
export function pointsInRegion(uv: Float64Array, region: Region, mask?: Uint8Array): Int32Array {
  checkRegion(region);
  const n = uv.length / 2;
  let uMin: number;
  let uMax: number;
  let vMin: number;
  let vMax: number;
  if (region.kind === 'box') {
    ({ uMin, uMax, vMin, vMax } = region);
  } else {
    uMin = Math.min(...region.points.map((p) => p.u));
    uMax = Math.max(...region.points.map((p) => p.u));
    vMin = Math.min(...region.points.map((p) => p.v));
    vMax = Math.max(...region.points.map((p) => p.v));
  }
  const poly = region.kind === 'polygon' ? Float64Array.from(region.points.flatMap((p) => [p.u, p.v])) : null;
  const out = new Int32Array(n);
  let count = 0;
  for (let i = 0; i < n; i++) {
    if (mask && mask[i] === 0) continue;
    const u = uv[2 * i]!;
    const v = uv[2 * i + 1]!;
    if (u < uMin || u > uMax || v < vMin || v > vMax) continue;
    if (poly && !insidePolygon(poly, u, v)) continue;
    out[count++] = i;
  }
  return out.slice(0, count);
}

/** Even–odd rule. */
function insidePolygon(poly: Float64Array, u: number, v: number): boolean {
  let inside = false;
  const m = poly.length / 2;
  for (let i = 0, j = m - 1; i < m; j = i++) {
    const ui = poly[2 * i]!;
    const vi = poly[2 * i + 1]!;
    const uj = poly[2 * j]!;
    const vj = poly[2 * j + 1]!;
    if (vi > v !== vj > v && u < ((uj - ui) * (v - vi)) / (vj - vi) + ui) inside = !inside;
  }
  return inside;
}
