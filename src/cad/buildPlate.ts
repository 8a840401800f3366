/**
 * buildPlate(oc, profile) → a verified solid. Pure with respect to the profile: the same profile
 * gives the same solid; nothing is read from outside, nothing is kept except by the cache below.
 *
 * Strategies
 *  - direct B-rep (primary, when the 2D layout is disjoint): the chamfered side wall is two ruled
 *    bands (inset outline at a plate face to the full outline) and a prism between them; every
 *    round feature's wall is a cylindrical face, every pocket wall a prism of its outline; the two
 *    plate faces are planar faces with the openings as inner wires; counterbore steps, blind-hole
 *    and pocket floors are planar faces (through holes in a pocket open into its floor). Every face
 *    is made once with its normal out of the material, neighbours share their edges, and the faces
 *    go straight into one shell and a solid: no sewing, no boolean.
 *  - one-face fallback: the outline face with every plain through hole as an inner wire is
 *    extruded once (or, with an edge chamfer, the ruled blank is made), then ONE cut removes all
 *    other features, each given as a separate tool (never a compound of overlapping solids).
 *
 * Every result is verified before anyone sees it: a valid solid, its volume equal to the 2D
 * analytic volume (relative error < 1e-9) and one cylindrical face per round feature.
 */
import type { OpenCascadeInstance, TopoDS_Edge, TopoDS_Face, TopoDS_Shape, TopoDS_Wire } from 'replicad-opencascadejs';
import type { OutlineSegment, PlateProfile } from '../domain/profileTypes';
import { arcSweepRad, pointInChain } from '../domain/exports/outlineMath';
import { layoutIsDisjoint } from '../domain/layout';
import { canonicalJson } from '../domain/canonicalJson';
import { analyticVolumeMm3 } from './analyticVolume';
import { describeKernelFailure, fatalKernelError, PlateBuildError } from './errors';
import { offsetOutlineInward } from './offsetOutline';
import { VOLUME_REL_TOL, type ShapeSignature } from './signature';
import { analyseLayout, type CircleColumn, type PocketColumn, type VoidColumn } from './plateModel';

export type BuildStrategy = 'direct' | 'oneFace';

export interface PlateVerification {
  readonly valid: boolean;
  readonly volumeMm3: number;
  readonly analyticVolumeMm3: number;
  readonly volumeRelErr: number;
  readonly cylindricalFaces: number;
  readonly expectedCylindricalFaces: number;
  readonly bbox: { minX: number; minY: number; minZ: number; maxX: number; maxY: number; maxZ: number };
}

export interface BuiltPlate {
  /** the solid (owned by the caller: call dispose() when done) */
  readonly shape: TopoDS_Shape;
  readonly strategy: BuildStrategy;
  readonly verification: PlateVerification;
  /** strategies tried before this one and why they were rejected */
  readonly rejected: readonly string[];
  /**
   * built with `deferVolume`: valid and with the right faces, its volume not yet measured
   * (volumeMm3 and volumeRelErr are NaN). Never export or show it alone: `completeVolume` first,
   * or compare a twin's measured volume (the display path).
   */
  readonly volumePending: boolean;
  dispose(): void;
}

export interface BuildOptions {
  /** force a strategy (tests and benchmarks); default: direct when the layout allows, else one-face */
  readonly strategy?: BuildStrategy;
  /** the domain's verdict on the layout (default: layoutIsDisjoint(profile)); when false the direct B-rep is not tried */
  readonly layoutIsDisjoint?: boolean;
  /** skip BRepCheck (benchmarks of the raw build only); verification of volume and faces stays */
  readonly skipValidityCheck?: boolean;
  /**
   * leave the volume out of this build's verification (the 3D view's path, where the twin solid
   * made beside it for the mesh has its volume measured); the result is `volumePending`
   */
  readonly deferVolume?: boolean;
  /** receives the duration of each build stage (benchmarks) */
  readonly onStage?: (stage: string, ms: number) => void;
}

type Deletable = { delete(): void };

/** Collects kernel objects made during a build and frees them together. */
class Scope {
  private readonly items: Deletable[] = [];
  own<T extends Deletable>(o: T): T {
    this.items.push(o);
    return o;
  }
  /** take an object out of the scope (it outlives the build) */
  release<T extends Deletable>(o: T): T {
    const i = this.items.lastIndexOf(o);
    if (i >= 0) this.items.splice(i, 1);
    return o;
  }
  free(): void {
    for (let i = this.items.length - 1; i >= 0; i--) {
      try {
        this.items[i]!.delete();
      } catch {
        /* already gone */
      }
    }
    this.items.length = 0;
  }
}

/** A small geometry toolkit over the raw kernel, every object registered in the scope. */
class Kit {
  /** the feature being made, for error messages ('outline' for the blank) */
  feature: string | null = null;
  constructor(
    readonly oc: OpenCascadeInstance,
    readonly s: Scope,
  ) {}

  pnt(x: number, y: number, z: number) {
    return this.s.own(new this.oc.gp_Pnt(x, y, z));
  }
  private up: InstanceType<OpenCascadeInstance['gp_Dir']> | null = null;
  private down: InstanceType<OpenCascadeInstance['gp_Dir']> | null = null;
  dirZ(up: boolean) {
    if (up) return (this.up ??= this.s.own(new this.oc.gp_Dir(0, 0, 1)));
    return (this.down ??= this.s.own(new this.oc.gp_Dir(0, 0, -1)));
  }
  ax2(x: number, y: number, z: number, up: boolean) {
    return this.s.own(new this.oc.gp_Ax2(this.pnt(x, y, z), this.dirZ(up)));
  }

  segmentEdge(seg: OutlineSegment, z: number): TopoDS_Edge {
    const oc = this.oc;
    if (seg.kind === 'line') {
      const mk = this.s.own(new oc.BRepBuilderAPI_MakeEdge(this.pnt(seg.start.x, seg.start.y, z), this.pnt(seg.end.x, seg.end.y, z)));
      return this.s.own(mk.Edge());
    }
    const circ = this.s.own(new oc.gp_Circ(this.ax2(seg.center.x, seg.center.y, z, seg.ccw), seg.radiusMm));
    if (Math.abs(Math.abs(arcSweepRad(seg)) - 2 * Math.PI) < 1e-9) {
      return this.s.own(this.s.own(new oc.BRepBuilderAPI_MakeEdge(circ)).Edge());
    }
    const mk = this.s.own(
      new oc.BRepBuilderAPI_MakeEdge(circ, this.pnt(seg.start.x, seg.start.y, z), this.pnt(seg.end.x, seg.end.y, z)),
    );
    return this.s.own(mk.Edge());
  }

  chainWire(chain: readonly OutlineSegment[], z: number): TopoDS_Wire {
    const mk = this.s.own(new this.oc.BRepBuilderAPI_MakeWire());
    for (const seg of chain) mk.Add(this.segmentEdge(seg, z));
    if (!mk.IsDone()) throw new Error('outline wire could not be closed');
    return this.s.own(mk.Wire());
  }

  /** full circle wire; ccw=true runs counter-clockwise seen from +Z */
  circleWire(x: number, y: number, r: number, z: number, ccw: boolean): TopoDS_Wire {
    const circ = this.s.own(new this.oc.gp_Circ(this.ax2(x, y, z, ccw), r));
    const e = this.s.own(this.s.own(new this.oc.BRepBuilderAPI_MakeEdge(circ)).Edge());
    return this.s.own(this.s.own(new this.oc.BRepBuilderAPI_MakeWire(e)).Wire());
  }

  /** planar face at height z, normal +Z, outer wire ccw, inner wires cw */
  planarFace(z: number, outer: TopoDS_Wire, inner: readonly TopoDS_Wire[]): TopoDS_Face {
    const oc = this.oc;
    const pln = this.s.own(new oc.gp_Pln(this.pnt(0, 0, z), this.dirZ(true)));
    const mk = this.s.own(new oc.BRepBuilderAPI_MakeFace(pln, outer, true));
    for (const w of inner) mk.Add(w);
    if (!mk.IsDone()) throw new Error(`planar face at z=${z} failed`);
    return this.s.own(mk.Face());
  }

  cylinderFace(x: number, y: number, r: number, z0: number, z1: number): TopoDS_Face {
    const oc = this.oc;
    const ax3 = this.s.own(new oc.gp_Ax3(this.pnt(x, y, z0), this.dirZ(true)));
    const cyl = this.s.own(new oc.gp_Cylinder(ax3, r));
    const mk = this.s.own(new oc.BRepBuilderAPI_MakeFace(cyl, 0, 2 * Math.PI, 0, z1 - z0));
    if (!mk.IsDone()) throw new Error('cylindrical face failed');
    return this.s.own(mk.Face());
  }

  prism(shape: TopoDS_Shape, dz: number): TopoDS_Shape {
    const vec = this.s.own(new this.oc.gp_Vec(0, 0, dz));
    const mk = this.s.own(new this.oc.BRepPrimAPI_MakePrism(shape, vec, false, true));
    return this.s.own(mk.Shape());
  }

  list(shapes: readonly TopoDS_Shape[]) {
    const l = this.s.own(new this.oc.NCollection_List_TopoDS_Shape());
    for (const sh of shapes) l.Append(sh);
    return l;
  }
}

function reversedChain(chain: readonly OutlineSegment[]): OutlineSegment[] {
  const out: OutlineSegment[] = [];
  for (let i = chain.length - 1; i >= 0; i--) {
    const s = chain[i]!;
    out.push(s.kind === 'line' ? { kind: 'line', start: s.end, end: s.start } : { ...s, start: s.end, end: s.start, ccw: !s.ccw });
  }
  return out;
}

/** The side wall: ruled through the outline wires (chamfered) or a prism of the outline. */
function sideWall(k: Kit, profile: PlateProfile, asSolid: boolean): { shape: TopoDS_Shape; bottom: TopoDS_Wire; top: TopoDS_Wire } {
  const t = profile.thicknessMm;
  const c = profile.edgeChamferMm;
  const oc = k.oc;
  if (c > 0) {
    const inset = offsetOutlineInward(profile.outline, c);
    const w0 = k.chainWire(inset, 0);
    const w1 = k.chainWire(profile.outline, c);
    const w2 = k.chainWire(profile.outline, t - c);
    const w3 = k.chainWire(inset, t);
    const loft = k.s.own(new oc.BRepOffsetAPI_ThruSections(asSolid, true, 1e-6));
    loft.AddWire(w0);
    loft.AddWire(w1);
    loft.AddWire(w2);
    loft.AddWire(w3);
    loft.CheckCompatibility(false);
    loft.Build();
    if (!loft.IsDone()) throw new Error('ruled side wall failed');
    return { shape: k.s.own(loft.Shape()), bottom: w0, top: w3 };
  }
  const w0 = k.chainWire(profile.outline, 0);
  const w1 = k.chainWire(profile.outline, t);
  if (asSolid) {
    const face = k.planarFace(0, w0, []);
    return { shape: k.prism(face, t), bottom: w0, top: w1 };
  }
  return { shape: k.prism(w0, t), bottom: w0, top: w1 };
}

interface Stack {
  readonly id: string;
  readonly cols: CircleColumn[];
}

function stacksOf(columns: readonly VoidColumn[]): { stacks: Stack[]; pockets: PocketColumn[] } {
  const byId = new Map<string, CircleColumn[]>();
  const pockets: PocketColumn[] = [];
  for (const col of columns) {
    if (col.shape === 'chain') {
      pockets.push(col);
      continue;
    }
    const list = byId.get(col.featureId) ?? [];
    list.push(col);
    byId.set(col.featureId, list);
  }
  const stacks: Stack[] = [];
  for (const [id, cols] of byId) stacks.push({ id, cols: cols.sort((a, b) => a.z0 - b.z0) });
  return { stacks, pockets };
}

const Z_EPS = 1e-9;

type Stage = (name: string) => void;

function stageTimer(cb?: (stage: string, ms: number) => void): Stage {
  if (!cb) return () => {};
  let t = performance.now();
  return (name) => {
    const now = performance.now();
    cb(name, now - t);
    t = now;
  };
}

function childShapes(k: Kit, shape: TopoDS_Shape, type: 'face' | 'edge' | 'wire'): TopoDS_Shape[] {
  const oc = k.oc;
  const e = oc.TopAbs_ShapeEnum;
  const what = type === 'face' ? e.TopAbs_FACE : type === 'edge' ? e.TopAbs_EDGE : e.TopAbs_WIRE;
  const out: TopoDS_Shape[] = [];
  const ex = k.s.own(new oc.TopExp_Explorer(shape, what, e.TopAbs_SHAPE));
  for (; ex.More(); ex.Next()) out.push(k.s.own(ex.Current()));
  return out;
}

function facesOf(k: Kit, shape: TopoDS_Shape): TopoDS_Face[] {
  return childShapes(k, shape, 'face').map((f) => k.s.own(k.oc.TopoDS.Face(f)));
}

function reversedWire(k: Kit, w: TopoDS_Wire): TopoDS_Wire {
  return k.s.own(k.oc.TopoDS.Wire(k.s.own(w.Reversed())));
}

function reversedFace(k: Kit, f: TopoDS_Face): TopoDS_Face {
  return k.s.own(k.oc.TopoDS.Face(k.s.own(f.Reversed())));
}

/** Point and normal (as oriented) at the middle of a face's parameter range. */
function midNormal(k: Kit, f: TopoDS_Face): { p: [number, number, number]; n: [number, number, number] } {
  const oc = k.oc;
  const g = k.s.own(new oc.BRepGProp_Face(f, false));
  const b = g.Bounds(0, 0, 0, 0);
  const P = k.pnt(0, 0, 0);
  const N = k.s.own(new oc.gp_Vec(0, 0, 1));
  g.Normal((b.U1 + b.U2) / 2, (b.V1 + b.V2) / 2, P, N);
  const l = N.Magnitude();
  return { p: [P.X(), P.Y(), P.Z()], n: [N.X() / l, N.Y() / l, N.Z() / l] };
}

/**
 * Faces of a swept band, turned so that their normals point out of the material. All faces of
 * one sweep share one orientation, so one probe decides for the band.
 */
function orientBand(k: Kit, faces: TopoDS_Face[], outward: (p: [number, number, number], n: [number, number, number]) => boolean): TopoDS_Face[] {
  if (faces.length === 0) return faces;
  const probe = midNormal(k, faces[0]!);
  return outward(probe.p, probe.n) ? faces : faces.map((f) => reversedFace(k, f));
}

/**
 * A planar face whose outward normal is +Z (up) or −Z, bounded by the given wires, which are
 * already oriented for that normal (outer counter-clockwise around it, inner clockwise).
 */
function orientedPlanarFace(k: Kit, z: number, up: boolean, outer: TopoDS_Wire, inner: readonly TopoDS_Wire[]): TopoDS_Face {
  const oc = k.oc;
  const pln = k.s.own(new oc.gp_Pln(k.pnt(0, 0, z), k.dirZ(up)));
  const mk = k.s.own(new oc.BRepBuilderAPI_MakeFace(pln, outer, false));
  for (const w of inner) mk.Add(w);
  if (!mk.IsDone()) throw new Error(`planar face at z=${z} failed`);
  return k.s.own(mk.Face());
}

/** The outer side of the plate as outward faces, plus the outer wires of the two plate faces (oriented for them). */
function directSideWall(k: Kit, profile: PlateProfile, stage: Stage = () => {}): { faces: TopoDS_Face[]; bottomOuter: TopoDS_Wire; topOuter: TopoDS_Wire } {
  const oc = k.oc;
  const t = profile.thicknessMm;
  const c = profile.edgeChamferMm;
  const eps = 0.25;
  const outwardXY = (p: [number, number, number], n: [number, number, number]) =>
    !pointInChain(profile.outline, { x: p[0] + n[0] * eps, y: p[1] + n[1] * eps });
  const faces: TopoDS_Face[] = [];
  const wallFrom = (w: TopoDS_Wire, h: number) => {
    const vec = k.s.own(new oc.gp_Vec(0, 0, h));
    const mk = k.s.own(new oc.BRepPrimAPI_MakePrism(w, vec, false, true));
    const shape = k.s.own(mk.Shape());
    faces.push(...orientBand(k, facesOf(k, shape), outwardXY));
    return k.s.own(oc.TopoDS.Wire(k.s.own(mk.LastShape())));
  };
  const ruled = (a: TopoDS_Wire, b: TopoDS_Wire, down: boolean) => {
    const loft = k.s.own(new oc.BRepOffsetAPI_ThruSections(false, true, 1e-6));
    loft.AddWire(a);
    loft.AddWire(b);
    loft.CheckCompatibility(false);
    loft.Build();
    if (!loft.IsDone()) throw new Error('the edge chamfer could not be made');
    const shape = k.s.own(loft.Shape());
    faces.push(...orientBand(k, facesOf(k, shape), (_p, n) => (down ? n[2] < 0 : n[2] > 0)));
  };
  if (c > 0) {
    const inset = offsetOutlineInward(profile.outline, c);
    const w0 = k.chainWire(inset, 0);
    const w1 = k.chainWire(profile.outline, c);
    const w3 = k.chainWire(inset, t);
    stage('side.wires');
    ruled(w0, w1, true);
    stage('side.ruled1');
    const w2 = wallFrom(w1, t - 2 * c);
    stage('side.wall');
    ruled(w2, w3, false);
    stage('side.ruled2');
    return { faces, bottomOuter: reversedWire(k, w0), topOuter: w3 };
  }
  const w0 = k.chainWire(profile.outline, 0);
  const w3 = wallFrom(w0, t);
  return { faces, bottomOuter: reversedWire(k, w0), topOuter: w3 };
}

/**
 * Direct B-rep: every face made once, neighbours sharing their edges, no sewing and no boolean.
 * Every face is oriented with its normal out of the material and bounded counter-clockwise
 * around that normal (holes clockwise), so each shared edge is used in opposite directions by
 * its two faces and the faces close into one valid shell.
 */
function buildDirect(k: Kit, profile: PlateProfile, columns: readonly VoidColumn[], stage: Stage): TopoDS_Shape {
  const oc = k.oc;
  const t = profile.thicknessMm;
  k.feature = 'outline';
  const side = directSideWall(k, profile, stage);

  const faces: TopoDS_Face[] = [...side.faces];
  const bottomInner: TopoDS_Wire[] = [];
  const topInner: TopoDS_Wire[] = [];
  const floorInner = new Map<string, TopoDS_Wire[]>();
  const intoFloor = (pocketId: string, w: TopoDS_Wire) => {
    const list = floorInner.get(pocketId) ?? [];
    list.push(w);
    floorInner.set(pocketId, list);
  };
  const { stacks, pockets } = stacksOf(columns);
  const tb = k.s.own(new oc.TopoDS_Builder());
  /** a wire of one closed edge, assembled directly (the edge keeps its orientation) */
  const rimWire = (e: TopoDS_Shape): TopoDS_Wire => {
    const w = k.s.own(new oc.TopoDS_Wire());
    tb.MakeWire(w);
    tb.Add(w, e);
    w.Closed(true);
    return w;
  };

  for (const st of stacks) {
    k.feature = st.id;
    // each column's wall: a cylinder face; its boundary runs bottom circle (counter-clockwise
    // seen from +Z), seam, top circle (clockwise), seam — the orientations every neighbour needs
    const rims: { bottom: TopoDS_Wire; top: TopoDS_Wire }[] = [];
    for (const col of st.cols) {
      const wallFace = k.cylinderFace(col.center.x, col.center.y, col.radiusMm, col.z0, col.z1);
      // the face's wire runs: seam, bottom circle, seam, top circle (BRepLib_MakeFace order)
      const edges = childShapes(k, wallFace, 'edge');
      if (edges.length !== 4) throw new Error(`the wall of ${st.id} could not be made`);
      rims.push({ bottom: rimWire(edges[1]!), top: rimWire(edges[3]!) });
      faces.push(reversedFace(k, wallFace));
    }
    for (let i = 0; i < st.cols.length; i++) {
      const col = st.cols[i]!;
      const rim = rims[i]!;
      if (i === 0) {
        if (col.bottomPocket) intoFloor(col.bottomPocket, rim.bottom);
        else if (col.z0 <= Z_EPS) bottomInner.push(rim.bottom);
        else faces.push(orientedPlanarFace(k, col.z0, true, rim.bottom, []));
      } else {
        const below = st.cols[i - 1]!;
        const lowerWide = below.radiusMm > col.radiusMm;
        faces.push(
          lowerWide
            ? orientedPlanarFace(k, col.z0, false, rims[i - 1]!.top, [rim.bottom])
            : orientedPlanarFace(k, col.z0, true, rim.bottom, [rims[i - 1]!.top]),
        );
      }
      if (i === st.cols.length - 1) {
        if (col.topPocket) intoFloor(col.topPocket, rim.top);
        else if (col.z1 >= t - Z_EPS) topInner.push(rim.top);
        else faces.push(orientedPlanarFace(k, col.z1, false, rim.top, []));
      }
    }
  }
  stage('columns');
  for (const p of pockets) {
    k.feature = p.featureId;
    const w0 = k.chainWire(p.outline, p.z0);
    const vec = k.s.own(new oc.gp_Vec(0, 0, p.z1 - p.z0));
    const mk = k.s.own(new oc.BRepPrimAPI_MakePrism(w0, vec, false, true));
    const eps = 0.25;
    const walls = orientBand(k, facesOf(k, k.s.own(mk.Shape())), (q, n) => pointInChain(p.outline, { x: q[0] + n[0] * eps, y: q[1] + n[1] * eps }));
    faces.push(...walls);
    const w1 = k.s.own(oc.TopoDS.Wire(k.s.own(mk.LastShape())));
    const holesInFloor = floorInner.get(p.featureId) ?? [];
    if (p.z0 <= Z_EPS) {
      bottomInner.push(w0);
      faces.push(orientedPlanarFace(k, p.z1, false, reversedWire(k, w1), holesInFloor));
    } else {
      topInner.push(reversedWire(k, w1));
      faces.push(orientedPlanarFace(k, p.z0, true, w0, holesInFloor));
    }
  }
  stage('pockets');
  k.feature = null;
  faces.push(orientedPlanarFace(k, 0, false, side.bottomOuter, bottomInner));
  faces.push(orientedPlanarFace(k, t, true, side.topOuter, topInner));
  stage('plateFaces');

  const builder = k.s.own(new oc.TopoDS_Builder());
  const shell = k.s.own(new oc.TopoDS_Shell());
  builder.MakeShell(shell);
  for (const f of faces) builder.Add(shell, f);
  shell.Closed(true);
  const solid = k.s.own(new oc.TopoDS_Solid());
  builder.MakeSolid(solid);
  builder.Add(solid, shell);
  stage('solid');
  return solid;
}

function buildOneFace(k: Kit, profile: PlateProfile, columns: readonly VoidColumn[]): TopoDS_Shape {
  const oc = k.oc;
  const t = profile.thicknessMm;
  const c = profile.edgeChamferMm;
  const tools: TopoDS_Shape[] = [];
  let blank: TopoDS_Shape;
  const isPlain = (col: VoidColumn): col is CircleColumn => col.shape === 'circle' && col.z0 <= Z_EPS && col.z1 >= t - Z_EPS;
  if (c === 0) {
    const inner = columns.filter(isPlain).map((col) => k.circleWire(col.center.x, col.center.y, col.radiusMm, 0, false));
    const face = k.planarFace(0, k.chainWire(profile.outline, 0), inner);
    blank = k.prism(face, t);
  } else {
    blank = sideWall(k, profile, true).shape;
  }
  const over = 1; // tools reach 1 mm past a plate face they open onto
  for (const col of columns) {
    if (c === 0 && isPlain(col)) continue;
    k.feature = col.featureId;
    const z0 = col.z0 <= Z_EPS ? -over : col.z0;
    const z1 = col.z1 >= t - Z_EPS ? t + over : col.z1;
    if (col.shape === 'circle') {
      const mk = k.s.own(new oc.BRepPrimAPI_MakeCylinder(k.ax2(col.center.x, col.center.y, z0, true), col.radiusMm, z1 - z0));
      tools.push(k.s.own(mk.Shape()));
    } else {
      const face = k.planarFace(z0, k.chainWire(col.outline, z0), []);
      tools.push(k.prism(face, z1 - z0));
    }
  }
  k.feature = null;
  if (tools.length === 0) return blank;
  const cut = k.s.own(new oc.BRepAlgoAPI_Cut());
  cut.SetArguments(k.list([blank]));
  cut.SetTools(k.list(tools));
  cut.Build(k.s.own(new oc.Message_ProgressRange()));
  if (!cut.IsDone() || cut.HasErrors()) {
    cut.Clear();
    throw new Error('the boolean cut of the features failed');
  }
  const result = k.s.own(cut.Shape());
  cut.Clear();
  return result;
}

function countCylindricalFaces(oc: OpenCascadeInstance, s: Scope, shape: TopoDS_Shape): number {
  let n = 0;
  const ex = s.own(new oc.TopExp_Explorer(shape, oc.TopAbs_ShapeEnum.TopAbs_FACE, oc.TopAbs_ShapeEnum.TopAbs_SHAPE));
  for (; ex.More(); ex.Next()) {
    // every shape handed out by the kernel holds the solid alive until deleted
    const cur = ex.Current();
    const f = oc.TopoDS.Face(cur);
    const ad = new oc.BRepAdaptor_Surface(f, true);
    if (ad.GetType() === oc.GeomAbs_SurfaceType.GeomAbs_Cylinder) n++;
    ad.delete();
    f.delete();
    cur.delete();
  }
  return n;
}

/** Cylindrical faces the finished plate must have: one per round feature column, plus the outline's and pockets' arcs. */
export function expectedCylindricalFaces(profile: PlateProfile, columns: readonly VoidColumn[]): number {
  let n = profile.outline.filter((s) => s.kind === 'arc').length;
  for (const col of columns) n += col.shape === 'circle' ? 1 : col.outline.filter((s) => s.kind === 'arc').length;
  return n;
}

export function measureVolumeMm3(oc: OpenCascadeInstance, shape: TopoDS_Shape): number {
  const props = new oc.GProp_GProps();
  oc.BRepGProp.VolumeProperties(shape, props, true, false, false);
  const v = props.Mass();
  props.delete();
  return v;
}

export function measureBoundingBox(oc: OpenCascadeInstance, shape: TopoDS_Shape): PlateVerification['bbox'] {
  const box = new oc.Bnd_Box();
  oc.BRepBndLib.AddOptimal(shape, box, false, false);
  const r = { minX: box.GetXMin(), minY: box.GetYMin(), minZ: box.GetZMin(), maxX: box.GetXMax(), maxY: box.GetYMax(), maxZ: box.GetZMax() };
  box.delete();
  return r;
}

/**
 * One analyser per kernel instance, re-initialised for every check: a fresh analyser per check
 * leaves about a megabyte of wasm heap behind on the reference plate, a reused one does not.
 */
const analysers = new WeakMap<OpenCascadeInstance, InstanceType<OpenCascadeInstance['BRepCheck_Analyzer']>>();

/** BRepCheck (topology and geometry) plus: the shape is one solid. */
export function checkSolidValidity(oc: OpenCascadeInstance, shape: TopoDS_Shape): boolean {
  const s = new Scope();
  try {
    if (shape.ShapeType() !== oc.TopAbs_ShapeEnum.TopAbs_SOLID) {
      // a boolean returns a compound holding one solid
      let solids = 0;
      const ex = s.own(new oc.TopExp_Explorer(shape, oc.TopAbs_ShapeEnum.TopAbs_SOLID, oc.TopAbs_ShapeEnum.TopAbs_SHAPE));
      for (; ex.More(); ex.Next()) solids++;
      if (solids !== 1) return false;
    }
    let an = analysers.get(oc);
    if (!an) {
      an = new oc.BRepCheck_Analyzer(shape, true, false, false);
      analysers.set(oc, an);
    } else {
      an.Init(shape, true);
    }
    return an.IsValid();
  } finally {
    s.free();
  }
}

export function verifyPlate(
  oc: OpenCascadeInstance,
  shape: TopoDS_Shape,
  profile: PlateProfile,
  columns: readonly VoidColumn[],
  opts: { skipValidityCheck?: boolean; deferVolume?: boolean } = {},
): PlateVerification {
  const s = new Scope();
  try {
    const valid = opts.skipValidityCheck ? true : checkSolidValidity(oc, shape);
    const volumeMm3 = opts.deferVolume ? Number.NaN : measureVolumeMm3(oc, shape);
    const analytic = analyticVolumeMm3(profile, columns);
    return {
      valid,
      volumeMm3,
      analyticVolumeMm3: analytic,
      volumeRelErr: Math.abs(volumeMm3 - analytic) / analytic,
      cylindricalFaces: countCylindricalFaces(oc, s, shape),
      expectedCylindricalFaces: expectedCylindricalFaces(profile, columns),
      bbox: measureBoundingBox(oc, shape),
    };
  } finally {
    s.free();
  }
}

function verificationProblem(v: PlateVerification, volumeDeferred = false): string | null {
  if (!v.valid) return 'the kernel reports the solid as invalid';
  if (!volumeDeferred && !(v.volumeRelErr < VOLUME_REL_TOL)) {
    return `its volume ${v.volumeMm3.toFixed(3)} mm³ differs from the computed ${v.analyticVolumeMm3.toFixed(3)} mm³`;
  }
  if (v.cylindricalFaces !== v.expectedCylindricalFaces) {
    return `it has ${v.cylindricalFaces} cylindrical faces where ${v.expectedCylindricalFaces} round features were expected`;
  }
  return null;
}

/**
 * Builds and verifies the plate. Throws PlateBuildError (with the feature ids) for a layout the
 * kernel must not attempt, or when no strategy produced a solid that passes verification.
 */
export function buildPlate(oc: OpenCascadeInstance, profile: PlateProfile, opts: BuildOptions = {}): BuiltPlate {
  const stage = stageTimer(opts.onStage);
  const layout = analyseLayout(profile);
  stage('layout');
  if (layout.errors.length > 0) {
    const first = layout.errors[0]!;
    if (layout.errors.length === 1) throw first;
    const ids = [...new Set(layout.errors.flatMap((e) => e.featureIds))];
    throw new PlateBuildError(first.code, layout.errors.map((e) => e.message).join(' '), ids);
  }
  const domainDisjoint = opts.layoutIsDisjoint ?? layoutIsDisjoint(profile);
  stage('domainLayout');
  const directAllowed = layout.directSafe && domainDisjoint;
  const order: BuildStrategy[] = opts.strategy ? [opts.strategy] : directAllowed ? ['direct', 'oneFace'] : ['oneFace'];
  const rejected: string[] = [];
  const failedFeatures = new Set<string>();
  if (!directAllowed && !opts.strategy) rejected.push(`direct: layout not disjoint (${layout.directBlockers.join(', ') || 'domain check'})`);

  for (const strategy of order) {
    const scope = new Scope();
    const kit = new Kit(oc, scope);
    let shape: TopoDS_Shape | null = null;
    try {
      const built = strategy === 'direct' ? buildDirect(kit, profile, layout.columns, stage) : buildOneFace(kit, profile, layout.columns);
      shape = scope.release(built);
    } catch (e) {
      // out of memory or a trap inside the wasm: no other strategy can succeed on this instance
      const fatal = fatalKernelError(oc, e, 'building the plate');
      if (fatal) {
        scope.free();
        throw fatal;
      }
      const where = e instanceof PlateBuildError ? null : kit.feature;
      if (where && where !== 'outline') failedFeatures.add(where);
      rejected.push(`${strategy}: ${where ? `while making ${where}: ` : ''}${e instanceof PlateBuildError ? e.message : describeKernelFailure(oc, e)}`);
      if (e instanceof PlateBuildError) {
        scope.free();
        throw e;
      }
    } finally {
      scope.free();
      stage('free');
    }
    if (!shape) continue;
    let verification: PlateVerification;
    try {
      verification = verifyPlate(oc, shape, profile, layout.columns, opts);
      stage('verify');
    } catch (e) {
      const fatal = fatalKernelError(oc, e, 'checking the built plate');
      try {
        shape.delete();
      } catch {
        /* the instance may be broken */
      }
      if (fatal) throw fatal;
      rejected.push(`${strategy}: verification failed (${describeKernelFailure(oc, e)})`);
      continue;
    }
    const problem = verificationProblem(verification, opts.deferVolume);
    if (problem) {
      shape.delete();
      rejected.push(`${strategy}: ${problem}`);
      continue;
    }
    const keep = shape;
    return {
      shape: keep,
      strategy,
      verification,
      rejected,
      volumePending: opts.deferVolume === true,
      dispose: () => keep.delete(),
    };
  }
  const ids = [...failedFeatures];
  throw new PlateBuildError(
    'build-unverified',
    `The plate could not be built into a solid that matches its drawing, so it is not shown or exported. ` +
      (ids.length ? `The kernel failed on ${ids.join(', ')}: check ${ids.length > 1 ? 'these features' : 'this feature'} against the outline, pockets and its neighbours. ` : 'Check the features near the outline, pockets and counterbores. ') +
      `Details: ${rejected.join('; ')}`,
    ids,
  );
}

/**
 * The construction alone, WITHOUT verification — for benchmarks that time the kernel work the
 * way a native CAD script would. Never show or export its result: use buildPlate.
 */
export function constructPlateSolidUnverified(oc: OpenCascadeInstance, profile: PlateProfile, strategy: BuildStrategy): TopoDS_Shape {
  const layout = analyseLayout(profile);
  if (layout.errors.length > 0) throw layout.errors[0]!;
  const scope = new Scope();
  try {
    const kit = new Kit(oc, scope);
    const built = strategy === 'direct' ? buildDirect(kit, profile, layout.columns, () => {}) : buildOneFace(kit, profile, layout.columns);
    return scope.release(built);
  } finally {
    scope.free();
  }
}

/** How many sub-shapes of a kind the explorer meets in `shape` (a shared one once per use). */
export function countSubShapes(oc: OpenCascadeInstance, shape: TopoDS_Shape, type: 'face' | 'wire' | 'edge' | 'vertex'): number {
  const E = oc.TopAbs_ShapeEnum;
  const kind = type === 'face' ? E.TopAbs_FACE : type === 'wire' ? E.TopAbs_WIRE : type === 'edge' ? E.TopAbs_EDGE : E.TopAbs_VERTEX;
  const ex = new oc.TopExp_Explorer(shape, kind, E.TopAbs_SHAPE);
  let n = 0;
  try {
    for (; ex.More(); ex.Next()) n++;
  } finally {
    ex.delete();
  }
  return n;
}

/** Faces, edges and vertices (as the explorer meets them) and the optimal bounding box (or `bbox`, measured before). */
export function shapeSignature(oc: OpenCascadeInstance, shape: TopoDS_Shape, bbox?: PlateVerification['bbox']): ShapeSignature {
  return {
    faces: countSubShapes(oc, shape, 'face'),
    edges: countSubShapes(oc, shape, 'edge'),
    vertices: countSubShapes(oc, shape, 'vertex'),
    bbox: bbox ?? measureBoundingBox(oc, shape),
  };
}

/**
 * The construction buildPlate tries first (direct when the layout allows it, else one-face), for
 * a display mesh made beside the verified build: the same profile, construction and kernel give
 * the same solid. Its result is NOT verified: it may be shown only once buildPlate has checked
 * the same profile's solid (validity and faces) with the same strategy, the two signatures agree
 * and this solid's own volume matches `analyticVolumeMm3`; otherwise it is thrown away. Layout
 * errors throw as in buildPlate. The caller owns the returned shape.
 */
export function constructForDisplay(
  oc: OpenCascadeInstance,
  profile: PlateProfile,
): { shape: TopoDS_Shape; strategy: BuildStrategy; analyticVolumeMm3: number } {
  const layout = analyseLayout(profile);
  if (layout.errors.length > 0) throw layout.errors[0]!;
  const strategy: BuildStrategy = layout.directSafe && layoutIsDisjoint(profile) ? 'direct' : 'oneFace';
  const scope = new Scope();
  try {
    const kit = new Kit(oc, scope);
    const built = strategy === 'direct' ? buildDirect(kit, profile, layout.columns, () => {}) : buildOneFace(kit, profile, layout.columns);
    return { shape: scope.release(built), strategy, analyticVolumeMm3: analyticVolumeMm3(profile, layout.columns) };
  } finally {
    scope.free();
  }
}

/**
 * Measures the volume a `deferVolume` build left out. The plate with its full verification, or
 * null when the volume does not match the drawing (then build it again without deferring: the
 * next strategy may pass).
 */
export function completeVolume(oc: OpenCascadeInstance, plate: BuiltPlate): BuiltPlate | null {
  if (!plate.volumePending) return plate;
  const volumeMm3 = measureVolumeMm3(oc, plate.shape);
  const v = plate.verification;
  const verification: PlateVerification = { ...v, volumeMm3, volumeRelErr: Math.abs(volumeMm3 - v.analyticVolumeMm3) / v.analyticVolumeMm3 };
  if (!(verification.volumeRelErr < VOLUME_REL_TOL)) return null;
  return { ...plate, verification, volumePending: false };
}

/** Keeps the last built plate per kernel instance, keyed by the profile's canonical JSON. */
export class PlateCache {
  private entry: { oc: OpenCascadeInstance; key: string; plate: BuiltPlate } | null = null;

  /**
   * The plate of `profile`, fully verified — unless `opts.deferVolume` asks for a build without
   * its volume (then a cached plate is returned as it is). A cached `volumePending` plate asked
   * for without deferring has its volume measured now; if that fails it is built again in full.
   */
  get(oc: OpenCascadeInstance, profile: PlateProfile, opts?: BuildOptions): { plate: BuiltPlate; hit: boolean } {
    const key = profileKey(profile);
    if (this.entry && this.entry.oc === oc && this.entry.key === key) {
      const cached = this.entry.plate;
      if (!cached.volumePending || opts?.deferVolume) return { plate: cached, hit: true };
      const full = completeVolume(oc, cached);
      if (full) {
        this.entry = { oc, key, plate: full };
        return { plate: full, hit: true };
      }
    }
    const plate = buildPlate(oc, profile, opts);
    this.clear();
    this.entry = { oc, key, plate };
    return { plate, hit: false };
  }

  /** forget the cached solid (call when the kernel instance is recycled) */
  clear(): void {
    if (this.entry) {
      try {
        this.entry.plate.dispose();
      } catch {
        /* the kernel instance may be gone */
      }
    }
    this.entry = null;
  }
}

/** Canonical JSON (sorted keys) of a profile: equal profiles give equal keys. */
export function profileKey(profile: PlateProfile): string {
  return canonicalJson(profile);
}
