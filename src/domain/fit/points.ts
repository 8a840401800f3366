/**
 * Point input for the fits: either an array of objects or an interleaved Float64Array
 * (x0, y0, x1, y1, … or x0, y0, z0, …). Validated once here; the fits then only index the flat
 * array, so large scans cost no per-point objects.
 */
import { DomainError } from '../errors';

export type Points2 = readonly { readonly x: number; readonly y: number }[] | Float64Array;
export type Points3 = readonly { readonly x: number; readonly y: number; readonly z: number }[] | Float64Array;

/**
 * Largest coordinate magnitude a fit accepts (1000 km in mm): beyond it the sums of squares the fits
 * form overflow to Infinity and the result would be NaN.
 */
export const MAX_COORDINATE = 1e12;

/** Flattens and validates points; a Float64Array is checked in place, not copied. */
export function flatPoints(points: Points2 | Points3, dims: 2 | 3, what: string, minPoints = 3): Float64Array {
  let flat: Float64Array;
  if (points instanceof Float64Array) {
    if (points.length % dims !== 0) {
      throw new DomainError(
        'fit.input',
        `${what}: an interleaved array must hold ${dims} numbers per point; its length ${points.length} is not a multiple of ${dims}.`,
      );
    }
    flat = points;
  } else if (Array.isArray(points)) {
    flat = new Float64Array(points.length * dims);
    for (let i = 0; i < points.length; i++) {
      const p = points[i] as { x?: unknown; y?: unknown; z?: unknown } | null | undefined;
      if (p === null || typeof p !== 'object') {
        throw new DomainError('fit.input', `${what}: point ${i} is not an object with x and y.`, ['points', i]);
      }
      flat[i * dims] = typeof p.x === 'number' ? p.x : NaN;
      flat[i * dims + 1] = typeof p.y === 'number' ? p.y : NaN;
      if (dims === 3) flat[i * dims + 2] = typeof p.z === 'number' ? p.z : NaN;
    }
  } else {
    throw new DomainError('fit.input', `${what}: expected an array of points or an interleaved Float64Array.`);
  }
  for (let i = 0; i < flat.length; i++) {
    if (Number.isFinite(flat[i]!) && Math.abs(flat[i]!) > MAX_COORDINATE) {
      const index = Math.floor(i / dims);
      const axis = 'xyz'[i % dims]!;
      throw new DomainError(
        'fit.outOfRange',
        `${what}: point ${index} has ${axis} = ${String(flat[i])}, beyond ±${MAX_COORDINATE.toExponential(0)}; check the file's units and columns.`,
        ['points', index, axis],
      );
    }
    if (!Number.isFinite(flat[i]!)) {
      const index = Math.floor(i / dims);
      const axis = 'xyz'[i % dims]!;
      throw new DomainError(
        'fit.nonFinite',
        `${what}: point ${index} has a non-finite ${axis} (${String(flat[i])}); every coordinate must be a finite number.`,
        ['points', index, axis],
      );
    }
  }
  const n = flat.length / dims;
  if (n < minPoints) {
    throw new DomainError('fit.tooFewPoints', `${what} needs at least ${minPoints} point${minPoints === 1 ? '' : 's'}, got ${n}.`, ['points']);
  }
  return flat;
}
