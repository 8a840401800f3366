/**
 * Puts a measured bolt pattern onto a face of the plate spec, for a new draft revision.
 *
 * The pattern is stored with explicit angles (as measured, in the view the builder chose) and its
 * `fitted` record: the bolt circle's centre relative to the face's shaft axis (the bore's axis
 * when a bore was fitted, else the bolt circle's own centre) and its RMS, with the upload it came
 * from, the angular RMS, the number of holes and, when a bore was fitted, the bolt circle's offset
 * from the bore axis and its TIR. The pattern's centre is placed so that the shaft axis lands on
 * the plate's origin. Each hole references its slot of the pattern and carries its own `fitted`
 * record (measured centre in face coordinates, Ø, RMS, roundness, rim points, arc coverage,
 * flags, nearest standard size, upload) and the same figures in words in its note, so the
 * engineer sees where every number came from.
 *
 * An earlier pattern with the same id on that face is replaced, with its holes.
 */
import { DomainError } from '../errors';
import type { ClearanceClass } from '../standards/clearanceHoles';
import { parsePlateSpec, type MeasuredHoleSpec, type PlateSpec } from '../spec';
import { HOLE_FLAG_TEXT, type HoleFlag } from './holeQuality';
import type { MeasuredPattern } from './pattern';

export type FaceName = 'engine' | 'transmission';

export interface AppliedHole {
  readonly id: string;
  readonly role: 'clearance' | 'tapped' | 'dowel' | 'stud';
  readonly fastener?: string;
  readonly clearanceClass?: ClearanceClass;
  readonly dowelDiameterMm?: number;
  /** the fit's figures for this hole */
  readonly quality: {
    /** the hole's fitted centre in the upload's face coordinates */
    readonly centerU: number;
    readonly centerV: number;
    readonly diameterMm: number;
    readonly rmsMm: number;
    readonly roundnessMm: number;
    readonly n: number;
    readonly arcCoverageDeg: number;
    readonly flags: readonly HoleFlag[];
    /** nearest standard size, e.g. "ISO 273 medium M10" and measured − standard */
    readonly nearest?: { readonly label: string; readonly differenceMm: number };
  };
}

export interface PatternToApply {
  readonly patternId: string;
  readonly viewedFrom: 'rear' | 'front';
  readonly measured: MeasuredPattern;
  /** the same order as measured.holes */
  readonly holes: readonly AppliedHole[];
  readonly fromUploadId: string;
  /** what the upload is, for the notes (file name) */
  readonly source?: string;
  /** the fitted bore whose axis is the face's shaft axis, if any */
  readonly bore?: { readonly diameterMm: number; readonly cylindricityMm?: number };
}

const r4 = (x: number) => Math.round(x * 1e4) / 1e4 + 0;
const f3 = (x: number) => x.toFixed(3);

function holeNote(h: AppliedHole, source: string): string {
  const q = h.quality;
  const parts = [
    `fitted from ${source}: Ø${f3(q.diameterMm)} mm, rms ${f3(q.rmsMm)} mm, roundness ${f3(q.roundnessMm)} mm, ${q.n} rim points over ${Math.round(q.arcCoverageDeg)}°`,
  ];
  if (q.nearest) parts.push(`nearest standard ${q.nearest.label} (${q.nearest.differenceMm >= 0 ? '+' : ''}${f3(q.nearest.differenceMm)} mm)`);
  parts.push(q.flags.length ? `flagged: ${q.flags.map((f) => HOLE_FLAG_TEXT[f]).join(', ')}` : 'no flags');
  return parts.join('; ').slice(0, 500);
}

function patternNote(p: PatternToApply, source: string): string {
  const bc = p.measured.boltCircle;
  const off = p.measured.offset;
  const base = `fitted from ${source}: Ø${f3(bc.diameterMm)} mm bolt circle over ${p.measured.holes.length} holes, rms ${f3(bc.rms)} mm, angular rms ${bc.angularRmsDeg.toFixed(3)}°`;
  const axis = off
    ? `; bolt circle centre ${f3(off.distanceMm)} mm from the bore axis (TIR ${f3(off.tirMm)} mm)`
    : '; no bore fitted: the bolt circle centre is taken as the shaft axis';
  return (base + axis).slice(0, 500);
}

/** The hole's own fit record, rounded to 0.1 µm like the pattern's figures. */
function measuredHole(h: AppliedHole, onCircle: MeasuredPattern['holes'][number], fromUploadId: string): MeasuredHoleSpec {
  const q = h.quality;
  return {
    fromUploadId,
    centerU: r4(q.centerU),
    centerV: r4(q.centerV),
    diameterMm: r4(q.diameterMm),
    rmsMm: r4(q.rmsMm),
    roundnessMm: r4(q.roundnessMm),
    points: q.n,
    arcCoverageDeg: r4(Math.min(360, Math.max(0, q.arcCoverageDeg))),
    flags: [...new Set(q.flags)],
    ...(q.nearest ? { nearest: { label: q.nearest.label.slice(0, 80), differenceMm: r4(q.nearest.differenceMm) } } : {}),
    radialDeviationMm: r4(onCircle.radialDeviationMm),
    angleDeviationDeg: r4(onCircle.deviationDeg),
  };
}

/** A new spec with the pattern on the face; the input spec is not changed. */
export function applyPatternToSpec(spec: PlateSpec, face: FaceName, pattern: PatternToApply): PlateSpec {
  if (pattern.holes.length !== pattern.measured.holes.length) {
    throw new DomainError('measure.apply', `The pattern has ${pattern.measured.holes.length} fitted holes but ${pattern.holes.length} hole settings.`, ['holes']);
  }
  const next = structuredClone(spec) as PlateSpec;
  const key = face === 'engine' ? 'engineFace' : 'transmissionFace';
  const f = next[key];
  f.patterns = f.patterns.filter((p) => p.id !== pattern.patternId);
  f.holes = f.holes.filter((h) => h.patternId !== pattern.patternId);
  if ((f.patterns.length > 0 || f.holes.length > 0) && f.viewedFrom !== pattern.viewedFrom) {
    throw new DomainError(
      'measure.viewedFrom',
      `The ${face} face already has holes measured as seen from the ${f.viewedFrom}; this pattern is seen from the ${pattern.viewedFrom}. Flip the view so both agree, or replace the face's other holes.`,
      ['viewedFrom'],
    );
  }
  f.viewedFrom = pattern.viewedFrom;

  const taken = new Map<string, string>();
  for (const k of ['engineFace', 'transmissionFace'] as const) for (const h of next[k].holes) taken.set(h.id, k);
  for (const h of next.starter?.mountingHoles ?? []) taken.set(h.id, 'starter');
  for (const h of pattern.holes) {
    const where = taken.get(h.id);
    if (where) throw new DomainError('measure.holeId', `Hole id "${h.id}" is already used on the plate (${where}); choose another id.`, ['holes', h.id]);
    taken.set(h.id, key);
  }

  const bc = pattern.measured.boltCircle;
  const axis = pattern.measured.axis;
  const off = pattern.measured.offset;
  const fitted: NonNullable<PlateSpec['engineFace']['patterns'][number]['fitted']> = {
    centerX: r4(axis ? bc.centerX - axis.x : 0),
    centerY: r4(axis ? bc.centerY - axis.y : 0),
    rmsMm: r4(bc.rms),
    fromUploadId: pattern.fromUploadId,
    angularRmsDeg: r4(bc.angularRmsDeg),
    holeCount: pattern.measured.holes.length,
  };
  if (axis && off) {
    fitted.bore = {
      offsetMm: r4(off.distanceMm),
      tirMm: r4(off.tirMm),
      ...(pattern.bore ? { diameterMm: r4(pattern.bore.diameterMm) } : {}),
      ...(pattern.bore?.cylindricityMm !== undefined ? { cylindricityMm: r4(pattern.bore.cylindricityMm) } : {}),
      tiltDeg: r4(Math.min(90, Math.max(0, axis.tiltDeg))),
    };
  }
  const source = pattern.source ? `upload ${pattern.fromUploadId} (${pattern.source})` : `upload ${pattern.fromUploadId}`;
  f.patterns.push({
    id: pattern.patternId,
    diameterMm: r4(bc.diameterMm),
    anglesDeg: pattern.measured.holes.map((h) => r4(h.angleDeg)),
    centerX: fitted.centerX,
    centerY: fitted.centerY,
    fitted,
    note: patternNote(pattern, source),
  } as PlateSpec['engineFace']['patterns'][number]);
  pattern.holes.forEach((h, index) => {
    const hole: Record<string, unknown> = { id: h.id, role: h.role, patternId: pattern.patternId, index, fitted: measuredHole(h, pattern.measured.holes[index]!, pattern.fromUploadId), note: holeNote(h, source) };
    if (h.role === 'dowel') hole.dowel = { diameterMm: h.dowelDiameterMm ?? r4(h.quality.diameterMm), fit: 'H7' };
    else {
      if (h.fastener) hole.fastener = h.fastener;
      if (h.clearanceClass && (h.role === 'clearance' || h.role === 'stud')) hole.clearanceClass = h.clearanceClass;
    }
    f.holes.push(hole as PlateSpec['engineFace']['holes'][number]);
  });
  return parsePlateSpec(next);
}
