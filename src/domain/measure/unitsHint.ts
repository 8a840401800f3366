/**
 * Units of a measurement file. Files carry no units, so the builder chooses mm or inch; the size
 * of the point cloud says whether that choice is plausible. The thresholds are ours (common
 * practice for bolted flanges): an engine or bell-housing face is a few hundred millimetres
 * across, a single probed hole or bore a few to a hundred or so.
 */
import { MM_PER_IN, type LengthUnit } from '../units';
import type { BoundingBox } from './pointBuffer';

/** Largest span of the points along x, y or z, in file units. */
export function extentOf(bbox: BoundingBox): number {
  return Math.max(bbox.max.x - bbox.min.x, bbox.max.y - bbox.min.y, bbox.max.z - bbox.min.z);
}

export const MM_SCALE: Readonly<Record<LengthUnit, number>> = Object.freeze({ mm: 1, in: MM_PER_IN });

/** Below this span (file units) a file is more likely inches: 40 in ≈ 1 m is the largest flange we expect. */
const INCH_SPAN_LIMIT = 40;
const LARGEST_PLAUSIBLE_MM = 1500;
const SMALLEST_PLAUSIBLE_MM = 2;

export interface UnitsGuess {
  readonly guess: LengthUnit;
  readonly reason: string;
}

export function guessUnits(bbox: BoundingBox, fromHeader: LengthUnit | null = null): UnitsGuess {
  if (fromHeader) return { guess: fromHeader, reason: `the file says ${fromHeader === 'mm' ? 'millimetres' : 'inches'}` };
  const e = extentOf(bbox);
  const show = e.toPrecision(3);
  if (e < INCH_SPAN_LIMIT) {
    return { guess: 'in', reason: `the points span ${show} units: ${(e * MM_PER_IN).toFixed(0)} mm if inches (a flange face), ${show} mm if millimetres (a single hole or bore)` };
  }
  return { guess: 'mm', reason: `the points span ${show} units: ${show} mm if millimetres, ${((e * MM_PER_IN) / 1000).toFixed(1)} m if inches — too large for a flange` };
}

export interface UnitsCheck {
  readonly plausible: boolean;
  readonly extentMm: number;
  readonly message: string;
}

/** Is the chosen unit plausible for the size of the cloud? */
export function checkUnits(bbox: BoundingBox, units: LengthUnit): UnitsCheck {
  const extentMm = extentOf(bbox) * MM_SCALE[units];
  const size = extentMm >= 1000 ? `${(extentMm / 1000).toFixed(2)} m` : `${extentMm.toFixed(extentMm < 10 ? 2 : 0)} mm`;
  if (extentMm > LARGEST_PLAUSIBLE_MM) {
    return {
      plausible: false,
      extentMm,
      message: `In ${units === 'in' ? 'inches' : 'millimetres'} the points span ${size} — larger than any flange.${units === 'in' ? ' Are the values in millimetres?' : ' Check the export settings of the scan.'}`,
    };
  }
  if (extentMm < SMALLEST_PLAUSIBLE_MM) {
    return {
      plausible: false,
      extentMm,
      message: `In ${units === 'in' ? 'inches' : 'millimetres'} the points span only ${size}.${units === 'mm' ? ' Are the values in inches?' : ''}`,
    };
  }
  return { plausible: true, extentMm, message: `The points span ${size}.` };
}
