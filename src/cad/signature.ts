/**
 * Whether two kernel solids of one profile are the same solid, from what can be read cheaply off
 * each: topology counts and the bounding box. Pure (no kernel import): the page compares a
 * display mesh's solid with the verified one before it shows the mesh.
 */
export interface ShapeSignature {
  readonly faces: number;
  readonly edges: number;
  readonly vertices: number;
  readonly bbox: { readonly minX: number; readonly minY: number; readonly minZ: number; readonly maxX: number; readonly maxY: number; readonly maxZ: number };
}

/** a solid's measured volume must match the drawing's analytic volume to this relative error */
export const VOLUME_REL_TOL = 1e-9;

/** the box may differ by no more than this (mm) */
export const SIGNATURE_BOX_TOLERANCE_MM = 1e-6;

/** Same topology counts and the same box to 1e-6 mm. */
export function sameSignature(a: ShapeSignature, b: ShapeSignature): boolean {
  if (a.faces !== b.faces || a.edges !== b.edges || a.vertices !== b.vertices) return false;
  const keys = ['minX', 'minY', 'minZ', 'maxX', 'maxY', 'maxZ'] as const;
  return keys.every((k) => Math.abs(a.bbox[k] - b.bbox[k]) <= SIGNATURE_BOX_TOLERANCE_MM);
}

/**
 * Volume enclosed by a closed triangle mesh with outward winding (divergence theorem:
 * Σ a · (b × c) / 6 over the triangles).
 */
export function meshVolumeMm3(positions: Float32Array, indices: Uint32Array): number {
  let six = 0;
  for (let t = 0; t < indices.length; t += 3) {
    const a = indices[t]! * 3;
    const b = indices[t + 1]! * 3;
    const c = indices[t + 2]! * 3;
    const ax = positions[a]!, ay = positions[a + 1]!, az = positions[a + 2]!;
    const bx = positions[b]!, by = positions[b + 1]!, bz = positions[b + 2]!;
    const cx = positions[c]!, cy = positions[c + 1]!, cz = positions[c + 2]!;
    six += ax * (by * cz - bz * cy) - ay * (bx * cz - bz * cx) + az * (bx * cy - by * cx);
  }
  return six / 6;
}

/**
 * How far a display mesh's volume may be from its solid's: chords cut every hole and arc
 * (0.3 rad and the display deflection lose at most ≈ 1.5 % of a small hole's area), so a few
 * per cent is what a right mesh can be off; a mesh of another plate or a broken one is further.
 */
export const DISPLAY_VOLUME_TOLERANCE = 0.03;

/** The display mesh encloses the verified solid's volume within DISPLAY_VOLUME_TOLERANCE. */
export function meshMatchesVolume(mesh: { positions: Float32Array; indices: Uint32Array }, volumeMm3: number): boolean {
  if (!(volumeMm3 > 0)) return false;
  return Math.abs(meshVolumeMm3(mesh.positions, mesh.indices) - volumeMm3) / volumeMm3 <= DISPLAY_VOLUME_TOLERANCE;
}
