/**
 * Editing a user polygon outline: the vertex table (X, Y, corner radius per corner), adding,
 * deleting and reordering corners, pasting X, Y[, R] rows, and the problems of a polygon in
 * words a builder can act on (naming the corner), without throwing. Pure: shared by the editor,
 * its tests and the server.
 */
import { isDomainError } from '../errors';
import { polygonOutline } from '../outline';
import type { BoundingBox, Point2 } from '../profileTypes';
import type { PlateSpecInput } from '../spec';
import { parseLength, type LengthUnit } from '../units';

/** One corner of the polygon: plate coordinates, and its own corner radius (null = the common one). */
export interface OutlineVertex {
  readonly xMm: number;
  readonly yMm: number;
  readonly radiusMm: number | null;
}

export interface PolygonInput {
  readonly vertices: readonly OutlineVertex[];
  /** radius of every corner without its own */
  readonly cornerRadiusMm: number;
}

type OutlineInput = NonNullable<PlateSpecInput['outline']>;

/** The vertex table of the document's outline, or null when the outline is automatic. */
export function polygonOf(doc: PlateSpecInput): PolygonInput | null {
  const o = doc.outline as OutlineInput | undefined;
  if (!o || o.kind !== 'polygon') return null;
  const radii = o.cornerRadiiMm ?? [];
  return {
    vertices: (o.points ?? []).map((p, i) => ({ xMm: p.x, yMm: p.y, radiusMm: radii[i] ?? null })),
    cornerRadiusMm: o.cornerRadiusMm ?? 0,
  };
}

/** The document with this polygon as its outline (per-corner radii only when some corner has one). */
export function withPolygon(doc: PlateSpecInput, poly: PolygonInput): PlateSpecInput {
  const own = poly.vertices.some((v) => v.radiusMm !== null);
  const outline: OutlineInput = {
    kind: 'polygon',
    points: poly.vertices.map((v) => ({ x: v.xMm, y: v.yMm })),
    cornerRadiusMm: poly.cornerRadiusMm,
    ...(own ? { cornerRadiiMm: poly.vertices.map((v) => v.radiusMm) } : {}),
  };
  return { ...doc, outline };
}

/**
 * A starting polygon: the rectangle round a bounding box (e.g. the current automatic outline's),
 * widened to whole millimetres, corners counter-clockwise from the lower left, every corner with
 * the common radius.
 */
export function rectangleAround(b: BoundingBox, cornerRadiusMm: number): PolygonInput {
  // a hair of float noise (1e-6 mm) is not a millimetre more
  const lo = (v: number) => Math.floor(v + 1e-6);
  const hi = (v: number) => Math.ceil(v - 1e-6);
  return {
    cornerRadiusMm,
    vertices: [
      { xMm: lo(b.minX), yMm: lo(b.minY), radiusMm: null },
      { xMm: hi(b.maxX), yMm: lo(b.minY), radiusMm: null },
      { xMm: hi(b.maxX), yMm: hi(b.maxY), radiusMm: null },
      { xMm: lo(b.minX), yMm: hi(b.maxY), radiusMm: null },
    ],
  };
}

/** A new corner in the middle of the edge from corner `index` to the next one. */
export function insertVertexAfter(vs: readonly OutlineVertex[], index: number): OutlineVertex[] {
  if (vs.length === 0) return [{ xMm: 0, yMm: 0, radiusMm: null }];
  const a = vs[index]!;
  const b = vs[(index + 1) % vs.length]!;
  const mid = { xMm: (a.xMm + b.xMm) / 2, yMm: (a.yMm + b.yMm) / 2, radiusMm: null };
  return [...vs.slice(0, index + 1), mid, ...vs.slice(index + 1)];
}

export function removeVertex(vs: readonly OutlineVertex[], index: number): OutlineVertex[] {
  return vs.filter((_, i) => i !== index);
}

/** Corner `index` swapped with its neighbour before (delta −1) or after (+1); ends stay put. */
export function moveVertex(vs: readonly OutlineVertex[], index: number, delta: -1 | 1): OutlineVertex[] {
  const j = index + delta;
  if (j < 0 || j >= vs.length) return [...vs];
  const out = [...vs];
  [out[index], out[j]] = [out[j]!, out[index]!];
  return out;
}

export function patchVertex(vs: readonly OutlineVertex[], index: number, patch: Partial<OutlineVertex>): OutlineVertex[] {
  return vs.map((v, i) => (i === index ? { ...v, ...patch } : v));
}

// ---------------------------------------------------------------------------------------------
// Paste

export interface VertexPasteResult {
  readonly vertices: readonly OutlineVertex[];
  readonly problems: readonly { readonly line: number; readonly message: string }[];
}

function readCell(text: string, unit: LengthUnit): number | null {
  try {
    return parseLength(text, unit);
  } catch (e) {
    if (isDomainError(e)) return null;
    throw e;
  }
}

/**
 * Rows of X, Y and an optional corner radius, tab-, semicolon-, comma- or space-separated, as
 * copied from a spreadsheet; a first row that does not read as numbers is a header (it may give
 * the unit: `X (in)`). A cell without a unit is in `unit`. Lines that do not read are reported
 * by number and left out.
 */
export function parseVertexRows(text: string, unit: LengthUnit): VertexPasteResult {
  const lines = text.replace(/\r\n?/g, '\n').split('\n');
  const sep = lines.some((l) => l.includes('\t')) ? /\t/ : lines.some((l) => l.includes(';')) ? /;/ : lines.some((l) => l.includes(',')) ? /,/ : /\s+/;
  const vertices: OutlineVertex[] = [];
  const problems: { line: number; message: string }[] = [];
  let rowUnit = unit;
  let first = true;
  lines.forEach((raw, i) => {
    const line = raw.trim();
    if (line === '') return;
    const cells = line.split(sep).map((c) => c.trim());
    const nums = cells.map((c) => (c === '' ? null : readCell(c, rowUnit)));
    if (first) {
      first = false;
      if (nums.slice(0, 2).some((n) => n === null) && /[a-z]/i.test(line)) {
        if (/\b(in|inch|")/i.test(line)) rowUnit = 'in';
        else if (/\bmm\b/i.test(line)) rowUnit = 'mm';
        return; // header row
      }
    }
    if (cells.length < 2 || cells.length > 3) {
      problems.push({ line: i + 1, message: `line ${i + 1}: expected X, Y and an optional corner radius, found ${cells.length} value${cells.length === 1 ? '' : 's'}` });
      return;
    }
    const [x, y, r] = nums;
    if (x === null || x === undefined || y === null || y === undefined) {
      problems.push({ line: i + 1, message: `line ${i + 1}: "${line}" — X and Y must be lengths (12.7, 0.5in, 1/2")` });
      return;
    }
    if (cells[2] !== undefined && cells[2] !== '' && (r === null || r === undefined || r < 0)) {
      problems.push({ line: i + 1, message: `line ${i + 1}: the corner radius "${cells[2]}" must be a length of 0 or more` });
      return;
    }
    vertices.push({ xMm: x, yMm: y, radiusMm: r ?? null });
  });
  return { vertices, problems };
}

// ---------------------------------------------------------------------------------------------
// Problems

export interface PolygonProblem {
  readonly message: string;
  /** 0-based corner the problem is at, when there is one */
  readonly vertex: number | null;
}

/**
 * What stops this polygon from being an outline, in words that name the corner: fewer than 3
 * corners, corners on top of each other, crossing edges, no area, a radius too large for its
 * corner. Empty when the outline can be made. Holes outside the outline are check findings
 * (`checkPlate`), not listed here.
 */
export function polygonProblems(poly: PolygonInput): PolygonProblem[] {
  const vs = poly.vertices;
  if (vs.length < 3) {
    return [{ message: `An outline needs at least 3 corners; it has ${vs.length}. Add ${3 - vs.length} more.`, vertex: null }];
  }
  const bad = vs.findIndex((v) => !Number.isFinite(v.xMm) || !Number.isFinite(v.yMm));
  if (bad >= 0) return [{ message: `Corner ${bad + 1} has no position.`, vertex: bad }];
  try {
    polygonOutline(
      vs.map((v) => ({ x: v.xMm, y: v.yMm })),
      poly.cornerRadiusMm,
      vs.some((v) => v.radiusMm !== null) ? vs.map((v) => v.radiusMm) : undefined,
    );
    return [];
  } catch (e) {
    if (!isDomainError(e)) throw e;
    const path = e.path ?? [];
    const at = typeof path[2] === 'number' ? path[2] : null;
    if (e.code === 'outline.polygon' && /same point/.test(e.message) && at !== null) {
      const next = (at + 1) % vs.length;
      return [{ message: `Corners ${at + 1} and ${next + 1} are at the same place; delete one or move it.`, vertex: next }];
    }
    if (e.code === 'outline.cornerRadius' && at === null && /too large/.test(e.message)) {
      return [{ message: `The common corner radius is too large: ${e.message.replace(/^outline\.cornerRadiusMm [^:]*: /, '')}`, vertex: null }];
    }
    const crossing = /edge from corner (\d+)/.exec(e.message);
    return [{ message: e.message, vertex: at ?? (crossing ? Number(crossing[1]) - 1 : null) }];
  }
}

/** Plate coordinates of the corners (for drawing the handles). */
export function vertexPoints(poly: PolygonInput): Point2[] {
  return poly.vertices.map((v) => ({ x: v.xMm, y: v.yMm }));
}
