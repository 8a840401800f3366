/**
 * Quoting numbers of a plate: volume and mass, the stock blank it is cut from, and the length of
 * cut per operation. All from the 2D profile, in closed form (no sampling).
 *
 * Volume = outline area × thickness − edge chamfers − holes − counterbores − pockets, each
 * round feature taken as a stack of coaxial cylinders along z (through hole, blind hole,
 * counterbore) clipped to the plate, and overlaps of holes with a pocket they sit in counted once.
 * Exact when the layout is disjoint (`layoutProblems` with a zero wall finds nothing): no two
 * features overlap, none reaches into the chamfer, none crosses a pocket's edge. Otherwise the
 * result is marked `exact: false` (overlaps are then counted twice).
 *
 * Edge chamfer (45°, size c, on both outer edges): at depth s from an edge the section is the
 * outline inset by c − s, whose area is A − P·s + K·s² (P perimeter; K = half the total turning
 * of the arcs plus tan(θ/2) for each sharp corner turning θ; K = π for an outline that is smooth
 * all round). Removed per edge: ∫₀^c (P·s − K·s²) ds = P·c²/2 − K·c³/3. Valid while the chamfer
 * is smaller than every convex corner radius.
 */
import { layoutProblems } from './checks';
import { DomainError } from './errors';
import { arcSweepRad, distanceToOutline, outlineBBox, outlinePerimeterMm, pointInOutline, segmentTangent } from './outline';
import { plateProfile } from './profile';
import type { BoundingBox, HoleOperation, OutlineSegment, PlateProfile, PlateSide, ProfileHole } from './profileTypes';
import type { PlateSpec } from './spec';
import { matchingStock, stockAtLeast, type StockThickness } from './stockThickness';

/** z-interval [from, to] along the plate thickness (z = 0 engine side). */
type Interval = readonly [number, number];

const length = (i: Interval): number => Math.max(0, i[1] - i[0]);
const overlap = (a: Interval, b: Interval): Interval => [Math.max(a[0], b[0]), Math.min(a[1], b[1])];

/** The z-interval a feature of depth `depthMm` (null = through) cut from `side` occupies. */
function zInterval(depthMm: number | null, side: PlateSide, thicknessMm: number): Interval {
  if (depthMm === null) return [0, thicknessMm];
  const d = Math.min(depthMm, thicknessMm);
  return side === 'engine' ? [0, d] : [thicknessMm - d, thicknessMm];
}

/** Volume of a hole (and its counterbore) inside the z-window `within`. */
function holeVolumeMm3(h: ProfileHole, thicknessMm: number, within: Interval): number {
  const r = h.diameterMm / 2;
  const hole = overlap(zInterval(h.depthMm, h.fromSide, thicknessMm), within);
  if (!h.counterbore) return Math.PI * r * r * length(hole);
  const R = Math.max(r, h.counterbore.diameterMm / 2);
  const cb = overlap(zInterval(h.counterbore.depthMm, h.counterbore.fromSide, thicknessMm), within);
  // disc(R) over the counterbore's span, plus disc(r) where the hole runs outside that span
  return Math.PI * R * R * length(cb) + Math.PI * r * r * (length(hole) - length(overlap(hole, cb)));
}

/** K of the inset-area formula: half the arcs' turning plus tan(θ/2) per sharp corner. */
function insetCurvatureTerm(outline: readonly OutlineSegment[]): number {
  let k = 0;
  outline.forEach((s, i) => {
    if (s.kind === 'arc') k += arcSweepRad(s) / 2;
    const a = segmentTangent(s, 'end');
    const b = segmentTangent(outline[(i + 1) % outline.length]!, 'start');
    const turn = Math.atan2(a.x * b.y - a.y * b.x, a.x * b.x + a.y * b.y);
    if (Math.abs(turn) > 1e-9) k += Math.tan(turn / 2);
  });
  return k;
}

/** Volume removed by a 45° chamfer of size `chamferMm` on ONE outer edge of the outline (mm³). */
export function chamferVolumeMm3(outline: readonly OutlineSegment[], chamferMm: number): number {
  if (chamferMm <= 0) return 0;
  const p = outlinePerimeterMm(outline);
  const k = insetCurvatureTerm(outline);
  return (p * chamferMm * chamferMm) / 2 - (k * chamferMm ** 3) / 3;
}

export interface PlateVolume {
  readonly volumeMm3: number;
  readonly massKg: number;
  /** false when features overlap, so the closed form counts some material twice */
  readonly exact: boolean;
  readonly breakdown: {
    readonly blankMm3: number;
    readonly chamfersMm3: number;
    readonly holesMm3: number;
    readonly pocketsMm3: number;
  };
}

/** Volume of a profile (mm³), and whether the closed form is exact for it. */
export function profileVolume(profile: PlateProfile): Omit<PlateVolume, 'massKg'> {
  const t = profile.thicknessMm;
  const all: Interval = [0, t];
  const blankMm3 = profile.outlineAreaMm2 * t;
  const chamfersMm3 = 2 * chamferVolumeMm3(profile.outline, profile.edgeChamferMm);
  let holesMm3 = 0;
  for (const h of profile.holes) holesMm3 += holeVolumeMm3(h, t, all);
  let pocketsMm3 = 0;
  for (const p of profile.pockets) {
    const span = zInterval(p.depthMm, p.fromSide, t);
    let v = p.areaMm2 * length(span);
    // holes that lie inside the pocket were already taken out over the pocket's span
    for (const h of profile.holes) {
      const rMax = Math.max(h.diameterMm, h.counterbore?.diameterMm ?? 0) / 2;
      if (insidePocket(p.outline, h.center, rMax)) v -= holeVolumeMm3(h, t, span);
    }
    pocketsMm3 += v;
  }
  const exact = layoutProblems(profile, { minWallMm: 0 }).length === 0;
  return Object.freeze({
    volumeMm3: blankMm3 - chamfersMm3 - holesMm3 - pocketsMm3,
    exact,
    breakdown: Object.freeze({ blankMm3, chamfersMm3, holesMm3, pocketsMm3 }),
  });
}


function insidePocket(outline: readonly OutlineSegment[], c: { x: number; y: number }, r: number): boolean {
  return pointInOutline(outline, c) && distanceToOutline(outline, c) >= r - 1e-9;
}

/** Volume and mass of the plate; mass from the material density (g/cm³ = 1e-6 kg/mm³). */
export function plateMass(spec: PlateSpec): PlateVolume {
  const v = profileVolume(plateProfile(spec));
  return Object.freeze({ ...v, massKg: v.volumeMm3 * spec.material.densityGPerCm3 * 1e-6 });
}

export interface StockSize {
  /** blank size: the plate's bounding box plus the saw allowance on every side */
  readonly widthMm: number;
  readonly heightMm: number;
  /** suggested stock thickness (null when the plate is thicker than every stock size) */
  readonly stock: StockThickness | null;
  /** stock thickness − plate thickness, to face off */
  readonly facingMm: number | null;
  readonly bbox: BoundingBox;
  /** mass of the stock blank */
  readonly blankMassKg: number | null;
}

/**
 * The stock blank a plate is cut from: the outline's exact bounding box grown by
 * `sawAllowanceMm` on every side (default 5 mm), and the thinnest stock thickness that leaves
 * `facingAllowanceMm` (default 0) to face off.
 */
export function stockSize(spec: PlateSpec, opts: { readonly sawAllowanceMm?: number; readonly facingAllowanceMm?: number } = {}): StockSize {
  const saw = opts.sawAllowanceMm ?? 5;
  const facing = opts.facingAllowanceMm ?? 0;
  if (!(saw >= 0) || !Number.isFinite(saw)) {
    throw new DomainError('stock.allowance', `sawAllowanceMm must be 0 mm or more, got ${String(opts.sawAllowanceMm)}.`, ['sawAllowanceMm']);
  }
  if (!(facing >= 0) || !Number.isFinite(facing)) {
    throw new DomainError('stock.allowance', `facingAllowanceMm must be 0 mm or more, got ${String(opts.facingAllowanceMm)}.`, ['facingAllowanceMm']);
  }
  const profile = plateProfile(spec);
  const bbox = outlineBBox(profile.outline);
  const widthMm = bbox.maxX - bbox.minX + 2 * saw;
  const heightMm = bbox.maxY - bbox.minY + 2 * saw;
  const need = spec.thicknessMm + facing;
  const stock = facing === 0 ? (matchingStock(need, spec.thicknessStock) ?? stockAtLeast(need, spec.thicknessStock)) : stockAtLeast(need, spec.thicknessStock);
  return Object.freeze({
    widthMm,
    heightMm,
    stock,
    facingMm: stock ? Math.max(0, stock.thicknessMm - spec.thicknessMm) : null,
    bbox,
    blankMassKg: stock ? widthMm * heightMm * stock.thicknessMm * spec.material.densityGPerCm3 * 1e-6 : null,
  });
}

export interface CutLength {
  /** outer profile, exact arcs */
  readonly outlineMm: number;
  /** circumference of the round features, by operation */
  readonly holesMm: Readonly<Record<HoleOperation, number>>;
  readonly counterboresMm: number;
  /** pocket boundaries */
  readonly pocketsMm: number;
  readonly totalMm: number;
}

/** Length of cut per operation (for quoting waterjet, router or mill time). */
export function cutLength(spec: PlateSpec): CutLength {
  const profile = plateProfile(spec);
  const holesMm: Record<HoleOperation, number> = { through: 0, tapDrill: 0, dowelReam: 0, centreBore: 0, starterBore: 0 };
  let counterboresMm = 0;
  for (const h of profile.holes) {
    holesMm[h.operation] += Math.PI * h.diameterMm;
    if (h.counterbore) counterboresMm += Math.PI * h.counterbore.diameterMm;
  }
  const outlineMm = outlinePerimeterMm(profile.outline);
  const pocketsMm = profile.pockets.reduce((s, p) => s + outlinePerimeterMm(p.outline), 0);
  const totalMm = outlineMm + Object.values(holesMm).reduce((a, b) => a + b, 0) + counterboresMm + pocketsMm;
  return Object.freeze({ outlineMm, holesMm: Object.freeze(holesMm), counterboresMm, pocketsMm, totalMm });
}
