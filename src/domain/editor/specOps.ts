/**
 * Edits of a plate spec document as the editor makes them. The document is the raw spec (as
 * written, defaults not filled in) so an edit never adds fields the builder did not write.
 * Every function returns a new document; the input is never changed.
 */
import type { PlateSpecInput } from '../spec';
import { boltCircle } from '../geometry/boltCircle';
import { flywheelHousing, type FlywheelHousingSize } from '../standards/flywheelHousings';
import { toPlateCoordinates } from '../profile';
import type { Point2 } from '../profileTypes';

export type FaceKey = 'engineFace' | 'transmissionFace';
type FaceInput = PlateSpecInput['engineFace'];
export type HoleInput = NonNullable<FaceInput['holes']>[number];
export type PatternInput = NonNullable<FaceInput['patterns']>[number];

export const FACE_LABEL: Record<FaceKey, string> = { engineFace: 'Engine face', transmissionFace: 'Transmission face' };
/** Suggested id prefixes (see spec.ts): holes, dowels, patterns. */
export const FACE_PREFIX: Record<FaceKey, { hole: string; dowel: string; pattern: string }> = {
  engineFace: { hole: 'E', dowel: 'ED', pattern: 'EP' },
  transmissionFace: { hole: 'T', dowel: 'TD', pattern: 'TP' },
};

function clone<T>(v: T): T {
  return structuredClone(v);
}

/** Every feature id and pattern id in use. */
export function usedIds(doc: PlateSpecInput): Set<string> {
  const ids = new Set<string>(['C1', 'S1', 'P1']);
  for (const f of ['engineFace', 'transmissionFace'] as const) {
    for (const h of doc[f]?.holes ?? []) ids.add(h.id);
    for (const p of doc[f]?.patterns ?? []) ids.add(p.id);
  }
  for (const h of doc.starter?.mountingHoles ?? []) ids.add(h.id);
  return ids;
}

/** `prefix` + the next free number (E1, E2 … skipping every id in use, holes and patterns alike). */
export function nextId(doc: PlateSpecInput, prefix: string, taken: Set<string> = usedIds(doc)): string {
  let max = 0;
  const re = new RegExp(`^${prefix.replace(/[^A-Za-z0-9]/g, '')}(\\d+)$`);
  for (const id of taken) {
    const m = re.exec(id);
    if (m) max = Math.max(max, Number(m[1]));
  }
  let n = max + 1;
  while (taken.has(`${prefix}${n}`)) n++;
  return `${prefix}${n}`;
}

function patternAngles(p: PatternInput): number[] {
  if (p.anglesDeg) return [...p.anglesDeg];
  const count = p.count ?? 0;
  const start = p.startAngleDeg ?? 0;
  return Array.from({ length: count }, (_, k) => start + (k * 360) / count);
}

/** Where a hole of a face is, in the face's own coordinates (as measured); null if it cannot be placed. */
export function holeFacePosition(face: FaceInput, hole: HoleInput): Point2 | null {
  if (hole.x !== undefined && hole.y !== undefined) return { x: hole.x, y: hole.y };
  if (hole.patternId === undefined || hole.index === undefined) return null;
  const p = (face.patterns ?? []).find((q) => q.id === hole.patternId);
  if (!p) return null;
  const angle = patternAngles(p)[hole.index];
  if (angle === undefined || !(p.diameterMm > 0)) return null;
  const r = p.diameterMm / 2;
  const a = (angle * Math.PI) / 180;
  return { x: (p.centerX ?? 0) + r * Math.cos(a), y: (p.centerY ?? 0) + r * Math.sin(a) };
}

/** The same in plate coordinates (mirrored for a face viewed from the front). */
export function holePlatePosition(face: FaceInput, hole: HoleInput): Point2 | null {
  const p = holeFacePosition(face, hole);
  return p ? toPlateCoordinates(p, face.viewedFrom) : null;
}

export function updateFace(doc: PlateSpecInput, face: FaceKey, fn: (f: FaceInput) => FaceInput): PlateSpecInput {
  return { ...doc, [face]: fn(doc[face]) };
}

/** Changes fields of hole `index`; `undefined` in the patch removes a field. */
export function patchHole(doc: PlateSpecInput, face: FaceKey, index: number, patch: Partial<Record<keyof HoleInput, unknown>>): PlateSpecInput {
  return updateFace(doc, face, (f) => {
    const holes = [...(f.holes ?? [])];
    const h: Record<string, unknown> = { ...holes[index]! };
    for (const [k, v] of Object.entries(patch)) {
      if (v === undefined) delete h[k];
      else h[k] = v;
    }
    holes[index] = h as HoleInput;
    return { ...f, holes };
  });
}

/**
 * Moves a hole to a coordinate (face coordinates, as measured). A hole placed on a pattern is
 * taken off it and keeps its other coordinate, so typing X of a pattern hole does what it says.
 */
export function setHoleCoordinate(doc: PlateSpecInput, face: FaceKey, index: number, axis: 'x' | 'y', valueMm: number): PlateSpecInput {
  const f = doc[face];
  const h = (f.holes ?? [])[index];
  if (!h) return doc;
  const at = holeFacePosition(f, h) ?? { x: 0, y: 0 };
  const x = axis === 'x' ? valueMm : (h.x ?? round6(at.x));
  const y = axis === 'y' ? valueMm : (h.y ?? round6(at.y));
  return patchHole(doc, face, index, { x, y, patternId: undefined, index: undefined });
}

const round6 = (v: number): number => Math.round(v * 1e6) / 1e6;

export function deleteHoles(doc: PlateSpecInput, face: FaceKey, indices: readonly number[]): PlateSpecInput {
  const drop = new Set(indices);
  return updateFace(doc, face, (f) => ({ ...f, holes: (f.holes ?? []).filter((_, i) => !drop.has(i)) }));
}

/** A copy of hole `index` with a new id, placed by coordinates `offsetMm` to the right of it. */
export function duplicateHole(doc: PlateSpecInput, face: FaceKey, index: number, offsetMm = 10): { doc: PlateSpecInput; id: string } {
  const f = doc[face];
  const h = (f.holes ?? [])[index];
  if (!h) return { doc, id: '' };
  const at = holeFacePosition(f, h) ?? { x: 0, y: 0 };
  const prefix = h.role === 'dowel' ? FACE_PREFIX[face].dowel : FACE_PREFIX[face].hole;
  const id = nextId(doc, prefix);
  const copy: Record<string, unknown> = { ...clone(h), id, x: round6(at.x + offsetMm), y: round6(at.y) };
  delete copy.patternId;
  delete copy.index;
  return { doc: updateFace(doc, face, (g) => ({ ...g, holes: [...(g.holes ?? []).slice(0, index + 1), copy as HoleInput, ...(g.holes ?? []).slice(index + 1)] })), id };
}

export interface NewHoleDefaults {
  readonly role: 'clearance' | 'tapped' | 'dowel' | 'stud';
  readonly fastener?: string;
  readonly dowelDiameterMm?: number;
  readonly dowelFit?: string;
  readonly counterbore?: boolean;
}

function holeBody(d: NewHoleDefaults): Partial<HoleInput> {
  if (d.role === 'dowel') return { role: 'dowel', dowel: { diameterMm: d.dowelDiameterMm ?? 10, fit: d.dowelFit ?? 'H7' } };
  return { role: d.role, fastener: d.fastener ?? 'M10x1.5', ...(d.counterbore && d.role === 'clearance' ? { counterbore: {} } : {}) };
}

/** Adds one hole by coordinates (face coordinates). */
export function addHole(doc: PlateSpecInput, face: FaceKey, at: Point2, d: NewHoleDefaults, id?: string): { doc: PlateSpecInput; id: string } {
  const newId = id ?? nextId(doc, d.role === 'dowel' ? FACE_PREFIX[face].dowel : FACE_PREFIX[face].hole);
  const hole = { id: newId, x: round6(at.x), y: round6(at.y), ...holeBody(d) } as HoleInput;
  return { doc: updateFace(doc, face, (f) => ({ ...f, holes: [...(f.holes ?? []), hole] })), id: newId };
}

export interface PastedRow {
  readonly id?: string;
  readonly xMm: number;
  readonly yMm: number;
  readonly fastener?: string;
  readonly diameterMm?: number;
}

/** Adds pasted rows; a row's id is kept when free, otherwise the next free id is used. */
export function addPastedRows(doc: PlateSpecInput, face: FaceKey, rows: readonly PastedRow[], d: NewHoleDefaults): { doc: PlateSpecInput; ids: string[] } {
  const taken = usedIds(doc);
  const added: HoleInput[] = [];
  for (const r of rows) {
    const role = d.role === 'dowel' && r.fastener ? 'clearance' : d.role;
    const id = r.id && !taken.has(r.id) ? r.id : nextId(doc, role === 'dowel' ? FACE_PREFIX[face].dowel : FACE_PREFIX[face].hole, taken);
    taken.add(id);
    let body: Partial<HoleInput>;
    if (role === 'dowel') body = { role: 'dowel', dowel: { diameterMm: r.diameterMm ?? d.dowelDiameterMm ?? 10, fit: d.dowelFit ?? 'H7' } };
    else {
      body = { role, fastener: r.fastener ?? d.fastener ?? 'M10x1.5' };
      if (r.diameterMm !== undefined) body.diameterMm = r.diameterMm;
    }
    added.push({ id, x: round6(r.xMm), y: round6(r.yMm), ...body } as HoleInput);
  }
  return { doc: updateFace(doc, face, (f) => ({ ...f, holes: [...(f.holes ?? []), ...added] })), ids: added.map((h) => h.id) };
}

export type BoltCircleRequest = {
  readonly diameterMm: number;
  readonly centerX?: number;
  readonly centerY?: number;
  readonly note?: string;
} & ({ readonly count: number; readonly startAngleDeg: number } | { readonly anglesDeg: readonly number[] });

/**
 * Adds a bolt circle and one hole on each of its slots. Checked with the domain's own
 * `boltCircle` first, so a request it refuses (count 0, non-finite angles) throws its message.
 */
export function addBoltCircle(doc: PlateSpecInput, face: FaceKey, req: BoltCircleRequest, d: NewHoleDefaults, patternId?: string): { doc: PlateSpecInput; patternId: string; ids: string[] } {
  const slots = boltCircle(req as Parameters<typeof boltCircle>[0]).length;
  const taken = usedIds(doc);
  const pid = patternId && !taken.has(patternId) ? patternId : nextId(doc, FACE_PREFIX[face].pattern, taken);
  taken.add(pid);
  const pattern: PatternInput = {
    id: pid,
    diameterMm: req.diameterMm,
    ...('anglesDeg' in req ? { anglesDeg: [...req.anglesDeg] } : { count: req.count, startAngleDeg: req.startAngleDeg }),
    ...(req.centerX ? { centerX: req.centerX } : {}),
    ...(req.centerY ? { centerY: req.centerY } : {}),
    ...(req.note ? { note: req.note } : {}),
  };
  const holes: HoleInput[] = [];
  for (let i = 0; i < slots; i++) {
    const id = nextId(doc, d.role === 'dowel' ? FACE_PREFIX[face].dowel : FACE_PREFIX[face].hole, taken);
    taken.add(id);
    holes.push({ id, patternId: pid, index: i, ...holeBody(d) } as HoleInput);
  }
  return {
    doc: updateFace(doc, face, (f) => ({ ...f, patterns: [...(f.patterns ?? []), pattern], holes: [...(f.holes ?? []), ...holes] })),
    patternId: pid,
    ids: holes.map((h) => h.id),
  };
}

/** The published flywheel-housing bolt circle of a size, tapped holes of its thread. */
export function housingBoltCircle(size: FlywheelHousingSize): { request: BoltCircleRequest; defaults: NewHoleDefaults; boreMm: number } {
  const h = flywheelHousing(size);
  return {
    request: { diameterMm: h.boltCircleDiameterMm, count: h.holeCount, startAngleDeg: h.startAngleDeg, note: `flywheel housing size ${size}` },
    defaults: { role: 'clearance', fastener: h.thread },
    boreMm: h.boreMm,
  };
}

/** Removes a pattern and every hole placed on it. */
export function deletePattern(doc: PlateSpecInput, face: FaceKey, patternId: string): PlateSpecInput {
  return updateFace(doc, face, (f) => ({
    ...f,
    patterns: (f.patterns ?? []).filter((p) => p.id !== patternId),
    holes: (f.holes ?? []).filter((h) => h.patternId !== patternId),
  }));
}

/** Changes a pattern; holes on slots that no longer exist are taken off as coordinates. */
export function patchPattern(doc: PlateSpecInput, face: FaceKey, patternId: string, patch: Partial<PatternInput>): PlateSpecInput {
  return updateFace(doc, face, (f) => {
    const patterns = (f.patterns ?? []).map((p) => {
      if (p.id !== patternId) return p;
      const next: Record<string, unknown> = { ...p };
      for (const [k, v] of Object.entries(patch)) {
        if (v === undefined) delete next[k];
        else next[k] = v;
      }
      return next as PatternInput;
    });
    return { ...f, patterns };
  });
}
