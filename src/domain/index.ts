/**
 * Platewright's engineering core: the public entry point. Pure TypeScript, shared by the
 * browser, the CAD worker, the server and the tests. Lengths in mm, angles in degrees.
 */

// errors
export { DomainError, isDomainError } from './errors';

// the plate spec
export {
  plateSpecSchema,
  parsePlateSpec,
  specIssues,
  boltPatternSchema,
  holeSchema,
  measuredHoleSchema,
  faceSchema,
  centreBoreSchema,
  starterSchema,
  starterHoleSchema,
  starterRecessSchema,
  outlineSchema,
  materialSchema,
  tolerancesSchema,
  flangeFootprintSchema,
  counterboreSchema,
  dowelSchema,
  DEFAULT_MATERIAL,
  RESERVED_FEATURE_IDS,
} from './spec';
export type {
  PlateSpec,
  PlateSpecInput,
  FaceSpec,
  HoleSpec,
  MeasuredHoleSpec,
  BoltPatternSpec,
  StarterSpec,
  StarterHoleSpec,
  SpecIssue,
} from './spec';

// the 2D profile
export type * from './profileTypes';
export {
  plateProfile,
  resolvePlate,
  flangeFootprint,
  toPlateCoordinates,
  patternPositions,
  featureDisc,
  sideOfFace,
  otherSide,
  starterGearCentreDistanceMm,
  starterPlacedDistanceMm,
  starterNoseCentre,
  BLIND_TAP_LEAD_PITCHES,
} from './profile';
export type { FaceName, ResolvedFeature, ResolvedPocket, ResolvedPlate } from './profile';
export {
  autoOutline,
  hullOfDiscs,
  polygonOutline,
  circleOutline,
  outlineArea,
  outlineSignedAreaMm2,
  outlinePerimeterMm,
  outlineBBox,
  pointInOutline,
  windingNumber,
  distanceToOutline,
  signedDistanceToOutline,
  closestPointOnOutline,
  closestPointOnSegment,
  segmentLengthMm,
  segmentTangent,
  arcSweepDeg,
  arcSweepRad,
  OUTLINE_LENGTH_TOLERANCE_MM,
} from './outline';
export type { Disc } from './outline';

// checks
export {
  checkPlate,
  countFindings,
  layoutIsDisjoint,
  layoutProblems,
  discVsPocket,
  SOURCES as CHECK_SOURCES,
  MIN_WALL_MM,
  EDGE_MIN_FACTOR,
  EDGE_RECOMMENDED_FACTOR,
  PITCH_MIN_FACTOR,
  MIN_FLOOR_MM,
  FLOOR_FACTOR,
  THREAD_ENGAGEMENT_FACTORS,
  STARTER_DISTANCE_WARNING_MODULES,
  STARTER_DISTANCE_ERROR_MODULES,
} from './checks';
export type { Finding, Severity } from './checks';

// quoting
export { plateMass, profileVolume, chamferVolumeMm3, stockSize, cutLength } from './mass';
export type { PlateVolume, StockSize, CutLength } from './mass';
export * from './stockThickness';

// units, standards, geometry, fitting, stack-up
export * from './units';
export * from './standards/index';
export * from './geometry/boltCircle';
export * from './geometry/degrees';
export * from './fit/circle';
export * from './fit/plane';
export * from './fit/boltCircleFit';
export type { Points2, Points3 } from './fit/points';
export * from './stackUp';
