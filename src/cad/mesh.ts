/**
 * Display mesh of a solid as typed arrays (ready to be transferred from a worker): triangle
 * positions, normals and indices, and the B-rep edges as line segments — the kernel's own
 * triangulation of the verified solid. Display tolerances, not machining ones:
 *  - angular 0.3 rad: every hole and counterbore wall has at least 21 sides, so holes stay round
 *    at any zoom a shop screen uses;
 *  - chordal relative to the plate: its larger side / 1600 (0.2 mm on a 320 mm plate, about half a
 *    pixel when the whole plate fills a 1000-pixel view), never finer than 0.05 mm nor coarser
 *    than 0.5 mm. Finer chords only add triangles to the large outline arcs, which nobody can see.
 */
import type { OpenCascadeInstance, TopoDS_Shape } from 'replicad-opencascadejs';

export interface PlateMesh {
  /** xyz per vertex */
  readonly positions: Float32Array;
  /** xyz per vertex */
  readonly normals: Float32Array;
  /** three vertex indices per triangle */
  readonly indices: Uint32Array;
  /** xyz xyz per edge segment */
  readonly edges: Float32Array;
  /** (first index, index count, face id) per B-rep face */
  readonly faceGroups: Int32Array;
}

/** the finest chordal deflection used for display (small plates) */
export const DISPLAY_TOLERANCE_MM = 0.05;
export const DISPLAY_TOLERANCE_MAX_MM = 0.5;
/** chordal deflection = larger plate side / this */
export const DISPLAY_TOLERANCE_DIVISOR = 1600;
export const DISPLAY_ANGULAR_TOLERANCE_RAD = 0.3;

/** The larger side of a verified plate's bounding box. */
export function sizeOfBox(b: { minX: number; minY: number; maxX: number; maxY: number }): number {
  return Math.max(b.maxX - b.minX, b.maxY - b.minY);
}

/** The display chordal deflection for a plate whose larger side is `sizeMm`. */
export function displayToleranceMm(sizeMm: number): number {
  if (!(sizeMm > 0)) return DISPLAY_TOLERANCE_MM;
  return Math.min(DISPLAY_TOLERANCE_MAX_MM, Math.max(DISPLAY_TOLERANCE_MM, sizeMm / DISPLAY_TOLERANCE_DIVISOR));
}

/** The larger of the shape's X and Y extents (a quick box from the geometry, no triangulation). */
export function plateSizeMm(oc: OpenCascadeInstance, shape: TopoDS_Shape): number {
  const box = new oc.Bnd_Box();
  try {
    oc.BRepBndLib.Add(shape, box, false);
    return Math.max(box.GetXMax() - box.GetXMin(), box.GetYMax() - box.GetYMin());
  } finally {
    box.delete();
  }
}

function copyOut<T extends Float32Array | Uint32Array | Int32Array>(
  View: { new (b: ArrayBufferLike): T; BYTES_PER_ELEMENT: number },
  buffer: ArrayBufferLike,
  ptr: number,
  size: number,
): T {
  const start = (ptr >>> 0) / View.BYTES_PER_ELEMENT;
  const heap = new View(buffer);
  return heap.slice(start, start + size) as T;
}

export function plateMesh(
  oc: OpenCascadeInstance,
  shape: TopoDS_Shape,
  opts: { toleranceMm?: number; angularToleranceRad?: number; sizeMm?: number } = {},
): PlateMesh {
  const tol = opts.toleranceMm ?? displayToleranceMm(opts.sizeMm ?? plateSizeMm(oc, shape));
  const ang = opts.angularToleranceRad ?? DISPLAY_ANGULAR_TOLERANCE_RAD;
  const raw = oc.ReplicadMeshExtractor.extract(shape, tol, ang, false);
  const buf = oc.wasmMemory.buffer;
  const positions = copyOut(Float32Array, buf, raw.getVerticesPtr(), raw.getVerticesSize());
  const normals = copyOut(Float32Array, buf, raw.getNormalsPtr(), raw.getNormalsSize());
  const indices = copyOut(Uint32Array, buf, raw.getTrianglesPtr(), raw.getTrianglesSize());
  const faceGroups = copyOut(Int32Array, buf, raw.getFaceGroupsPtr(), raw.getFaceGroupsSize());
  raw.delete();
  const rawEdges = oc.ReplicadEdgeMeshExtractor.extract(shape, tol, ang);
  const edges = copyOut(Float32Array, oc.wasmMemory.buffer, rawEdges.getLinesPtr(), rawEdges.getLinesSize());
  rawEdges.delete();
  return { positions, normals, indices, edges, faceGroups };
}

/** A copy with its own buffers (the cached mesh stays usable after the copy is transferred). */
export function cloneMesh(m: PlateMesh): PlateMesh {
  return {
    positions: m.positions.slice(),
    normals: m.normals.slice(),
    indices: m.indices.slice(),
    edges: m.edges.slice(),
    faceGroups: m.faceGroups.slice(),
  };
}

/** The buffers to list as transferables when posting a mesh from a worker. */
export function meshTransferables(m: PlateMesh): ArrayBuffer[] {
  return [m.positions.buffer, m.normals.buffer, m.indices.buffer, m.edges.buffer, m.faceGroups.buffer] as ArrayBuffer[];
}
