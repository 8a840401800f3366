/**
 * Design checks of an adapter plate: every finding names its rule and where the rule comes from
 * (a standard, a handbook, or "common practice"), the features it concerns, and where on the
 * plate it is (so the editor can draw it). The rules and their sources are listed in
 * docs/computes-plate.md.
 *
 * Lengths in mm, plate coordinates (see profileTypes.ts).
 */
import { DomainError } from './errors';
import { discVsPocket, featureDisc, leastEdgeDistance, MIN_WALL_MM, sampleChain } from './layout';
import { closestPointOnOutline, distanceToOutline, pointInOutline, segmentLengthMm } from './outline';
import {
  flangeFootprint,
  resolvePlate,
  starterGearCentreDistanceMm,
  starterPlacedDistanceMm,
  toPlateCoordinates,
  type FaceName,
  type ResolvedFeature,
  type ResolvedPlate,
} from './profile';
import type { OutlineSegment, PlateProfile, PlateSide, Point2, ProfileHole, ProfilePocket } from './profileTypes';
import type { PlateSpec } from './spec';
import { pilotStackUp, plateThicknessStackUp, releaseBearingStackUp, starterLandingStackUp } from './stackUp';
import { capScrewHead } from './standards/capScrews';
import { clearanceRangeMm } from './standards/clearanceHoles';
import { gearModuleMm } from './standards/gears';
import { matchingStock, stockAtLeast, stockThicknesses } from './stockThickness';
import { formatLength } from './units';

export type Severity = 'error' | 'warning' | 'note';

export interface Finding {
  /** stable machine code, e.g. "edge.minimum" */
  readonly code: string;
  readonly severity: Severity;
  readonly message: string;
  readonly featureIds: string[];
  /** the rule in a few words, e.g. "edge distance ≥ 1.2·d0" */
  readonly rule: string;
  /** where the rule comes from */
  readonly source: string;
  /** where to draw it: a point, or a line between two points (e.g. a ligament) */
  readonly at?: Point2 | { readonly from: Point2; readonly to: Point2 };
}

// ---------------------------------------------------------------------------------------------
// Rule values and their sources

export const SOURCES = Object.freeze({
  en1993: 'EN 1993-1-8:2005 Table 3.3 (spacing and edge distances for bolts)',
  dfmWall: 'machining design guides: minimum machinable wall 0.5–0.8 mm',
  clearance: 'ISO 273 (ISO 20273) fine/medium/coarse; ASME B18.2.8 close/normal/loose',
  engagement: 'thread engagement rule of thumb (≈1×D steel, 1.5×D cast iron, 2×D aluminium); VDI 2230 example: M8 10.9 into aluminium ≥ 2×d',
  capScrew: 'ISO 4762 / ASME B18.3 socket head cap screw head sizes; counterbore depth: common practice',
  floor: 'common practice (a counterbore floor carries the bolt load: ≥ 1.5 mm and ≥ 0.5·d)',
  dowels: 'common practice (dowels locate, bolts clamp: two dowels fix a face in X, Y and rotation)',
  iso286: 'ISO 286-1 limits and fits',
  j617: 'SAE J617 flywheel housing bore/face runout (max TIR); TIR = 2 × centre offset',
  fitScatter: 'common practice (measured holes should scatter well inside the hole position tolerance)',
  gears: 'ISO 21771 centre distance a = m·(z1 + z2)/2; tolerance on it: common practice (fraction of the module)',
  stackUp: 'axial tolerance stack-up, worst case and RSS (common practice)',
  stock: 'plate stock sizes 6–25 mm / 1/4–1 in; mill plate is not flat enough to use unfaced (Aluminum Association flatness tolerances)',
  outline: 'common practice (a feature must stay inside the plate with at least the minimum wall)',
  pocket: 'common practice (a pocket floor and the walls around it must keep the minimum wall)',
});

/** EN 1993-1-8 Table 3.3: edge distance e1, e2 ≥ 1.2·d0 (minimum). */
export const EDGE_MIN_FACTOR = 1.2;
/** EN 1993-1-8 Table 3.3: recommended edge distance e2 = 1.5·d0. */
export const EDGE_RECOMMENDED_FACTOR = 1.5;
/** EN 1993-1-8 Table 3.3: spacing p1 ≥ 2.2·d0. */
export const PITCH_MIN_FACTOR = 2.2;
/** Counterbore floor: at least this (common practice, from memory: 1.5–3 mm). */
export const MIN_FLOOR_MM = 1.5;
/** Counterbore floor: at least this share of the bolt diameter (common practice). */
export const FLOOR_FACTOR = 0.5;
/** Minimum thread engagement as a multiple of D: below `error` is an error, below `warning` a warning. */
export const THREAD_ENGAGEMENT_FACTORS = Object.freeze({
  aluminium: Object.freeze({ warning: 2.0, error: 1.5 }),
  castIron: Object.freeze({ warning: 1.5, error: 1.0 }),
  steel: Object.freeze({ warning: 1.0, error: 0.8 }),
  other: Object.freeze({ warning: 2.0, error: 1.5 }),
});
/** Starter centre distance: warning beyond this share of the module, error beyond the next. */
export const STARTER_DISTANCE_WARNING_MODULES = 0.1;
export const STARTER_DISTANCE_ERROR_MODULES = 0.25;

const LENGTH_TOLERANCE_MM = 1e-9;

const f2 = (mm: number): string => formatLength(mm, 'mm');
const f3 = (mm: number): string => formatLength(mm, 'mm', { decimals: 3 });

function finding(
  code: string,
  severity: Severity,
  message: string,
  featureIds: readonly string[],
  rule: string,
  source: string,
  at?: Finding['at'],
): Finding {
  return Object.freeze({
    code,
    severity,
    message,
    featureIds: Object.freeze([...featureIds]) as string[],
    rule,
    source,
    ...(at ? { at } : {}),
  });
}

function sideName(side: PlateSide): string {
  return side === 'engine' ? 'engine side' : 'transmission side';
}

function faceOfSide(side: PlateSide): FaceName {
  return side === 'engine' ? 'engineFace' : 'transmissionFace';
}

function flangeName(face: FaceName): string {
  return face === 'engineFace' ? 'engine flange' : 'transmission flange';
}

const isFastenerHole = (f: ResolvedFeature): boolean => f.kind === 'faceHole' || f.kind === 'starterHole';
const isBore = (f: ResolvedFeature): boolean => f.kind === 'centreBore' || f.kind === 'starterBore';

/** The face a feature is counted with for cross-face rules (starter holes are the plate's own). */
const groupOf = (f: ResolvedFeature): string => f.faceName ?? f.kind;

/** Closest points of two circles along the line of centres (for drawing a ligament). */
function ligamentLine(a: ProfileHole, ra: number, b: ProfileHole, rb: number): { from: Point2; to: Point2 } {
  const dx = b.center.x - a.center.x;
  const dy = b.center.y - a.center.y;
  const d = Math.hypot(dx, dy) || 1;
  return {
    from: { x: a.center.x + (dx / d) * ra, y: a.center.y + (dy / d) * ra },
    to: { x: b.center.x - (dx / d) * rb, y: b.center.y - (dy / d) * rb },
  };
}

/** Fastener size that sets hole spacing and edge distance: the hole, or the thread for a tapped hole. */
function d0Of(f: ResolvedFeature): number {
  return Math.max(f.hole.diameterMm, f.role === 'tapped' ? (f.fastener?.nominalDiameterMm ?? 0) : 0);
}

// ---------------------------------------------------------------------------------------------
// Layout: ligaments, edges, pockets

function checkLigaments(r: ResolvedPlate, out: Finding[]): void {
  const fs = r.features;
  for (let i = 0; i < fs.length; i++) {
    for (let j = i + 1; j < fs.length; j++) {
      const a = fs[i]!;
      const b = fs[j]!;
      const da = featureDisc(a.hole);
      const db = featureDisc(b.hole);
      const c = Math.hypot(a.hole.center.x - b.hole.center.x, a.hole.center.y - b.hole.center.y);
      const wall = c - da.radiusMm - db.radiusMm;
      const ids = [a.hole.id, b.hole.id];
      const line = ligamentLine(a.hole, da.radiusMm, b.hole, db.radiusMm);
      if (wall < 0) {
        out.push(
          finding(
            'layout.overlap',
            'error',
            `${a.hole.id} and ${b.hole.id} overlap by ${f2(-wall)} (centres ${f2(c)} apart); move one of them or change a pattern.`,
            ids,
            'features must not overlap',
            SOURCES.dfmWall,
            c > LENGTH_TOLERANCE_MM ? line : a.hole.center,
          ),
        );
        continue;
      }
      if (wall < MIN_WALL_MM) {
        out.push(
          finding(
            'layout.ligament',
            'error',
            `The wall between ${a.hole.id} and ${b.hole.id} is ${f2(wall)}, under the ${f2(MIN_WALL_MM)} minimum a cutter can leave.`,
            ids,
            `ligament ≥ ${MIN_WALL_MM} mm`,
            SOURCES.dfmWall,
            line,
          ),
        );
        continue;
      }
      if (isFastenerHole(a) && isFastenerHole(b) && groupOf(a) !== groupOf(b)) {
        const d0 = Math.max(d0Of(a), d0Of(b));
        if (c < PITCH_MIN_FACTOR * d0 - LENGTH_TOLERANCE_MM) {
          out.push(
            finding(
              'layout.pitch',
              'warning',
              `${a.hole.id} and ${b.hole.id} are ${f2(c)} apart, closer than ${PITCH_MIN_FACTOR}·d0 = ${f2(PITCH_MIN_FACTOR * d0)}; the wall of ${f2(wall)} between them is weak under bolt load.`,
              ids,
              `hole spacing ≥ ${PITCH_MIN_FACTOR}·d0`,
              SOURCES.en1993,
              line,
            ),
          );
        }
      } else if (isBore(a) !== isBore(b)) {
        const bore = isBore(a) ? a : b;
        const hole = isBore(a) ? b : a;
        if (!isFastenerHole(hole)) continue;
        const d0 = d0Of(hole);
        const e = c - bore.hole.diameterMm / 2;
        if (e < EDGE_MIN_FACTOR * d0 - LENGTH_TOLERANCE_MM) {
          out.push(
            finding(
              'layout.boreEdge',
              'note',
              `${hole.hole.id} is ${f2(e)} from the edge of bore ${bore.hole.id}, under ${EDGE_MIN_FACTOR}·d0 = ${f2(EDGE_MIN_FACTOR * d0)}.`,
              [hole.hole.id, bore.hole.id],
              `distance to a bore edge ≥ ${EDGE_MIN_FACTOR}·d0`,
              SOURCES.en1993,
              line,
            ),
          );
        }
      }
    }
  }
}

function checkOutline(r: ResolvedPlate, out: Finding[]): void {
  const outline = r.profile.outline;
  const chamfer = r.profile.edgeChamferMm;
  for (const f of r.features) {
    const disc = featureDisc(f.hole);
    const nearest = closestPointOnOutline(outline, f.hole.center);
    const inside = pointInOutline(outline, f.hole.center);
    const wall = inside ? nearest.distanceMm - disc.radiusMm : -nearest.distanceMm - disc.radiusMm;
    const at = { from: f.hole.center, to: nearest.point };
    if (wall < MIN_WALL_MM + chamfer - LENGTH_TOLERANCE_MM) {
      out.push(
        finding(
          'outline.breakthrough',
          'error',
          wall < 0
            ? `${f.hole.id} breaks through the plate outline by ${f2(-wall)}.`
            : `${f.hole.id} leaves only ${f2(wall)} of wall to the plate edge${chamfer > 0 ? ` (with the ${f2(chamfer)} edge chamfer)` : ''}, under ${f2(MIN_WALL_MM + chamfer)}.`,
          [f.hole.id],
          `features inside the outline with ≥ ${MIN_WALL_MM} mm wall`,
          SOURCES.outline,
          at,
        ),
      );
      continue;
    }
    if (!isFastenerHole(f)) continue;
    const d0 = d0Of(f);
    const e = nearest.distanceMm;
    if (e < EDGE_MIN_FACTOR * d0 - LENGTH_TOLERANCE_MM) {
      out.push(
        finding(
          'edge.minimum',
          'error',
          `${f.hole.id} is ${f2(e)} from the plate edge, under the minimum ${EDGE_MIN_FACTOR}·d0 = ${f2(EDGE_MIN_FACTOR * d0)} (d0 = ${f2(d0)}).`,
          [f.hole.id],
          `edge distance ≥ ${EDGE_MIN_FACTOR}·d0`,
          SOURCES.en1993,
          at,
        ),
      );
    } else if (e < EDGE_RECOMMENDED_FACTOR * d0 - LENGTH_TOLERANCE_MM) {
      out.push(
        finding(
          'edge.recommended',
          'warning',
          `${f.hole.id} is ${f2(e)} from the plate edge, under the recommended ${EDGE_RECOMMENDED_FACTOR}·d0 = ${f2(EDGE_RECOMMENDED_FACTOR * d0)} (d0 = ${f2(d0)}).`,
          [f.hole.id],
          `edge distance ≥ ${EDGE_RECOMMENDED_FACTOR}·d0 recommended`,
          SOURCES.en1993,
          at,
        ),
      );
    }
  }
}

function checkPockets(r: ResolvedPlate, out: Finding[]): void {
  const t = r.profile.thicknessMm;
  for (const p of r.profile.pockets) {
    const floor = t - p.depthMm;
    if (floor <= LENGTH_TOLERANCE_MM) {
      out.push(
        finding(
          'pocket.throughPlate',
          'error',
          `Pocket ${p.id} is ${f2(p.depthMm)} deep in a ${f2(t)} plate: it cuts through.`,
          [p.id],
          'pocket depth < plate thickness',
          SOURCES.pocket,
        ),
      );
    } else if (floor < MIN_FLOOR_MM - LENGTH_TOLERANCE_MM) {
      out.push(
        finding(
          'pocket.floor',
          'warning',
          `Pocket ${p.id} leaves a ${f2(floor)} floor, under ${f2(MIN_FLOOR_MM)}.`,
          [p.id],
          `pocket floor ≥ ${MIN_FLOOR_MM} mm`,
          SOURCES.pocket,
        ),
      );
    }
    // the pocket inside the plate
    const limit = MIN_WALL_MM + r.profile.edgeChamferMm - LENGTH_TOLERANCE_MM;
    const { distanceMm: worst, at: worstAt } = leastEdgeDistance(r.profile.outline, sampleChain(p.outline, 0.5), limit);
    if (worst < limit && worstAt) {
      out.push(
        finding(
          'outline.breakthrough',
          'error',
          worst < 0
            ? `Pocket ${p.id} breaks through the plate outline.`
            : `Pocket ${p.id} leaves only ${f2(worst)} of wall to the plate edge, under ${f2(MIN_WALL_MM + r.profile.edgeChamferMm)}.`,
          [p.id],
          `features inside the outline with ≥ ${MIN_WALL_MM} mm wall`,
          SOURCES.outline,
          worstAt,
        ),
      );
    }
    for (const f of r.features) {
      const disc = featureDisc(f.hole);
      const rel = discVsPocket(p, f.hole.center, disc.radiusMm, MIN_WALL_MM);
      if (rel.relation === 'crossing') {
        out.push(
          finding(
            'pocket.edge',
            'error',
            rel.wallMm < 0
              ? `${f.hole.id} crosses the edge of pocket ${p.id}; put it fully inside or outside the pocket.`
              : `${f.hole.id} leaves only ${f2(rel.wallMm)} of wall to the edge of pocket ${p.id}, under ${f2(MIN_WALL_MM)}.`,
            [f.hole.id, p.id],
            `features fully inside or outside a pocket, ≥ ${MIN_WALL_MM} mm from its edge`,
            SOURCES.pocket,
            f.hole.center,
          ),
        );
      }
    }
  }
}

/** Depth of pocket over a point (0 if none), for material left under a hole. */
function pocketDepthAt(profile: PlateProfile, p: Point2, side?: PlateSide): number {
  let depth = 0;
  for (const k of profile.pockets) {
    if ((side === undefined || k.fromSide === side) && pointInOutline(k.outline, p)) depth = Math.max(depth, k.depthMm);
  }
  return depth;
}

// ---------------------------------------------------------------------------------------------
// Holes: clearance sizes, threads, counterbores, dowels

function checkClearanceSizes(r: ResolvedPlate, out: Finding[]): void {
  for (const f of r.features) {
    if ((f.role !== 'clearance' && f.role !== 'stud') || !f.fastener || !f.explicitDiameter) continue;
    const d = f.hole.diameterMm;
    const nominal = f.fastener.nominalDiameterMm;
    if (d <= nominal + LENGTH_TOLERANCE_MM) {
      out.push(
        finding(
          'clearance.tooSmall',
          'error',
          `${f.hole.id} is Ø${f2(d)}, no larger than the ${f.fastener.nominal} bolt (Ø${f2(nominal)}): the bolt will not pass.`,
          [f.hole.id],
          'clearance hole larger than the bolt',
          SOURCES.clearance,
          f.hole.center,
        ),
      );
      continue;
    }
    let range: { minMm: number; maxMm: number };
    try {
      range = clearanceRangeMm(f.fastener.designation);
    } catch (e) {
      if (!(e instanceof DomainError)) throw e;
      out.push(
        finding(
          'clearance.untabulated',
          'note',
          `${f.hole.id}: no clearance table for ${f.fastener.nominal}, so its Ø${f2(d)} is not checked against a standard.`,
          [f.hole.id],
          'clearance hole within the standard range',
          SOURCES.clearance,
          f.hole.center,
        ),
      );
      continue;
    }
    if (d < range.minMm - LENGTH_TOLERANCE_MM || d > range.maxMm + LENGTH_TOLERANCE_MM) {
      out.push(
        finding(
          'clearance.range',
          'warning',
          `${f.hole.id} is Ø${f2(d)}, outside the standard clearance range for ${f.fastener.nominal} (${f2(range.minMm)} to ${f2(range.maxMm)}).`,
          [f.hole.id],
          'clearance hole within the standard range (finest to coarsest class)',
          SOURCES.clearance,
          f.hole.center,
        ),
      );
    }
  }
}

function checkThreads(r: ResolvedPlate, out: Finding[]): void {
  const t = r.profile.thicknessMm;
  const factors = THREAD_ENGAGEMENT_FACTORS[r.spec.material.kind];
  for (const f of r.features) {
    if (f.role !== 'tapped' || !f.fastener) continue;
    const D = f.fastener.nominalDiameterMm;
    const available = t - pocketDepthAt(r.profile, f.hole.center);
    const asked = f.hole.threadDepthMm ?? available;
    const engagement = Math.min(asked, available);
    if (asked > available + LENGTH_TOLERANCE_MM) {
      out.push(
        finding(
          'thread.depthLimited',
          'note',
          `${f.hole.id}: the ${f2(asked)} thread depth is limited to the ${f2(available)} of material there.`,
          [f.hole.id],
          'thread depth ≤ material thickness',
          SOURCES.engagement,
          f.hole.center,
        ),
      );
    }
    const ratio = engagement / D;
    const where = `${f.hole.id} (${f.hole.thread ?? f.fastener.designation}) engages ${f2(engagement)} = ${ratio.toFixed(2)}×D in ${r.spec.material.name}`;
    if (ratio < factors.error - 1e-9) {
      out.push(
        finding(
          'thread.engagement',
          'error',
          `${where}, under ${factors.error}×D = ${f2(factors.error * D)}: the thread will strip before the bolt reaches its load. Use a thicker plate, a steel thread insert, or a through bolt with a nut.`,
          [f.hole.id],
          `thread engagement ≥ ${factors.error}×D (${r.spec.material.kind})`,
          SOURCES.engagement,
          f.hole.center,
        ),
      );
    } else if (ratio < factors.warning - 1e-9) {
      out.push(
        finding(
          'thread.engagement',
          'warning',
          `${where}, under the ${factors.warning}×D = ${f2(factors.warning * D)} usually asked for; consider steel thread inserts or a lower bolt torque.`,
          [f.hole.id],
          `thread engagement ≥ ${factors.warning}×D (${r.spec.material.kind})`,
          SOURCES.engagement,
          f.hole.center,
        ),
      );
    }
  }
}

function checkCounterbores(r: ResolvedPlate, out: Finding[]): void {
  const t = r.profile.thicknessMm;
  const footprints = new Map<FaceName, OutlineSegment[] | null>();
  const footprintOf = (face: FaceName) => {
    if (!footprints.has(face)) footprints.set(face, flangeFootprint(r, face));
    return footprints.get(face)!;
  };
  for (const f of r.features) {
    const cb = f.hole.counterbore;
    // the floor under any counterbore
    if (cb) {
      const floor = t - cb.depthMm - pocketDepthAt(r.profile, f.hole.center, cb.fromSide === 'engine' ? 'transmission' : 'engine');
      const bolt = f.fastener?.nominalDiameterMm ?? 0;
      if (floor <= LENGTH_TOLERANCE_MM) {
        out.push(
          finding(
            'counterbore.throughPlate',
            'error',
            `The ${f2(cb.depthMm)} counterbore of ${f.hole.id} is as deep as the ${f2(t)} plate or deeper.`,
            [f.hole.id],
            'counterbore depth < plate thickness',
            SOURCES.floor,
            f.hole.center,
          ),
        );
      } else if (floor < MIN_FLOOR_MM - LENGTH_TOLERANCE_MM) {
        out.push(
          finding(
            'counterbore.floor',
            'error',
            `The counterbore of ${f.hole.id} leaves a ${f2(floor)} floor under the bolt head, under ${f2(MIN_FLOOR_MM)}.`,
            [f.hole.id],
            `counterbore floor ≥ ${MIN_FLOOR_MM} mm`,
            SOURCES.floor,
            f.hole.center,
          ),
        );
      } else if (floor < FLOOR_FACTOR * bolt - LENGTH_TOLERANCE_MM) {
        out.push(
          finding(
            'counterbore.floor',
            'warning',
            `The counterbore of ${f.hole.id} leaves a ${f2(floor)} floor, under ${FLOOR_FACTOR}·d = ${f2(FLOOR_FACTOR * bolt)} for the ${f.fastener!.nominal} bolt; consider a low-head screw or a thicker plate.`,
            [f.hole.id],
            `counterbore floor ≥ ${FLOOR_FACTOR}·d`,
            SOURCES.floor,
            f.hole.center,
          ),
        );
      }
    }

    // a head or nut that would sit under the other flange
    if (!f.seatSide || !f.fastener) continue;
    const flange = faceOfSide(f.seatSide);
    if (f.faceName === flange) continue;
    const footprint = footprintOf(flange);
    if (!footprint) continue;
    let head: { headDiameterMm: number; headHeightMm: number; counterboreDiameterMm: number; counterboreDepthMm: number } | null = null;
    if (f.seat === 'head') {
      try {
        head = capScrewHead(f.fastener.designation);
      } catch (e) {
        if (!(e instanceof DomainError)) throw e;
      }
    }
    const seatRadius = head ? head.headDiameterMm / 2 : f.hole.diameterMm / 2;
    const under =
      pointInOutline(footprint, f.hole.center) || distanceToOutline(footprint, f.hole.center) < seatRadius - LENGTH_TOLERANCE_MM;
    if (!under) continue;
    const cbOnSeat = cb && cb.fromSide === f.seatSide ? cb : null;
    const what = f.seat === 'head' ? 'bolt head' : 'nut';
    if (!head) {
      if (!cbOnSeat || !f.explicitCounterbore) {
        out.push(
          finding(
            'counterbore.unchecked',
            cbOnSeat ? 'note' : 'warning',
            `The ${what} of ${f.hole.id} sits under the ${flangeName(flange)} on the ${sideName(f.seatSide)}; there is no table for it, so give its counterbore diameterMm and depthMm${cbOnSeat ? '' : ' (none yet)'}.`,
            [f.hole.id],
            'a fastener under the other flange needs a counterbore deep enough for it',
            SOURCES.capScrew,
            f.hole.center,
          ),
        );
      }
      continue;
    }
    if (!cbOnSeat) {
      out.push(
        finding(
          'counterbore.missing',
          'error',
          `The ${f.fastener.nominal} bolt head of ${f.hole.id} (Ø${f2(head.headDiameterMm)} × ${f2(head.headHeightMm)}) sits under the ${flangeName(flange)} on the ${sideName(f.seatSide)}: counterbore it from that side (Ø${f2(head.counterboreDiameterMm)} × ${f2(head.counterboreDepthMm)}) or move the hole.`,
          [f.hole.id],
          'a bolt head under the other flange needs a counterbore deep enough for it',
          SOURCES.capScrew,
          f.hole.center,
        ),
      );
      continue;
    }
    if (cbOnSeat.depthMm < head.headHeightMm - LENGTH_TOLERANCE_MM || cbOnSeat.diameterMm < head.headDiameterMm - LENGTH_TOLERANCE_MM) {
      out.push(
        finding(
          'counterbore.shallow',
          'error',
          `The counterbore of ${f.hole.id} (Ø${f2(cbOnSeat.diameterMm)} × ${f2(cbOnSeat.depthMm)}) does not take the ${f.fastener.nominal} head (Ø${f2(head.headDiameterMm)} × ${f2(head.headHeightMm)}), which sits under the ${flangeName(flange)}.`,
          [f.hole.id],
          'counterbore at least as wide and deep as the head',
          SOURCES.capScrew,
          f.hole.center,
        ),
      );
    }
  }
}

function checkDowels(r: ResolvedPlate, out: Finding[]): void {
  for (const face of ['engineFace', 'transmissionFace'] as const) {
    const holes = r.features.filter((f) => f.faceName === face);
    if (holes.length === 0) continue;
    const dowels = holes.filter((f) => f.role === 'dowel');
    if (dowels.length < 2) {
      out.push(
        finding(
          'dowel.count',
          'warning',
          `The ${face === 'engineFace' ? 'engine' : 'transmission'} face has ${dowels.length === 0 ? 'no dowel' : 'one dowel'}; two dowels are needed to locate it (bolts clamp, they do not locate).`,
          dowels.map((d) => d.hole.id),
          'at least two dowels per face',
          SOURCES.dowels,
        ),
      );
    }
  }
  for (const f of r.features) {
    const fit = f.hole.fit;
    if (!fit) continue;
    const what = f.role === 'dowel' ? 'ream' : f.kind === 'centreBore' ? 'bore' : 'bore';
    out.push(
      finding(
        f.role === 'dowel' ? 'dowel.fit' : 'fit.limits',
        'note',
        `${f.hole.id} Ø${f3(f.hole.diameterMm)} ${fit.designation === 'limits' ? '' : `${fit.designation}: `}${what} to ${f3(fit.lowerMm)} … ${f3(fit.upperMm)}.`,
        [f.hole.id],
        'size limits of a fitted hole',
        fit.designation === 'limits' ? 'limits given in the spec' : SOURCES.iso286,
        f.hole.center,
      ),
    );
  }
}

// ---------------------------------------------------------------------------------------------
// Axis, starter, thickness

function checkAlignment(r: ResolvedPlate, out: Finding[]): void {
  const tol = r.spec.tolerances.alignmentTirMm;
  for (const faceName of ['engineFace', 'transmissionFace'] as const) {
    const face = r.spec[faceName];
    for (const p of face.patterns) {
      if (!p.fitted) continue;
      const ids = r.features.filter((f) => f.faceName === faceName && f.patternId === p.id).map((f) => f.hole.id);
      // the face's shaft axis, on the plate
      const axis = toPlateCoordinates({ x: p.centerX - p.fitted.centerX, y: p.centerY - p.fitted.centerY }, face.viewedFrom);
      const offset = Math.hypot(axis.x, axis.y);
      const tir = 2 * offset;
      const axisName = faceName === 'engineFace' ? 'crank axis' : 'transmission input-shaft axis';
      const at = { from: { x: 0, y: 0 }, to: axis };
      if (tir > tol + LENGTH_TOLERANCE_MM) {
        out.push(
          finding(
            'alignment.offset',
            'error',
            `Pattern ${p.id}: the ${axisName} lands ${f3(offset)} off the common axis (TIR ${f3(tir)}), beyond the ${f3(tol)} TIR allowed. Place the pattern centre at the fitted centre (${f3(p.fitted.centerX)}, ${f3(p.fitted.centerY)}) as measured.`,
            ids,
            `axis offset × 2 ≤ alignment TIR ${f3(tol)}`,
            SOURCES.j617,
            at,
          ),
        );
      } else {
        out.push(
          finding(
            'alignment.offset',
            'note',
            `Pattern ${p.id}: the ${axisName} lands ${f3(offset)} off the common axis (TIR ${f3(tir)} of ${f3(tol)} allowed).`,
            ids,
            `axis offset × 2 ≤ alignment TIR ${f3(tol)}`,
            SOURCES.j617,
            at,
          ),
        );
      }
      const scatterLimit = r.spec.tolerances.holePositionMm / 2;
      if (p.fitted.rmsMm > scatterLimit + LENGTH_TOLERANCE_MM) {
        out.push(
          finding(
            'alignment.fitScatter',
            'warning',
            `Pattern ${p.id}: the measured holes scatter ${f3(p.fitted.rmsMm)} RMS about the fitted circle, more than half the ${f3(r.spec.tolerances.holePositionMm)} position tolerance; re-measure before trusting the centre.`,
            ids,
            'fit RMS ≤ half the hole position tolerance',
            SOURCES.fitScatter,
          ),
        );
      }
    }
  }
}

function checkStarter(r: ResolvedPlate, out: Finding[]): void {
  const s = r.spec.starter;
  if (!s) return;
  const a = starterGearCentreDistanceMm(s);
  const placed = starterPlacedDistanceMm(s);
  const m = gearModuleMm(
    s.ringGear.moduleMm !== undefined
      ? { ringTeeth: s.ringGear.teeth, pinionTeeth: s.pinion.teeth, moduleMm: s.ringGear.moduleMm }
      : { ringTeeth: s.ringGear.teeth, pinionTeeth: s.pinion.teeth, diametralPitch: s.ringGear.diametralPitch! },
  );
  const delta = placed - a;
  const nose = r.features.find((f) => f.kind === 'starterBore')!;
  const at = { from: { x: 0, y: 0 }, to: nose.hole.center };
  const base = `Starter nose bore ${nose.hole.id} is ${f3(placed)} from the crank axis; the ring gear (${s.ringGear.teeth} teeth) and pinion (${s.pinion.teeth} teeth) need a = m(z1 + z2)/2 = ${f3(a)} (m = ${f3(m)})`;
  const rule = `|placed − a| ≤ ${STARTER_DISTANCE_WARNING_MODULES}·m (error beyond ${STARTER_DISTANCE_ERROR_MODULES}·m)`;
  if (Math.abs(delta) > STARTER_DISTANCE_ERROR_MODULES * m + LENGTH_TOLERANCE_MM) {
    out.push(
      finding(
        'starter.centreDistance',
        'error',
        `${base}: off by ${f3(delta)}, ${delta > 0 ? 'too shallow — the teeth barely mesh' : 'too deep — the teeth bind'}.`,
        [nose.hole.id],
        rule,
        SOURCES.gears,
        at,
      ),
    );
  } else if (Math.abs(delta) > STARTER_DISTANCE_WARNING_MODULES * m + LENGTH_TOLERANCE_MM) {
    out.push(
      finding(
        'starter.centreDistance',
        'warning',
        `${base}: off by ${f3(delta)}; check the mesh backlash.`,
        [nose.hole.id],
        rule,
        SOURCES.gears,
        at,
      ),
    );
  } else {
    out.push(finding('starter.centreDistance', 'note', `${base}.`, [nose.hole.id], rule, SOURCES.gears, at));
  }
}

function checkThickness(r: ResolvedPlate, out: Finding[]): void {
  const spec = r.spec;
  const t = spec.thicknessMm;
  const su = spec.stackUp;
  if (su?.plateThickness) {
    const v = plateThicknessStackUp(su.plateThickness);
    const need = v.result.nominalMm;
    const dev = t - need;
    const tol = spec.tolerances.thicknessMm;
    const rule = `plate thickness = required thickness ± ${f3(tol)}`;
    if (!v.ok) {
      out.push(finding('thickness.stackUp', 'error', v.message, [], rule, SOURCES.stackUp));
    } else if (Math.abs(dev) <= tol + LENGTH_TOLERANCE_MM) {
      out.push(finding('thickness.stackUp', 'note', `${v.message} The plate is ${f2(t)}.`, [], rule, SOURCES.stackUp));
    } else {
      const inBand = t >= v.result.worstCase.minMm - LENGTH_TOLERANCE_MM && t <= v.result.worstCase.maxMm + LENGTH_TOLERANCE_MM;
      out.push(
        finding(
          'thickness.stackUp',
          inBand ? 'warning' : 'error',
          `The plate is ${f2(t)} but the stack-up needs ${f2(need)} (${dev > 0 ? 'thicker' : 'thinner'} by ${f2(Math.abs(dev))}, worst case ${f2(v.result.worstCase.minMm)} to ${f2(v.result.worstCase.maxMm)}): the friction face moves ${f2(Math.abs(dev))} ${dev > 0 ? 'forward' : 'rearward'} of where the transmission expects it.${inBand ? ' It is still inside the chain’s worst-case band.' : ''}`,
          [],
          rule,
          SOURCES.stackUp,
        ),
      );
    }
  }
  const mismatch = (chain: string, value: number | undefined) => {
    if (value === undefined || Math.abs(value - t) <= LENGTH_TOLERANCE_MM) return;
    out.push(
      finding(
        'stackUp.thicknessMismatch',
        'warning',
        `stackUp.${chain} uses a plate thickness of ${f2(value)}, but the plate is ${f2(t)}: the ${chain} result is for a different plate.`,
        [],
        'stack-up inputs match the plate',
        SOURCES.stackUp,
      ),
    );
  };
  if (su?.pilot) {
    mismatch('pilot', su.pilot.plateThicknessMm.nominalMm);
    const v = pilotStackUp(su.pilot);
    const engagedOk = v.result.worstCase.minMm >= su.pilot.minimumEngagementMm - LENGTH_TOLERANCE_MM;
    const bottom = v.bottomClearance.result;
    const bottomOk = bottom.worstCase.minMm > 0 && bottom.worstCase.minMm >= (su.pilot.minimumBottomClearanceMm ?? 0) - LENGTH_TOLERANCE_MM;
    if (!engagedOk) {
      out.push(
        finding(
          'pilot.engagement',
          'error',
          `Pilot engagement ${f2(v.result.nominalMm)} nominal, ${f2(v.result.worstCase.minMm)} worst case, under the ${f2(su.pilot.minimumEngagementMm)} required: the plate pulls the input shaft back too far.`,
          [],
          'pilot engagement (worst case) ≥ minimum',
          SOURCES.stackUp,
        ),
      );
    }
    if (!bottomOk) {
      out.push(
        finding(
          'pilot.bottoming',
          'error',
          `The input shaft pilot can bottom in the crank: ${f2(bottom.nominalMm)} clearance nominal, ${f2(bottom.worstCase.minMm)} worst case.`,
          [],
          'pilot tip clear of the pilot bore bottom (worst case)',
          SOURCES.stackUp,
        ),
      );
    }
    if (engagedOk && bottomOk) out.push(finding('pilot.engagement', 'note', v.message, [], 'pilot engagement (worst case) ≥ minimum', SOURCES.stackUp));
  }
  if (su?.starterLanding) {
    mismatch('starterLanding', su.starterLanding.plateThicknessMm?.nominalMm);
    const v = starterLandingStackUp(su.starterLanding);
    out.push(finding('starter.landing', v.ok ? 'note' : 'error', v.message, [], 'pinion tooth overlap (worst case) ≥ minimum', SOURCES.stackUp));
  }
  if (su?.releaseBearing) {
    mismatch('releaseBearing', su.releaseBearing.plateThicknessMm.nominalMm);
    const v = releaseBearingStackUp(su.releaseBearing);
    out.push(
      finding('clutch.releaseBearing', v.ok ? 'note' : 'error', v.message, [], 'release bearing clearance at rest and travel to disengage', SOURCES.stackUp),
    );
  }

  // stock
  const system = spec.thicknessStock;
  const exact = matchingStock(t, system);
  const sizes = stockThicknesses(system);
  const rule = 'plate machined from stock; both faces faced flat';
  if (exact) {
    const next = stockAtLeast(exact.thicknessMm + 0.5, system);
    out.push(
      finding(
        'thickness.stock',
        'note',
        `${f2(t)} is a stock thickness (${exact.label}). Mill plate is not flat enough to use unfaced: order ${next ? next.label : 'thicker stock'} and face both sides, or use precision-ground / cast tooling plate of ${exact.label}.`,
        [],
        rule,
        SOURCES.stock,
      ),
    );
  } else {
    const from = stockAtLeast(t, system);
    if (!from) {
      out.push(
        finding(
          'thickness.stock',
          'warning',
          `${f2(t)} is thicker than the thickest stock listed (${sizes[sizes.length - 1]!.label}); the plate needs special stock or a stack of plates.`,
          [],
          rule,
          SOURCES.stock,
        ),
      );
    } else {
      out.push(
        finding(
          'thickness.stock',
          'note',
          `${f2(t)} is machined from ${from.label} stock, facing off ${f2(from.thicknessMm - t)}.`,
          [],
          rule,
          SOURCES.stock,
        ),
      );
    }
  }
}

// ---------------------------------------------------------------------------------------------

const SEVERITY_ORDER: Readonly<Record<Severity, number>> = { error: 0, warning: 1, note: 2 };

/**
 * Every design check of the plate, errors first. Throws only when the spec cannot be turned into
 * a plate at all (DomainError naming the field).
 */
export function checkPlate(spec: PlateSpec, resolved?: ResolvedPlate): Finding[] {
  // `resolved`: resolvePlate(spec) when the caller has it already (the editor lays out first)
  const r = resolved ?? resolvePlate(spec);
  const out: Finding[] = [];
  checkLigaments(r, out);
  checkOutline(r, out);
  checkPockets(r, out);
  checkClearanceSizes(r, out);
  checkThreads(r, out);
  checkCounterbores(r, out);
  checkDowels(r, out);
  checkAlignment(r, out);
  checkStarter(r, out);
  checkThickness(r, out);
  return out
    .map((f, i) => ({ f, i }))
    .sort((a, b) => SEVERITY_ORDER[a.f.severity] - SEVERITY_ORDER[b.f.severity] || a.i - b.i)
    .map((x) => x.f);
}

/** Counts by severity (for headers and badges). */
export function countFindings(findings: readonly Finding[]): { readonly error: number; readonly warning: number; readonly note: number } {
  const c = { error: 0, warning: 0, note: 0 };
  for (const f of findings) c[f.severity]++;
  return Object.freeze(c);
}

// ---------------------------------------------------------------------------------------------
// Layout gate for the CAD build



export { discVsPocket, layoutIsDisjoint, layoutProblems, MIN_WALL_MM } from './layout';
