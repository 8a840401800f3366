/**
 * "Reload the latest revision and re-apply my changes" after a save conflict: the builder's
 * edits (what changed from the revision they started from) are put on top of the newer revision.
 * Granularity: top-level fields of the spec; for the two faces, each field of the face, and
 * holes and patterns one by one (by id). Where both sides changed the same thing, the builder's
 * version wins and the place is listed, so the editor can say what it overwrote.
 */
import type { PlateSpecInput } from '../spec';

type Json = unknown;

export function sameJson(a: Json, b: Json): boolean {
  if (a === b) return true;
  if (typeof a !== typeof b || a === null || b === null || typeof a !== 'object') return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  if (Array.isArray(a)) {
    const bb = b as Json[];
    return a.length === bb.length && a.every((v, i) => sameJson(v, bb[i]));
  }
  const ka = Object.keys(a as object).filter((k) => (a as Record<string, Json>)[k] !== undefined);
  const kb = Object.keys(b as object).filter((k) => (b as Record<string, Json>)[k] !== undefined);
  if (ka.length !== kb.length) return false;
  return ka.every((k) => sameJson((a as Record<string, Json>)[k], (b as Record<string, Json>)[k]));
}

export interface ReapplyResult {
  readonly spec: PlateSpecInput;
  /** paths both sides changed, where the builder's version was kept */
  readonly overwritten: readonly string[];
  /** paths the builder changed and that were re-applied */
  readonly applied: readonly string[];
}

type Rec = Record<string, Json>;

function mergeById(base: Rec[] = [], mine: Rec[] = [], latest: Rec[] = [], path: string, out: { overwritten: string[]; applied: string[] }): Rec[] {
  const byId = (xs: Rec[]) => new Map(xs.map((x) => [String(x.id), x]));
  const b = byId(base);
  const m = byId(mine);
  const result = latest.map((x) => ({ ...x }));
  const index = new Map(result.map((x, i) => [String(x.id), i]));
  // deleted by me
  for (const [id, bx] of b) {
    if (m.has(id)) continue;
    const i = index.get(id);
    if (i === undefined) continue;
    if (!sameJson(result[i], bx)) out.overwritten.push(`${path}.${id}`);
    out.applied.push(`${path}.${id}`);
    result[i] = undefined as unknown as Rec;
  }
  // changed or added by me
  for (const [id, mx] of m) {
    const bx = b.get(id);
    if (bx && sameJson(bx, mx)) continue;
    const i = index.get(id);
    out.applied.push(`${path}.${id}`);
    if (i === undefined) {
      result.push(mx);
      if (bx) out.overwritten.push(`${path}.${id}`);
    } else {
      if (!sameJson(result[i], bx ?? null) && !sameJson(result[i], mx)) out.overwritten.push(`${path}.${id}`);
      result[i] = mx;
    }
  }
  return result.filter((x) => x !== undefined);
}

function mergeFields(base: Rec, mine: Rec, latest: Rec, prefix: string, out: { overwritten: string[]; applied: string[] }, deeper: (k: string) => ((b: Json, m: Json, l: Json, p: string) => Json) | null): Rec {
  const keys = new Set([...Object.keys(base ?? {}), ...Object.keys(mine ?? {}), ...Object.keys(latest ?? {})]);
  const result: Rec = { ...(latest ?? {}) };
  for (const k of keys) {
    const b = base?.[k];
    const m = mine?.[k];
    const l = latest?.[k];
    if (sameJson(b, m)) continue;
    const path = prefix ? `${prefix}.${k}` : k;
    const d = deeper(k);
    if (d && m !== undefined && l !== undefined) {
      result[k] = d(b, m, l, path);
      continue;
    }
    out.applied.push(path);
    if (!sameJson(b, l) && !sameJson(m, l)) out.overwritten.push(path);
    if (m === undefined) delete result[k];
    else result[k] = m;
  }
  return result;
}

export function reapplyChanges(base: PlateSpecInput, mine: PlateSpecInput, latest: PlateSpecInput): ReapplyResult {
  const out = { overwritten: [] as string[], applied: [] as string[] };
  const face = (b: Json, m: Json, l: Json, p: string): Json =>
    mergeFields(b as Rec, m as Rec, l as Rec, p, out, (k) =>
      k === 'holes' || k === 'patterns' ? (bb, mm, ll, pp) => mergeById(bb as Rec[], mm as Rec[], ll as Rec[], pp, out) : null,
    );
  const spec = mergeFields(base as unknown as Rec, mine as unknown as Rec, latest as unknown as Rec, '', out, (k) =>
    k === 'engineFace' || k === 'transmissionFace' ? face : null,
  );
  return { spec: spec as unknown as PlateSpecInput, overwritten: out.overwritten, applied: out.applied };
}
