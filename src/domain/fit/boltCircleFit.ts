/**
 * Bolt circle from measured hole centres: the least-squares (geometric) circle through the
 * centres, then the regular pattern that fits their angles best.
 *
 * Regular pattern: `count` equally spaced positions (pitch = 360°/count) — by default one per
 * hole; give a larger count when holes of the pattern are missing. Each hole is assigned to its
 * nearest position and the start angle minimises the sum of squared angular deviations
 * (angles CCW from +X, degrees). startAngleDeg is reported in [0, pitch).
 */
import { DomainError } from '../errors';
import { atan2Deg, normalizeDeg, wrapDeltaDeg, DEG_PER_RAD } from '../geometry/degrees';
import { fitCircle } from './circle';

export interface BoltCircleHoleAngle {
  /** index of the hole in the input */
  readonly index: number;
  /** measured angle about the fitted centre, [0, 360) */
  readonly angleDeg: number;
  /** position of the regular pattern the hole belongs to (0 … count − 1) */
  readonly slot: number;
  /** angle of that regular position, [0, 360) */
  readonly nearestRegularDeg: number;
  /** measured − regular, (−180, 180] */
  readonly deviationDeg: number;
  /** distance from the fitted centre − fitted radius */
  readonly radialDeviationMm: number;
}

export interface BoltCircleFit {
  readonly centerX: number;
  readonly centerY: number;
  readonly diameterMm: number;
  /** RMS radial deviation of the centres from the fitted circle */
  readonly rms: number;
  readonly count: number;
  readonly pitchDeg: number;
  /** angle of regular position 0, [0, pitch) */
  readonly startAngleDeg: number;
  /** RMS angular deviation from the regular pattern */
  readonly angularRmsDeg: number;
  readonly angles: readonly BoltCircleHoleAngle[];
}

export interface BoltCircleFitOptions {
  /** number of positions of the regular pattern (≥ number of holes); default = number of holes */
  readonly count?: number;
}

export function fitBoltCircle(
  holeCentres: readonly { readonly x: number; readonly y: number }[],
  opts: BoltCircleFitOptions = {},
): BoltCircleFit {
  if (!Array.isArray(holeCentres)) {
    throw new DomainError('fit.input', 'Bolt circle fit: expected an array of hole centres {x, y}.', ['holeCentres']);
  }
  const n = holeCentres.length;
  if (n < 3) {
    throw new DomainError('fit.tooFewPoints', `Bolt circle fit needs at least 3 hole centres, got ${n}.`, ['holeCentres']);
  }
  const count = opts.count ?? n;
  if (!Number.isInteger(count) || count < n) {
    throw new DomainError(
      'fit.boltCircle.count',
      `Bolt circle fit: count must be a whole number of at least the number of holes (${n}), got ${String(count)}.`,
      ['count'],
    );
  }
  const circle = fitCircle(holeCentres, { method: 'geometric' });
  const pitch = 360 / count;

  const angles = holeCentres.map((p) => atan2Deg(p.y - circle.centerY, p.x - circle.centerX));

  // first estimate: circular mean of count·θ (each regular position maps to the same angle)
  let sumSin = 0;
  let sumCos = 0;
  for (const a of angles) {
    sumSin += Math.sin((count * a) / DEG_PER_RAD);
    sumCos += Math.cos((count * a) / DEG_PER_RAD);
  }
  let start = normalizeDeg((Math.atan2(sumSin, sumCos) * DEG_PER_RAD) / count);

  // refine: with each hole on its nearest position, the least-squares start is the mean deviation
  let slots: number[] = [];
  for (let pass = 0; pass < 5; pass++) {
    slots = angles.map((a) => ((Math.round(normalizeDeg(a - start) / pitch) % count) + count) % count);
    let sum = 0;
    angles.forEach((a, i) => {
      sum += wrapDeltaDeg(a - (start + slots[i]! * pitch));
    });
    const shift = sum / n;
    start = normalizeDeg(start + shift);
    if (Math.abs(shift) < 1e-12) break;
  }
  // report the start in [0, pitch): renumber the positions accordingly
  const turns = Math.floor(start / pitch + 1e-12);
  start = Math.max(0, start - turns * pitch);
  slots = angles.map((a) => ((Math.round(normalizeDeg(a - start) / pitch) % count) + count) % count);

  const seen = new Map<number, number>();
  slots.forEach((slot, i) => {
    const other = seen.get(slot);
    if (other !== undefined) {
      throw new DomainError(
        'fit.boltCircle.duplicate',
        `Bolt circle fit: holes ${other} and ${i} are both nearest to the same position of a ${count}-hole pattern (pitch ${pitch.toFixed(3)}°); give a larger count or check the hole list.`,
        ['holeCentres', i],
      );
    }
    seen.set(slot, i);
  });

  let angSum = 0;
  const radius = circle.radius;
  const holes = holeCentres.map((p, i) => {
    const regular = normalizeDeg(start + slots[i]! * pitch);
    const deviation = wrapDeltaDeg(angles[i]! - regular);
    angSum += deviation * deviation;
    return Object.freeze({
      index: i,
      angleDeg: angles[i]!,
      slot: slots[i]!,
      nearestRegularDeg: regular,
      deviationDeg: deviation,
      radialDeviationMm: Math.hypot(p.x - circle.centerX, p.y - circle.centerY) - radius,
    });
  });

  return Object.freeze({
    centerX: circle.centerX,
    centerY: circle.centerY,
    diameterMm: 2 * radius,
    rms: circle.rms,
    count,
    pitchDeg: pitch,
    startAngleDeg: start,
    angularRmsDeg: Math.sqrt(angSum / n),
    angles: Object.freeze(holes),
  });
}
