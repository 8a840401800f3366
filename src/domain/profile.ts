/**
 * From the plate spec to the 2D plate in plate coordinates (`PlateProfile`, see
 * `profileTypes.ts`): the one place where patterns become holes, faces are mirrored, standard
 * sizes are looked up and feature ids are handed out.
 *
 * Coordinates. Plate coordinates are those of `profileTypes.ts`: origin on the crank axis, the
 * plate seen from the rear (+X right, +Y up), z = 0 on the engine side. A face given with
 * `viewedFrom: 'rear'` is already in plate coordinates (the engine's rear face, measured looking
 * at it). A face given with `viewedFrom: 'front'` was measured looking at it from the other
 * direction (the bell housing's mating face, measured looking at it) and is mirrored: x → −x,
 * y unchanged — its holes, pattern centres, fitted centres and footprint polygon alike. Pattern
 * angles are counter-clockwise from +X in the face's own (measured) coordinates.
 *
 * Sides and sizes.
 * - Clearance hole of a face: a bolt passes. Its head (or, for a stud, its nut) bears on the
 *   plate on the side away from that face's flange (an engine-face bolt comes from the
 *   transmission side and threads into the block), unless the face's `boltHeadSide` says the
 *   bolts come through the flange — then the nut bears on the other side, which is the same
 *   side. So the fastener's seat is always on the side away from the face; its counterbore is cut
 *   from there unless given. Size: `diameterMm`, else ISO 273 / ASME B18.2.8 by class (default
 *   medium / normal).
 * - Tapped hole of a face: the bolt comes through that face's flange, so the hole is tapped from
 *   that face's side (engine-face tapped holes from z = 0, transmission-face ones from
 *   z = thickness). Tap drill from the tap-drill table; thread depth defaults to the hole depth
 *   (through: the plate thickness; blind: depth − 3 pitches of tap lead, common practice).
 * - Dowel hole: reamed to `dowel.diameterMm` with the ISO 286 limits of its fit, from its face's side.
 * - Centre bore `C1`; starter nose bore `S1` on `starter.angleDeg` at the ring gear / pinion
 *   centre distance (or `starter.centreDistanceMm`); starter mounting holes by their own ids,
 *   tapped from the starter's side; starter recess `P1`.
 */
import { DomainError } from './errors';
import { featureDisc } from './layout';
import { boltCircle } from './geometry/boltCircle';
import { cosDeg, sinDeg } from './geometry/degrees';
import { autoOutline, circleOutline, hullOfDiscs, outlineArea, outlineBBox, polygonOutline, type Disc } from './outline';
import type { OutlineSegment, PlateProfile, PlateSide, Point2, ProfileCounterbore, ProfileHole, ProfilePocket } from './profileTypes';
import { RESERVED_FEATURE_IDS, type BoltPatternSpec, type FaceSpec, type PlateSpec, type StarterHoleSpec, type StarterSpec } from './spec';
import { capScrewHead } from './standards/capScrews';
import { clearanceHoleMm, type ClearanceClass } from './standards/clearanceHoles';
import { gearCenterDistanceMm } from './standards/gears';
import { isoLimitsMm } from './standards/isoFits';
import { tapDrillMm } from './standards/tapDrills';
import { parseFastener, parseThread, type Fastener } from './standards/threads';

export type FaceName = 'engineFace' | 'transmissionFace';

/** Threads a plug tap does not cut fully at the bottom of a blind hole (common practice). */
export const BLIND_TAP_LEAD_PITCHES = 3;

/** The side of the plate a face's flange sits against. */
export function sideOfFace(face: FaceName): PlateSide {
  return face === 'engineFace' ? 'engine' : 'transmission';
}

export function otherSide(side: PlateSide): PlateSide {
  return side === 'engine' ? 'transmission' : 'engine';
}

/** A point of a face, as measured, in plate coordinates (mirrored when seen from the front). */
export function toPlateCoordinates(p: Point2, viewedFrom: 'rear' | 'front'): Point2 {
  return Object.freeze({ x: viewedFrom === 'front' ? (p.x === 0 ? 0 : -p.x) : p.x, y: p.y });
}

/** Hole positions of a bolt pattern, in the face's own (measured) coordinates, slot by slot. */
export function patternPositions(p: BoltPatternSpec): Point2[] {
  const holes =
    p.anglesDeg !== undefined
      ? boltCircle({ diameterMm: p.diameterMm, anglesDeg: p.anglesDeg, centerX: p.centerX, centerY: p.centerY })
      : boltCircle({ diameterMm: p.diameterMm, count: p.count!, startAngleDeg: p.startAngleDeg ?? 0, centerX: p.centerX, centerY: p.centerY });
  return holes.map((h) => Object.freeze({ x: h.x, y: h.y }));
}

/** What the checks need to know about a round feature beyond its 2D shape. */
export interface ResolvedFeature {
  readonly hole: ProfileHole;
  readonly kind: 'faceHole' | 'centreBore' | 'starterBore' | 'starterHole';
  /** the flange the hole belongs to; null for the plate's own features */
  readonly faceName: FaceName | null;
  readonly role: 'clearance' | 'tapped' | 'dowel' | 'stud' | null;
  readonly fastener: Fastener | null;
  /** clearance/stud: the side the bolt head or nut bears on the plate */
  readonly seatSide: PlateSide | null;
  /** clearance/stud: what bears there */
  readonly seat: 'head' | 'nut' | null;
  /** the diameter was given in the spec instead of looked up */
  readonly explicitDiameter: boolean;
  /** the counterbore's size was given in the spec instead of taken from the cap screw table */
  readonly explicitCounterbore: boolean;
  /** bolt pattern of the face this hole sits on, if any */
  readonly patternId: string | null;
  /** where the feature is defined in the spec, e.g. ['engineFace', 'holes', 3] */
  readonly specPath: readonly (string | number)[];
}

export interface ResolvedPocket {
  readonly pocket: ProfilePocket;
  readonly specPath: readonly (string | number)[];
  /** the discs whose hull the pocket is (for the automatic outline) */
  readonly discs: readonly Disc[];
}

export interface ResolvedPlate {
  readonly spec: PlateSpec;
  readonly profile: PlateProfile;
  readonly features: readonly ResolvedFeature[];
  readonly pockets: readonly ResolvedPocket[];
}

function defaultClearanceClass(f: Fastener): ClearanceClass {
  return f.system === 'metric' ? 'medium' : 'normal';
}

/** Wraps a standards lookup so a failure names the spec field it came from. */
function at<T>(path: readonly (string | number)[], fn: () => T): T {
  try {
    return fn();
  } catch (e) {
    if (e instanceof DomainError) {
      const where = path.join('.');
      throw new DomainError(e.code, `${where}: ${e.message}`, [...path]);
    }
    throw e;
  }
}

interface HoleLike {
  readonly id: string;
  readonly role: 'clearance' | 'tapped' | 'dowel' | 'stud';
  readonly fastener?: string;
  readonly clearanceClass?: ClearanceClass;
  readonly diameterMm?: number;
  readonly counterbore?: { readonly side?: PlateSide; readonly diameterMm?: number; readonly depthMm?: number };
  readonly threadDepthMm?: number;
  readonly dowel?: { readonly diameterMm: number; readonly fit: string };
  readonly depthMm?: number;
}

/** One hole of a flange or of the starter: its operation, size, side, thread, fit, counterbore. */
function resolveHole(
  h: HoleLike,
  center: Point2,
  ctx: {
    readonly face: ProfileHole['face'];
    /** the side the hole is entered from by its own fastener (the flange side) */
    readonly ownSide: PlateSide;
    /** the bolts come through the flange (head on the flange, nut on the plate's other side) */
    readonly throughFlange: boolean;
    readonly thicknessMm: number;
    readonly path: readonly (string | number)[];
  },
): Omit<ResolvedFeature, 'kind' | 'faceName' | 'patternId'> {
  const { path } = ctx;
  const base = { id: h.id, face: ctx.face, center };
  if (h.role === 'dowel') {
    const d = h.dowel!;
    const limits = at([...path, 'dowel', 'fit'], () => isoLimitsMm(d.diameterMm, d.fit));
    const hole: ProfileHole = Object.freeze({
      ...base,
      operation: 'dowelReam' as const,
      diameterMm: d.diameterMm,
      depthMm: h.depthMm ?? null,
      fromSide: ctx.ownSide,
      fit: Object.freeze({ designation: d.fit, lowerMm: limits.lowerMm, upperMm: limits.upperMm }),
    });
    return { hole, role: 'dowel', fastener: null, seatSide: null, seat: null, explicitDiameter: false, explicitCounterbore: false, specPath: path };
  }
  const fastener = at([...path, 'fastener'], () => parseFastener(h.fastener!));
  if (h.role === 'tapped') {
    const thread = at([...path, 'fastener'], () => parseThread(h.fastener!));
    const drill = h.diameterMm ?? at([...path, 'fastener'], () => tapDrillMm(h.fastener!));
    const depthMm = h.depthMm ?? null;
    const fullDepth = depthMm === null ? ctx.thicknessMm : Math.max(0, depthMm - BLIND_TAP_LEAD_PITCHES * thread.pitchMm);
    const hole: ProfileHole = Object.freeze({
      ...base,
      operation: 'tapDrill' as const,
      diameterMm: drill,
      depthMm,
      fromSide: ctx.ownSide,
      thread: thread.designation,
      threadDepthMm: h.threadDepthMm ?? fullDepth,
    });
    return {
      hole,
      role: 'tapped',
      fastener,
      seatSide: null,
      seat: null,
      explicitDiameter: h.diameterMm !== undefined,
      explicitCounterbore: false,
      specPath: path,
    };
  }
  // clearance or stud: the fastener's seat is on the side away from the flange
  const seatSide = otherSide(ctx.ownSide);
  const seat: 'head' | 'nut' = h.role === 'stud' || ctx.throughFlange ? 'nut' : 'head';
  const diameterMm =
    h.diameterMm ?? at([...path, 'fastener'], () => clearanceHoleMm(h.fastener!, h.clearanceClass ?? defaultClearanceClass(fastener)));
  let counterbore: ProfileCounterbore | undefined;
  const cb = h.counterbore;
  if (cb) {
    const needTable = cb.diameterMm === undefined || cb.depthMm === undefined;
    const head = needTable ? at([...path, 'counterbore'], () => capScrewHead(h.fastener!)) : null;
    counterbore = Object.freeze({
      diameterMm: cb.diameterMm ?? head!.counterboreDiameterMm,
      depthMm: cb.depthMm ?? head!.counterboreDepthMm,
      fromSide: cb.side ?? seatSide,
    });
  }
  const hole: ProfileHole = Object.freeze({
    ...base,
    operation: 'through' as const,
    diameterMm,
    depthMm: null,
    fromSide: counterbore?.fromSide ?? seatSide,
    ...(counterbore ? { counterbore } : {}),
  });
  return {
    hole,
    role: h.role,
    fastener,
    seatSide,
    seat,
    explicitDiameter: h.diameterMm !== undefined,
    explicitCounterbore: cb !== undefined && cb.diameterMm !== undefined && cb.depthMm !== undefined,
    specPath: path,
  };
}

/** Every hole of one flange, in plate coordinates, in spec order. */
function resolveFace(spec: PlateSpec, faceName: FaceName): ResolvedFeature[] {
  const face: FaceSpec = spec[faceName];
  const ownSide = sideOfFace(faceName);
  const positions = new Map<string, Point2[]>();
  face.patterns.forEach((p, i) => positions.set(p.id, at([faceName, 'patterns', i], () => patternPositions(p))));
  const throughFlange = face.boltHeadSide !== undefined && face.boltHeadSide === ownSide;
  return face.holes.map((h, i) => {
    const path = [faceName, 'holes', i] as const;
    let measured: Point2;
    if (h.patternId !== undefined) {
      const slots = positions.get(h.patternId);
      const p = slots?.[h.index!];
      if (!p) {
        throw new DomainError('spec.pattern', `${path.join('.')}.patternId: no slot ${h.index} in pattern "${h.patternId}" of ${faceName}.`, [
          ...path,
          'patternId',
        ]);
      }
      measured = p;
    } else {
      measured = { x: h.x!, y: h.y! };
    }
    const r = resolveHole(h, toPlateCoordinates(measured, face.viewedFrom), {
      face: ownSide,
      ownSide,
      throughFlange,
      thicknessMm: spec.thicknessMm,
      path,
    });
    return Object.freeze({ ...r, kind: 'faceHole' as const, faceName, patternId: h.patternId ?? null });
  });
}

/** Centre distance of the ring gear and the starter pinion (ISO 21771: a = m(z1 + z2)/2), mm. */
export function starterGearCentreDistanceMm(starter: StarterSpec): number {
  const g = starter.ringGear;
  return at(['starter', 'ringGear'], () =>
    g.moduleMm !== undefined
      ? gearCenterDistanceMm({ ringTeeth: g.teeth, pinionTeeth: starter.pinion.teeth, moduleMm: g.moduleMm })
      : gearCenterDistanceMm({ ringTeeth: g.teeth, pinionTeeth: starter.pinion.teeth, diametralPitch: g.diametralPitch! }),
  );
}

/** Where the starter nose bore is put from the axis: the given distance, else the gear centre distance. */
export function starterPlacedDistanceMm(starter: StarterSpec): number {
  return starter.centreDistanceMm ?? starterGearCentreDistanceMm(starter);
}

/** Centre of the starter nose bore in plate coordinates. */
export function starterNoseCentre(starter: StarterSpec): Point2 {
  const a = starterPlacedDistanceMm(starter);
  return Object.freeze({ x: a * cosDeg(starter.angleDeg), y: a * sinDeg(starter.angleDeg) });
}

/** Unit vectors of the starter's frame: radial (outward through the nose) and tangential (90° CCW). */
function starterFrame(starter: StarterSpec): { u: Point2; v: Point2 } {
  const c = cosDeg(starter.angleDeg);
  const s = sinDeg(starter.angleDeg);
  return { u: { x: c, y: s }, v: { x: -s, y: c } };
}

function resolveStarter(spec: PlateSpec): { features: ResolvedFeature[]; pockets: ResolvedPocket[] } {
  const starter = spec.starter;
  if (!starter) return { features: [], pockets: [] };
  const nose = starterNoseCentre(starter);
  const { u, v } = starterFrame(starter);
  const features: ResolvedFeature[] = [];
  const noseFit = starter.noseFit
    ? at(['starter', 'noseFit'], () => isoLimitsMm(starter.noseBoreDiameterMm, starter.noseFit!))
    : null;
  features.push(
    Object.freeze({
      hole: Object.freeze({
        id: RESERVED_FEATURE_IDS.starterBore,
        face: 'plate' as const,
        operation: 'starterBore' as const,
        center: nose,
        diameterMm: starter.noseBoreDiameterMm,
        depthMm: null,
        fromSide: starter.side,
        ...(noseFit ? { fit: Object.freeze({ designation: starter.noseFit!, ...noseFit }) } : {}),
      }),
      kind: 'starterBore' as const,
      faceName: null,
      role: null,
      fastener: null,
      seatSide: null,
      seat: null,
      explicitDiameter: true,
      explicitCounterbore: false,
      patternId: null,
      specPath: ['starter', 'noseBoreDiameterMm'],
    }),
  );
  starter.mountingHoles.forEach((h: StarterHoleSpec, i) => {
    const center = Object.freeze({
      x: nose.x + u.x * h.radialMm + v.x * h.tangentialMm,
      y: nose.y + u.y * h.radialMm + v.y * h.tangentialMm,
    });
    const r = resolveHole(h, center, {
      face: 'plate',
      ownSide: starter.side,
      throughFlange: false,
      thicknessMm: spec.thicknessMm,
      path: ['starter', 'mountingHoles', i],
    });
    features.push(Object.freeze({ ...r, kind: 'starterHole' as const, faceName: null, patternId: null }));
  });

  const pockets: ResolvedPocket[] = [];
  const recess = starter.recess;
  if (recess) {
    let discs: Disc[];
    let outline: OutlineSegment[];
    if (recess.shape.kind === 'circle' || recess.shape.lengthMm - recess.shape.widthMm <= 1e-9) {
      const r = (recess.shape.kind === 'circle' ? recess.shape.diameterMm : recess.shape.widthMm) / 2;
      discs = [{ center: nose, radiusMm: r }];
      outline = circleOutline(nose, r);
    } else {
      const half = (recess.shape.lengthMm - recess.shape.widthMm) / 2;
      const r = recess.shape.widthMm / 2;
      discs = [
        { center: { x: nose.x - v.x * half, y: nose.y - v.y * half }, radiusMm: r },
        { center: { x: nose.x + v.x * half, y: nose.y + v.y * half }, radiusMm: r },
      ];
      outline = hullOfDiscs(discs);
    }
    pockets.push(
      Object.freeze({
        pocket: Object.freeze({
          id: RESERVED_FEATURE_IDS.starterPocket,
          outline: Object.freeze(outline),
          depthMm: recess.depthMm,
          fromSide: recess.side ?? starter.side,
          areaMm2: outlineArea(outline),
        }),
        specPath: ['starter', 'recess'],
        discs: Object.freeze(discs),
      }),
    );
  }
  return { features, pockets };
}

function resolveCentreBore(spec: PlateSpec): ResolvedFeature {
  const c = spec.centreBore;
  const limits = c.fit
    ? at(['centreBore', 'fit'], () => isoLimitsMm(c.diameterMm, c.fit!))
    : (c.limitsMm ?? null);
  const designation = c.fit ?? 'limits';
  return Object.freeze({
    hole: Object.freeze({
      id: RESERVED_FEATURE_IDS.centreBore,
      face: 'plate' as const,
      operation: 'centreBore' as const,
      center: Object.freeze({ x: 0, y: 0 }),
      diameterMm: c.diameterMm,
      depthMm: null,
      fromSide: 'transmission' as const,
      ...(limits ? { fit: Object.freeze({ designation, lowerMm: limits.lowerMm, upperMm: limits.upperMm }) } : {}),
    }),
    kind: 'centreBore' as const,
    faceName: null,
    role: null,
    fastener: null,
    seatSide: null,
    seat: null,
    explicitDiameter: true,
    explicitCounterbore: false,
    patternId: null,
    specPath: ['centreBore'],
  });
}

export { featureDisc } from './layout';

/**
 * Resolves the whole plate: the profile plus what the checks need (roles, fasteners, seats,
 * spec paths).
 * @throws DomainError naming the spec field when a size cannot be looked up or the outline cannot be made
 */
export function resolvePlate(spec: PlateSpec): ResolvedPlate {
  const centre = resolveCentreBore(spec);
  const engine = resolveFace(spec, 'engineFace');
  const transmission = resolveFace(spec, 'transmissionFace');
  const starter = resolveStarter(spec);
  const features = [...engine, ...transmission, centre, ...starter.features];

  let outline: OutlineSegment[];
  if (spec.outline.kind === 'auto') {
    const discs = [...features.map((f) => featureDisc(f.hole)), ...starter.pockets.flatMap((p) => p.discs)];
    outline = autoOutline(discs, { edgeMarginMm: spec.outline.edgeMarginMm, cornerRadiusMm: spec.outline.cornerRadiusMm });
  } else {
    outline = polygonOutline(spec.outline.points, spec.outline.cornerRadiusMm, spec.outline.cornerRadiiMm);
  }
  const profile: PlateProfile = Object.freeze({
    thicknessMm: spec.thicknessMm,
    outline: Object.freeze(outline),
    outlineAreaMm2: outlineArea(outline),
    bbox: outlineBBox(outline),
    edgeChamferMm: spec.edgeChamferMm,
    holes: Object.freeze(features.map((f) => f.hole)),
    pockets: Object.freeze(starter.pockets.map((p) => p.pocket)),
    ...(spec.partLabel !== undefined ? { partLabel: spec.partLabel } : {}),
  });
  return Object.freeze({ spec, profile, features: Object.freeze(features), pockets: Object.freeze(starter.pockets) });
}

/**
 * The 2D plate in plate coordinates: outline (closed CCW chain of lines and true arcs), every
 * round feature with its operation, and the pockets. Feature ids are the spec's; the plate's own
 * are `C1` (centre bore), `S1` (starter nose bore), `P1` (starter pocket).
 */
export function plateProfile(spec: PlateSpec): PlateProfile {
  return resolvePlate(spec).profile;
}

/**
 * The contact region of a face's flange on the plate, in plate coordinates: the hull of the
 * face's holes grown by the footprint margin, or the face's own footprint polygon (mirrored like
 * its holes). Null when a hull is asked for but the face has no holes.
 */
export function flangeFootprint(resolved: ResolvedPlate, faceName: FaceName): OutlineSegment[] | null {
  const face = resolved.spec[faceName];
  const fp = face.flangeFootprint;
  if (fp.kind === 'polygon') {
    return at([faceName, 'flangeFootprint', 'points'], () =>
      polygonOutline(fp.points.map((p) => toPlateCoordinates(p, face.viewedFrom))),
    );
  }
  const holes = resolved.features.filter((f) => f.faceName === faceName).map((f) => f.hole);
  if (holes.length === 0) return null;
  return hullOfDiscs(holes.map((h) => ({ center: h.center, radiusMm: h.diameterMm / 2 + fp.marginMm })));
}
