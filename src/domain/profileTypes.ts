/**
 * The 2D plate in plate coordinates — the contract between the domain (which computes it with
 * `plateProfile(spec)`), the CAD kernel (which turns it into a solid) and the 2D exports
 * (DXF, SVG, CSV, drawing).
 *
 * Plate coordinates (stated once, used everywhere):
 *  - origin on the crankshaft axis; lengths in millimetres, angles in degrees;
 *  - the plate is seen from the rear, i.e. standing behind the transmission looking forward at the
 *    plate's transmission side: +X to the viewer's right, +Y up;
 *  - Z runs along the crank axis from the engine side of the plate (z = 0) to the transmission
 *    side (z = thicknessMm).
 * An engine rear face measured looking at it is already seen from the rear (no mirror). A bell
 * housing measured looking at its mating face is seen from the front and is mirrored (x → −x)
 * into plate coordinates.
 */

export interface Point2 {
  readonly x: number;
  readonly y: number;
}

/** One piece of a closed outline. Arcs are true arcs: centre, radius, direction. */
export type OutlineSegment =
  | { readonly kind: 'line'; readonly start: Point2; readonly end: Point2 }
  | {
      readonly kind: 'arc';
      readonly start: Point2;
      readonly end: Point2;
      readonly center: Point2;
      readonly radiusMm: number;
      /** true = counter-clockwise from start to end (seen in plate coordinates) */
      readonly ccw: boolean;
    };

/** Which side of the plate a feature is machined from. */
export type PlateSide = 'engine' | 'transmission';

/** Machining operation of a round feature; one DXF layer per operation. */
export type HoleOperation =
  | 'through' // clearance hole, drilled/cut through
  | 'tapDrill' // tap drill for a tapped hole (thread given)
  | 'dowelReam' // reamed dowel hole (fit given)
  | 'centreBore' // crank flange / seal clearance or locating register
  | 'starterBore'; // starter nose bore

export interface ProfileCounterbore {
  readonly diameterMm: number;
  readonly depthMm: number;
  /** the side the counterbore is cut from */
  readonly fromSide: PlateSide;
}

export interface ProfileHole {
  /** feature id, the same everywhere (table, drawing, DXF, CSV, inspection), e.g. "E1", "T7", "D2" */
  readonly id: string;
  /** which flange pattern it belongs to ('plate' for centre bore, starter bore …) */
  readonly face: 'engine' | 'transmission' | 'plate';
  readonly operation: HoleOperation;
  readonly center: Point2;
  readonly diameterMm: number;
  /** null = through the whole thickness; otherwise a blind depth from `fromSide` */
  readonly depthMm: number | null;
  readonly fromSide: PlateSide;
  /** thread designation for tapped holes, e.g. "M10x1.5", "3/8-16 UNC" */
  readonly thread?: string;
  /** thread depth for tapped holes */
  readonly threadDepthMm?: number;
  /** fit designation and size limits for reamed/registered features, e.g. "H7" */
  readonly fit?: { readonly designation: string; readonly lowerMm: number; readonly upperMm: number };
  readonly counterbore?: ProfileCounterbore;
}

/** A recess (e.g. the starter pocket): closed outline, flat floor at depthMm from fromSide. */
export interface ProfilePocket {
  readonly id: string;
  readonly outline: readonly OutlineSegment[];
  readonly depthMm: number;
  readonly fromSide: PlateSide;
  readonly areaMm2: number;
}

export interface BoundingBox {
  readonly minX: number;
  readonly minY: number;
  readonly maxX: number;
  readonly maxY: number;
}

export interface PlateProfile {
  readonly thicknessMm: number;
  /** closed chain, counter-clockwise, each segment's end = next segment's start */
  readonly outline: readonly OutlineSegment[];
  /** outline area (without holes) */
  readonly outlineAreaMm2: number;
  readonly bbox: BoundingBox;
  /** 45° chamfer on both outer edges, 0 = none */
  readonly edgeChamferMm: number;
  readonly holes: readonly ProfileHole[];
  readonly pockets: readonly ProfilePocket[];
  readonly partLabel?: string;
}
