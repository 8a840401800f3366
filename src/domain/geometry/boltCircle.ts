/**
 * Holes on a bolt circle, in plate coordinates: angles counter-clockwise from +X (degrees),
 * centre on the crank axis unless given.
 */
import { DomainError } from '../errors';
import { cosDeg, normalizeDeg, sinDeg } from './degrees';

export type BoltCircleInput =
  | {
      readonly diameterMm: number;
      /** evenly spaced holes */
      readonly count: number;
      /** angle of the first hole, CCW from +X */
      readonly startAngleDeg: number;
      readonly centerX?: number;
      readonly centerY?: number;
    }
  | {
      readonly diameterMm: number;
      /** explicit hole angles, CCW from +X, in the order given */
      readonly anglesDeg: readonly number[];
      readonly centerX?: number;
      readonly centerY?: number;
    };

export interface BoltCircleHole {
  readonly x: number;
  readonly y: number;
  /** normalised to [0, 360) */
  readonly angleDeg: number;
}

function finite(value: unknown, field: string, path: (string | number)[] = [field]): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new DomainError('boltCircle.invalid', `Bolt circle ${field} must be a finite number, got ${String(value)}.`, path);
  }
  return value;
}

/** Hole positions of a bolt circle; the first hole is at the start angle (or the first given angle). */
export function boltCircle(input: BoltCircleInput): BoltCircleHole[] {
  const diameterMm = finite(input.diameterMm, 'diameterMm');
  if (diameterMm <= 0) {
    throw new DomainError('boltCircle.invalid', `Bolt circle diameterMm must be greater than 0, got ${diameterMm}.`, ['diameterMm']);
  }
  const cx = input.centerX === undefined ? 0 : finite(input.centerX, 'centerX');
  const cy = input.centerY === undefined ? 0 : finite(input.centerY, 'centerY');
  let angles: number[];
  if ('anglesDeg' in input && input.anglesDeg !== undefined) {
    if (!Array.isArray(input.anglesDeg) || input.anglesDeg.length === 0) {
      throw new DomainError('boltCircle.invalid', 'Bolt circle anglesDeg must list at least one angle.', ['anglesDeg']);
    }
    angles = input.anglesDeg.map((a, i) => finite(a, `anglesDeg[${i}]`, ['anglesDeg', i]));
  } else {
    const { count, startAngleDeg } = input as { count: unknown; startAngleDeg: unknown };
    if (typeof count !== 'number' || !Number.isInteger(count) || count < 1) {
      throw new DomainError('boltCircle.invalid', `Bolt circle count must be a whole number of at least 1, got ${String(count)}.`, ['count']);
    }
    const start = finite(startAngleDeg, 'startAngleDeg');
    const pitch = 360 / count;
    angles = Array.from({ length: count }, (_, k) => start + k * pitch);
  }
  const r = diameterMm / 2;
  return angles.map((a) =>
    Object.freeze({ x: cx + r * cosDeg(a), y: cy + r * sinDeg(a), angleDeg: normalizeDeg(a) }),
  );
}
