/**
 * What is inspected on a released plate and against which limit: one entry per hole of the
 * profile (ids as in the hole table and holes.csv), plus the plate's thickness and flatness and
 * the concentricity of each face's bolt circle to the datum (crank axis). Every limit names its
 * source: the spec's tolerances (stated there or its default), ISO 286 for fitted features.
 */
import type { PlateProfile, ProfileHole, HoleOperation } from '../profileTypes';
import { fitCircle } from '../fit/circle';

export interface InspectionTolerances {
  readonly alignmentTirMm: number;
  readonly generalMm: number;
  readonly holePositionMm: number;
  readonly thicknessMm: number;
  readonly flatnessMm: number;
}

export type ToleranceKey = keyof InspectionTolerances;

export interface Limit {
  readonly lowerMm: number;
  readonly upperMm: number;
  /** e.g. "H7", "±0.10" */
  readonly label: string;
  readonly source: string;
}

export interface PlannedHole {
  readonly id: string;
  readonly face: ProfileHole['face'];
  readonly operation: HoleOperation;
  readonly nominal: { readonly x: number; readonly y: number };
  readonly diameterMm: number;
  /** position zone diameter */
  readonly positionToleranceMm: number;
  readonly positionSource: string;
  readonly size: Limit;
  /** a fitted feature (dowel ream, register, nose bore with a fit): its Ø must be measured */
  readonly sizeRequired: boolean;
  /** nominal depth that can be checked (blind depth, else counterbore depth) */
  readonly depth: (Limit & { readonly nominalMm: number; readonly what: 'hole' | 'counterbore' }) | null;
  readonly thread?: string;
}

export interface PlannedPattern {
  /** "BC-engine", "BC-transmission" */
  readonly id: string;
  readonly face: 'engine' | 'transmission';
  readonly holeIds: readonly string[];
  readonly nominalCentre: { readonly x: number; readonly y: number };
  readonly nominalDiameterMm: number;
  /** diameter-zone offset of the fitted centre from the datum, same form as the TIR it causes */
  readonly toleranceMm: number;
  readonly source: string;
}

export interface InspectionPlan {
  readonly holes: readonly PlannedHole[];
  readonly patterns: readonly PlannedPattern[];
  readonly thickness: Limit & { readonly nominalMm: number };
  readonly flatness: { readonly toleranceMm: number; readonly source: string };
  readonly tolerances: InspectionTolerances;
}

/** Feature ids of the inspection that are not holes: thickness points, flatness. */
export const THICKNESS_ID_RE = /^THK\d{1,3}$/;
export const FLATNESS_POINT_ID_RE = /^FP\d{1,3}$/;
export const FLATNESS_ID = 'FLAT';

/** A nominal pattern counts as a bolt circle when its centres lie on one circle within this (mm RMS). */
const PATTERN_CIRCLE_RMS_MM = 0.01;

export function toleranceSource(key: ToleranceKey, explicit: ReadonlySet<ToleranceKey>): string {
  return explicit.has(key) ? `spec tolerances.${key}` : `spec tolerances.${key} (default; common practice)`;
}

function fmt(v: number): string {
  return v.toFixed(3).replace(/0$/, '');
}

function isIsoClass(designation: string): boolean {
  return /^[A-Z]\d{1,2}$/.test(designation.trim());
}

export function inspectionPlan(
  profile: PlateProfile,
  tolerances: InspectionTolerances,
  /** tolerance keys the spec states itself (the rest are the schema's defaults) */
  explicit: ReadonlySet<ToleranceKey> = new Set(),
): InspectionPlan {
  const src = (k: ToleranceKey) => toleranceSource(k, explicit);
  const general = tolerances.generalMm;
  const holes: PlannedHole[] = profile.holes.map((h) => {
    const isDatumBore = h.operation === 'centreBore';
    const size: Limit = h.fit
      ? {
          lowerMm: h.fit.lowerMm,
          upperMm: h.fit.upperMm,
          label: h.fit.designation === 'limits' ? `${fmt(h.fit.lowerMm)}…${fmt(h.fit.upperMm)}` : h.fit.designation,
          source: isIsoClass(h.fit.designation) ? `ISO 286-1 ${h.fit.designation} (isoTolerance)` : 'spec limitsMm',
        }
      : { lowerMm: h.diameterMm - general, upperMm: h.diameterMm + general, label: `±${fmt(general)}`, source: src('generalMm') };
    const depth =
      h.depthMm !== null
        ? { nominalMm: h.depthMm, what: 'hole' as const }
        : h.counterbore
          ? { nominalMm: h.counterbore.depthMm, what: 'counterbore' as const }
          : null;
    return Object.freeze({
      id: h.id,
      face: h.face,
      operation: h.operation,
      nominal: Object.freeze({ x: h.center.x, y: h.center.y }),
      diameterMm: h.diameterMm,
      // the centre bore is the datum feature's bore: its offset is the runout it causes (TIR = 2e)
      positionToleranceMm: isDatumBore ? tolerances.alignmentTirMm : tolerances.holePositionMm,
      positionSource: isDatumBore ? `${src('alignmentTirMm')}, TIR = 2 × offset` : src('holePositionMm'),
      size: Object.freeze(size),
      sizeRequired: h.fit !== undefined,
      depth: depth
        ? Object.freeze({ ...depth, lowerMm: depth.nominalMm - general, upperMm: depth.nominalMm + general, label: `±${fmt(general)}`, source: src('generalMm') })
        : null,
      ...(h.thread ? { thread: h.thread } : {}),
    });
  });

  const patterns: PlannedPattern[] = [];
  for (const face of ['engine', 'transmission'] as const) {
    const members = holes.filter((h) => h.face === face && (h.operation === 'through' || h.operation === 'tapDrill'));
    if (members.length < 3) continue;
    const c = fitCircle(members.map((h) => h.nominal), { method: 'geometric' });
    if (!(c.rms <= PATTERN_CIRCLE_RMS_MM)) continue; // not one circle: no bolt-circle centre to check
    patterns.push(
      Object.freeze({
        id: `BC-${face}`,
        face,
        holeIds: Object.freeze(members.map((h) => h.id)),
        nominalCentre: Object.freeze({ x: c.centerX, y: c.centerY }),
        nominalDiameterMm: 2 * c.radius,
        toleranceMm: tolerances.alignmentTirMm,
        source: `${src('alignmentTirMm')}, TIR = 2 × offset`,
      }),
    );
  }

  return Object.freeze({
    holes: Object.freeze(holes),
    patterns: Object.freeze(patterns),
    thickness: Object.freeze({
      nominalMm: profile.thicknessMm,
      lowerMm: profile.thicknessMm - tolerances.thicknessMm,
      upperMm: profile.thicknessMm + tolerances.thicknessMm,
      label: `±${fmt(tolerances.thicknessMm)}`,
      source: src('thicknessMm'),
    }),
    flatness: Object.freeze({ toleranceMm: tolerances.flatnessMm, source: src('flatnessMm') }),
    tolerances: Object.freeze({ ...tolerances }),
  });
}

/** Is this a feature id the inspection of this plan knows? */
export function isKnownFeatureId(plan: InspectionPlan, id: string): boolean {
  return THICKNESS_ID_RE.test(id) || FLATNESS_POINT_ID_RE.test(id) || id === FLATNESS_ID || plan.holes.some((h) => h.id === id);
}

/** The plan of a validated spec; `raw` (the stored document) tells which tolerances it states itself. */
export function inspectionPlanFor(profile: PlateProfile, tolerances: InspectionTolerances, raw?: unknown): InspectionPlan {
  const stated = (raw as { tolerances?: Record<string, unknown> } | null | undefined)?.tolerances ?? {};
  const explicit = new Set((Object.keys(tolerances) as ToleranceKey[]).filter((k) => typeof stated[k] === 'number'));
  return inspectionPlan(profile, tolerances, explicit);
}
