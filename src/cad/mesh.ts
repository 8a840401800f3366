/**
 * Display mesh of a solid as typed arrays (ready to be transferred from a worker): triangle
 * positions, normals and indices, and the B-rep edges as line segments. Display tolerances,
 * not machining ones: 0.05 mm chordal, 0.3 rad angular.
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

export const DISPLAY_TOLERANCE_MM = 0.05;
export const DISPLAY_ANGULAR_TOLERANCE_RAD = 0.3;

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
  opts: { toleranceMm?: number; angularToleranceRad?: number } = {},
): PlateMesh {
  const tol = opts.toleranceMm ?? DISPLAY_TOLERANCE_MM;
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
