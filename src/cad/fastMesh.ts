/**
 * Display mesh with the plate faces triangulated from the kernel's own edge discretisation.
 *
 * The kernel's mesher spends most of its time on the two plate faces (planar, one outer wire and
 * a hole per feature: on a 60-hole plate ≈ 2 × 75 ms of ≈ 250 ms). Here every other face is
 * meshed by the kernel as before (one call on a compound of them), and each plate face is
 * triangulated from the boundary its neighbours' triangulations already give it: every triangle
 * edge that lies in the plate face's plane and belongs to one triangle only is a piece of that
 * face's boundary. The pieces are chained into closed loops (exactly two pieces at every point),
 * one per wire of the face, and the loops are cut into triangles (earcut, checked with its own
 * area deviation). Any doubt — a loop that does not close, a count that differs, a deviation —
 * and the whole shape is meshed the usual way instead (`plateMesh`).
 */
import earcut, { deviation } from 'earcut';
import type { OpenCascadeInstance, TopoDS_Face, TopoDS_Shape } from 'replicad-opencascadejs';
import { countSubShapes } from './buildPlate';
import { DISPLAY_ANGULAR_TOLERANCE_RAD, displayToleranceMm, plateMesh, plateSizeMm, type PlateMesh } from './mesh';

/** planar faces with at least this many wires are triangulated here (the plate faces) */
export const FAST_FACE_MIN_WIRES = 4;
const Z_TOLERANCE_MM = 1e-6;
/** earcut's own check: |triangle area − polygon area| / polygon area */
const MAX_DEVIATION = 1e-9;

export interface FastMeshReport {
  /** plate faces triangulated here (0: the kernel meshed everything) */
  readonly facesTriangulatedHere: number;
  /** why the usual mesher was used for the whole shape, if it was */
  readonly fallback: string | null;
}

interface PlateFace {
  readonly face: TopoDS_Face;
  readonly z: number;
  /** +1: outward normal +Z (top), −1: −Z (bottom) */
  readonly up: 1 | -1;
  readonly wires: number;
}

/** Splits the solid's faces: horizontal planar many-wire faces at the bottom or top, and the rest. */
function splitFaces(oc: OpenCascadeInstance, shape: TopoDS_Shape, box: { minZ: number; maxZ: number }): { plate: PlateFace[]; others: TopoDS_Face[] } {
  const plate: PlateFace[] = [];
  const others: TopoDS_Face[] = [];
  const ex = new oc.TopExp_Explorer(shape, oc.TopAbs_ShapeEnum.TopAbs_FACE, oc.TopAbs_ShapeEnum.TopAbs_SHAPE);
  for (; ex.More(); ex.Next()) {
    const cur = ex.Current();
    const face = oc.TopoDS.Face(cur);
    cur.delete();
    const ad = new oc.BRepAdaptor_Surface(face, true);
    let taken = false;
    if (ad.GetType() === oc.GeomAbs_SurfaceType.GeomAbs_Plane) {
      const pln = ad.Plane();
      const dir = pln.Axis().Direction();
      const loc = pln.Location();
      const horizontal = Math.abs(Math.abs(dir.Z()) - 1) < 1e-12;
      const z = loc.Z();
      const wires = countSubShapes(oc, face, 'wire');
      const atBottom = Math.abs(z - box.minZ) < Z_TOLERANCE_MM;
      const atTop = Math.abs(z - box.maxZ) < Z_TOLERANCE_MM;
      if (horizontal && wires >= FAST_FACE_MIN_WIRES && (atBottom || atTop)) {
        plate.push({ face, z, up: atTop ? 1 : -1, wires });
        taken = true;
      }
      dir.delete();
      loc.delete();
      pln.delete();
    }
    ad.delete();
    if (!taken) others.push(face);
  }
  ex.delete();
  return { plate, others };
}

const keyOf = (x: number, y: number) => `${x},${y}`;

/**
 * Closed loops (x, y per point) from boundary pieces: each piece a pair of point indices into
 * `xy`; points are merged by their exact float coordinates. Null when a point has other than two
 * pieces (not a set of closed loops).
 */
export function chainLoops(xy: Float32Array | readonly number[], pieces: readonly (readonly [number, number])[]): number[][] | null {
  const ids = new Map<string, number>();
  const pts: [number, number][] = [];
  const idOf = (i: number) => {
    const x = xy[2 * i]!;
    const y = xy[2 * i + 1]!;
    const k = keyOf(x, y);
    let id = ids.get(k);
    if (id === undefined) {
      id = pts.length;
      ids.set(k, id);
      pts.push([x, y]);
    }
    return id;
  };
  const next: number[][] = [];
  for (const [a, b] of pieces) {
    const ia = idOf(a);
    const ib = idOf(b);
    if (ia === ib) continue;
    (next[ia] ??= []).push(ib);
    (next[ib] ??= []).push(ia);
  }
  const used = new Uint8Array(pts.length);
  const loops: number[][] = [];
  for (let s = 0; s < pts.length; s++) {
    if (used[s]) continue;
    if (next[s]?.length !== 2) return null;
    const loop: number[] = [];
    let prev = -1;
    let cur = s;
    for (;;) {
      const n = next[cur];
      if (n?.length !== 2) return null;
      used[cur] = 1;
      loop.push(pts[cur]![0], pts[cur]![1]);
      const go = n[0] !== prev ? n[0]! : n[1]!;
      prev = cur;
      cur = go;
      if (cur === s) break;
      if (used[cur]) return null;
    }
    loops.push(loop);
  }
  return loops;
}

function loopArea(loop: readonly number[]): number {
  let a = 0;
  for (let i = 0, n = loop.length / 2; i < n; i++) {
    const j = (i + 1) % n;
    a += loop[2 * i]! * loop[2 * j + 1]! - loop[2 * j]! * loop[2 * i + 1]!;
  }
  return a / 2;
}

/**
 * Triangles of a face bounded by `loops` (the largest is the outer one), wound counter-clockwise
 * seen from +Z when `up` is 1, clockwise when −1. Null when earcut's area deviates.
 */
export function triangulateLoops(loops: readonly (readonly number[])[], up: 1 | -1): { xy: number[]; triangles: number[] } | null {
  if (loops.length === 0) return null;
  let outer = 0;
  for (let i = 1; i < loops.length; i++) if (Math.abs(loopArea(loops[i]!)) > Math.abs(loopArea(loops[outer]!))) outer = i;
  const order = [loops[outer]!, ...loops.filter((_, i) => i !== outer)];
  const xy: number[] = [];
  const holes: number[] = [];
  order.forEach((l, i) => {
    if (i > 0) holes.push(xy.length / 2);
    for (const v of l) xy.push(v);
  });
  const tri = earcut(xy, holes, 2);
  if (tri.length === 0 || !(deviation(xy, holes, 2, tri) <= MAX_DEVIATION)) return null;
  for (let t = 0; t < tri.length; t += 3) {
    const a = tri[t]!, b = tri[t + 1]!, c = tri[t + 2]!;
    const cross = (xy[2 * b]! - xy[2 * a]!) * (xy[2 * c + 1]! - xy[2 * a + 1]!) - (xy[2 * b + 1]! - xy[2 * a + 1]!) * (xy[2 * c]! - xy[2 * a]!);
    if (Math.sign(cross) === -up) {
      tri[t + 1] = c;
      tri[t + 2] = b;
    }
  }
  return { xy, triangles: tri };
}

/**
 * The display mesh of a solid (same tolerances as `plateMesh`), its plate faces triangulated
 * here (see the module comment). `report` receives what was done.
 */
export function plateMeshFast(
  oc: OpenCascadeInstance,
  shape: TopoDS_Shape,
  opts: { sizeMm?: number; box?: { minZ: number; maxZ: number }; report?: (r: FastMeshReport) => void } = {},
): PlateMesh {
  const sizeMm = opts.sizeMm ?? plateSizeMm(oc, shape);
  const usual = (why: string) => {
    opts.report?.({ facesTriangulatedHere: 0, fallback: why });
    return plateMesh(oc, shape, { sizeMm });
  };
  let box = opts.box;
  if (!box) {
    const b = new oc.Bnd_Box();
    oc.BRepBndLib.AddOptimal(shape, b, false, false);
    box = { minZ: b.GetZMin(), maxZ: b.GetZMax() };
    b.delete();
  }
  const { plate, others } = splitFaces(oc, shape, box);
  const free = () => {
    plate.forEach((p) => p.face.delete());
    others.forEach((f) => f.delete());
  };
  try {
    if (plate.length === 0) return usual('no many-hole plate face');
    const compound = new oc.TopoDS_Compound();
    const builder = new oc.TopoDS_Builder();
    builder.MakeCompound(compound);
    for (const f of others) builder.Add(compound, f);
    builder.delete();
    // the edges from the compound too: every edge of the solid bounds one of its faces, and the
    // solid itself would have its plate faces meshed first
    let rest: PlateMesh;
    try {
      rest = plateMesh(oc, compound, { toleranceMm: displayToleranceMm(sizeMm), angularToleranceRad: DISPLAY_ANGULAR_TOLERANCE_RAD });
    } finally {
      compound.delete();
    }
    // boundary pieces per plate face: triangle edges in its plane used by one triangle only
    const pos = rest.positions;
    const idx = rest.indices;
    const groups = rest.faceGroups;
    const extra: { xy: number[]; triangles: number[]; z: number; up: 1 | -1 }[] = [];
    for (const p of plate) {
      const onZ = new Uint8Array(pos.length / 3);
      for (let i = 0; i < onZ.length; i++) onZ[i] = Math.abs(pos[3 * i + 2]! - p.z) < 1e-4 ? 1 : 0;
      const pieces: [number, number][] = [];
      for (let g = 0; g < groups.length; g += 3) {
        const first = groups[g]!;
        const n = groups[g + 1]!;
        // edges in the plane, counted per face: used once = on the face's boundary
        const uses = new Map<number, number>();
        for (let t = first; t < first + n; t += 3) {
          for (let e = 0; e < 3; e++) {
            const a = idx[t + e]!;
            const b = idx[t + ((e + 1) % 3)]!;
            if (!onZ[a] || !onZ[b]) continue;
            const k = a < b ? a * 4294967296 + b : b * 4294967296 + a;
            uses.set(k, (uses.get(k) ?? 0) + 1);
          }
        }
        for (const [k, u] of uses) if (u === 1) pieces.push([Math.floor(k / 4294967296), k % 4294967296]);
      }
      if (pieces.length === 0) return usual('a plate face has no meshed neighbours');
      const xy = new Float32Array(pos.length / 3 * 2);
      for (let i = 0; i < pos.length / 3; i++) {
        xy[2 * i] = pos[3 * i]!;
        xy[2 * i + 1] = pos[3 * i + 1]!;
      }
      const loops = chainLoops(xy, pieces);
      if (!loops) return usual('a plate face boundary did not close');
      if (loops.length !== p.wires) return usual(`a plate face has ${p.wires} wires but ${loops.length} boundary loops`);
      const tri = triangulateLoops(loops, p.up);
      if (!tri) return usual('a plate face could not be triangulated within tolerance');
      extra.push({ ...tri, z: pos[3 * pieces[0]![0]! + 2]!, up: p.up });
    }
    // append the plate faces
    const addV = extra.reduce((a, e) => a + e.xy.length / 2, 0);
    const addI = extra.reduce((a, e) => a + e.triangles.length, 0);
    const positions = new Float32Array(pos.length + addV * 3);
    const normals = new Float32Array(pos.length + addV * 3);
    const indices = new Uint32Array(idx.length + addI);
    const faceGroups = new Int32Array(groups.length + extra.length * 3);
    positions.set(pos);
    normals.set(rest.normals);
    indices.set(idx);
    faceGroups.set(groups);
    let v = pos.length / 3;
    let at = idx.length;
    let maxFace = 0;
    for (let g = 2; g < groups.length; g += 3) maxFace = Math.max(maxFace, groups[g]!);
    extra.forEach((e, k) => {
      const base = v;
      for (let i = 0; i < e.xy.length / 2; i++, v++) {
        positions[3 * v] = e.xy[2 * i]!;
        positions[3 * v + 1] = e.xy[2 * i + 1]!;
        positions[3 * v + 2] = e.z;
        normals[3 * v + 2] = e.up;
      }
      faceGroups[groups.length + 3 * k] = at;
      faceGroups[groups.length + 3 * k + 1] = e.triangles.length;
      faceGroups[groups.length + 3 * k + 2] = maxFace + 1 + k;
      for (const t of e.triangles) indices[at++] = base + t;
    });
    opts.report?.({ facesTriangulatedHere: extra.length, fallback: null });
    return { positions, normals, indices, edges: rest.edges, faceGroups };
  } finally {
    free();
  }
}
