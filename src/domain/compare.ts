import type { PlateProfile, ProfileHole } from './profileTypes';

/** How two revisions of a plate differ: what a reviewer wants to see before approving. */
export interface RevisionComparison {
  holesAdded: HoleSummary[];
  holesRemoved: HoleSummary[];
  holesMoved: { id: string; from: { x: number; y: number }; to: { x: number; y: number }; distanceMm: number }[];
  holesChanged: { id: string; changes: { field: string; from: unknown; to: unknown }[] }[];
  /** spec fields outside the hole lists, as dotted paths */
  otherChanges: { path: string; from: unknown; to: unknown }[];
}

export interface HoleSummary {
  id: string;
  face: ProfileHole['face'];
  operation: ProfileHole['operation'];
  x: number;
  y: number;
  diameterMm: number;
}

/** Positions closer than this are the same position (well below any machining tolerance). */
export const SAME_POSITION_MM = 1e-6;
const SAME_SIZE_MM = 1e-6;

const summary = (h: ProfileHole): HoleSummary => ({
  id: h.id,
  face: h.face,
  operation: h.operation,
  x: h.center.x,
  y: h.center.y,
  diameterMm: h.diameterMm,
});

/** Holes are matched by feature id; the same id everywhere is what makes this comparison honest. */
export function compareProfiles(a: PlateProfile, b: PlateProfile): Omit<RevisionComparison, 'otherChanges'> {
  const before = new Map(a.holes.map((h) => [h.id, h]));
  const after = new Map(b.holes.map((h) => [h.id, h]));
  const out: Omit<RevisionComparison, 'otherChanges'> = { holesAdded: [], holesRemoved: [], holesMoved: [], holesChanged: [] };
  for (const [id, h] of after) if (!before.has(id)) out.holesAdded.push(summary(h));
  for (const [id, h] of before) if (!after.has(id)) out.holesRemoved.push(summary(h));
  for (const [id, h0] of before) {
    const h1 = after.get(id);
    if (!h1) continue;
    const distanceMm = Math.hypot(h1.center.x - h0.center.x, h1.center.y - h0.center.y);
    if (distanceMm > SAME_POSITION_MM) {
      out.holesMoved.push({ id, from: { x: h0.center.x, y: h0.center.y }, to: { x: h1.center.x, y: h1.center.y }, distanceMm });
    }
    const changes: { field: string; from: unknown; to: unknown }[] = [];
    if (Math.abs(h1.diameterMm - h0.diameterMm) > SAME_SIZE_MM) changes.push({ field: 'diameterMm', from: h0.diameterMm, to: h1.diameterMm });
    for (const field of ['operation', 'thread', 'depthMm', 'fromSide', 'threadDepthMm'] as const) {
      if (h0[field] !== h1[field]) changes.push({ field, from: h0[field] ?? null, to: h1[field] ?? null });
    }
    const cb0 = h0.counterbore ? `${h0.counterbore.diameterMm}x${h0.counterbore.depthMm}@${h0.counterbore.fromSide}` : null;
    const cb1 = h1.counterbore ? `${h1.counterbore.diameterMm}x${h1.counterbore.depthMm}@${h1.counterbore.fromSide}` : null;
    if (cb0 !== cb1) changes.push({ field: 'counterbore', from: h0.counterbore ?? null, to: h1.counterbore ?? null });
    const fit0 = h0.fit?.designation ?? null;
    const fit1 = h1.fit?.designation ?? null;
    if (fit0 !== fit1) changes.push({ field: 'fit', from: fit0, to: fit1 });
    if (changes.length) out.holesChanged.push({ id, changes });
  }
  const byId = (x: { id: string }, y: { id: string }) => x.id.localeCompare(y.id, 'en', { numeric: true });
  out.holesAdded.sort(byId);
  out.holesRemoved.sort(byId);
  out.holesMoved.sort(byId);
  out.holesChanged.sort(byId);
  return out;
}

/**
 * Leaf-level differences between two JSON documents, as dotted paths (`thicknessMm`,
 * `starter.angleDeg`). Paths for which `skip(path)` is true are left out (e.g. the hole lists,
 * which compareProfiles reports feature by feature).
 */
export function diffDocuments(a: unknown, b: unknown, skip: (path: string) => boolean = () => false): { path: string; from: unknown; to: unknown }[] {
  const out: { path: string; from: unknown; to: unknown }[] = [];
  const walk = (x: unknown, y: unknown, path: string) => {
    if (path && skip(path)) return;
    const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
    if (isObj(x) && isObj(y)) {
      const keys = [...new Set([...Object.keys(x), ...Object.keys(y)])].sort();
      for (const k of keys) walk(x[k], y[k], path ? `${path}.${k}` : k);
      return;
    }
    if (Array.isArray(x) && Array.isArray(y)) {
      const n = Math.max(x.length, y.length);
      for (let i = 0; i < n; i++) walk(x[i], y[i], `${path}.${i}`);
      return;
    }
    if (JSON.stringify(x) !== JSON.stringify(y)) out.push({ path, from: x ?? null, to: y ?? null });
  };
  walk(a, b, '');
  return out;
}
