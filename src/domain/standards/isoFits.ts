/**
 * ISO 286-1 limits and fits for holes H and shafts g, h, k, m, n, p, grades IT5–IT8,
 * nominal sizes over 0 up to and including 500 mm.
 *
 * Values are tabulated (the standard's rounded values, which the tolerance-factor formula
 * i = 0.45·∛D + 0.001·D does not reproduce exactly everywhere). Size ranges are "over … up to
 * and including": 10 mm is in 6–10, 120 mm in 80–120. Deviations are in micrometres; a fit's
 * clearance is positive for clearance and negative for interference.
 */
import { DomainError } from '../errors';

/** Upper bounds of the size ranges, mm ("over previous, up to and including this"). */
export const ISO_286_RANGE_UPPER_MM: readonly number[] = Object.freeze([
  3, 6, 10, 18, 30, 50, 80, 120, 180, 250, 315, 400, 500,
]);

/** Standard tolerance grades, µm, one value per range above. */
const IT_UM: Readonly<Record<number, readonly number[]>> = Object.freeze({
  5: [4, 5, 6, 8, 9, 11, 13, 15, 18, 20, 23, 25, 27],
  6: [6, 8, 9, 11, 13, 16, 19, 22, 25, 29, 32, 36, 40],
  7: [10, 12, 15, 18, 21, 25, 30, 35, 40, 46, 52, 57, 63],
  8: [14, 18, 22, 27, 33, 39, 46, 54, 63, 72, 81, 89, 97],
});

/** Shaft fundamental deviations, µm: g and h give es (upper), k m n p give ei (lower). */
const SHAFT_FD_UM: Readonly<Record<'g' | 'h' | 'k' | 'm' | 'n' | 'p', readonly number[]>> = Object.freeze({
  g: [-2, -4, -5, -6, -7, -9, -10, -12, -14, -15, -17, -18, -20],
  h: [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0],
  // k: for grades IT4 to IT7; for coarser grades ei = 0
  k: [0, 1, 1, 1, 2, 2, 2, 3, 3, 4, 4, 4, 5],
  m: [2, 4, 6, 7, 8, 9, 11, 13, 15, 17, 20, 21, 23],
  n: [4, 8, 10, 12, 15, 17, 20, 23, 27, 31, 34, 37, 40],
  p: [6, 12, 15, 18, 22, 26, 32, 37, 43, 50, 56, 62, 68],
});

export const ISO_286_MAX_SIZE_MM = 500;
export const ISO_286_GRADES: readonly number[] = Object.freeze([5, 6, 7, 8]);
export const ISO_286_HOLE_LETTERS: readonly string[] = Object.freeze(['H']);
export const ISO_286_SHAFT_LETTERS: readonly string[] = Object.freeze(['g', 'h', 'k', 'm', 'n', 'p']);

/** A size within this of a range boundary counts as the boundary (float noise from unit conversion). */
const BOUNDARY_TOLERANCE_MM = 1e-9;

export interface ToleranceZone {
  readonly lowerUm: number;
  readonly upperUm: number;
}

export interface IsoFit {
  readonly hole: ToleranceZone;
  readonly shaft: ToleranceZone;
  /** hole − shaft: min = hole lower − shaft upper, max = hole upper − shaft lower; negative = interference */
  readonly clearanceUm: { readonly min: number; readonly max: number };
  readonly kind: 'clearance' | 'transition' | 'interference';
}

function rangeIndex(nominalMm: number): number {
  if (typeof nominalMm !== 'number' || !Number.isFinite(nominalMm) || nominalMm <= 0) {
    throw new DomainError(
      'fit.size',
      `ISO 286 needs a positive nominal size in mm, got ${String(nominalMm)}.`,
    );
  }
  const i = ISO_286_RANGE_UPPER_MM.findIndex((upper) => nominalMm <= upper + BOUNDARY_TOLERANCE_MM);
  if (i < 0) {
    throw new DomainError(
      'fit.size',
      `Nominal size ${nominalMm} mm is outside the ISO 286 table here (over 0 up to and including ${ISO_286_MAX_SIZE_MM} mm).`,
    );
  }
  return i;
}

/** "over 6 up to and including 10 mm" */
export function iso286RangeLabel(nominalMm: number): string {
  const i = rangeIndex(nominalMm);
  const lower = i === 0 ? 0 : ISO_286_RANGE_UPPER_MM[i - 1];
  return `over ${lower} up to and including ${ISO_286_RANGE_UPPER_MM[i]} mm`;
}

/** Standard tolerance ITn for the size, µm. */
export function standardToleranceUm(nominalMm: number, grade: number): number {
  const row = IT_UM[grade];
  if (!row) {
    throw new DomainError('fit.grade', `Tolerance grade IT${String(grade)} is not in the table (IT5 to IT8).`);
  }
  return row[rangeIndex(nominalMm)]!;
}

interface ParsedClass {
  readonly letter: string;
  readonly grade: number;
  readonly isHole: boolean;
}

function parseClass(cls: string): ParsedClass {
  const m = typeof cls === 'string' ? /^\s*([A-Za-z])\s*(\d+)\s*$/.exec(cls) : null;
  const known = `holes ${ISO_286_HOLE_LETTERS.join(', ')}; shafts ${ISO_286_SHAFT_LETTERS.join(', ')}; grades 5–8, e.g. "H7", "g6", "m6"`;
  if (!m) {
    throw new DomainError('fit.class', `Cannot read tolerance class "${String(cls)}" (${known}).`);
  }
  const letter = m[1]!;
  const grade = Number(m[2]);
  const isHole = letter === letter.toUpperCase();
  const letters = isHole ? ISO_286_HOLE_LETTERS : ISO_286_SHAFT_LETTERS;
  if (!letters.includes(letter)) {
    throw new DomainError('fit.class', `Tolerance class "${cls}": ${isHole ? 'hole' : 'shaft'} letter ${letter} is not in the table (${known}).`);
  }
  if (!ISO_286_GRADES.includes(grade)) {
    throw new DomainError('fit.class', `Tolerance class "${cls}": grade ${grade} is not in the table (${known}).`);
  }
  return { letter, grade, isHole };
}

/** Limit deviations of a hole ('H7') or shaft ('m6') tolerance class, µm from nominal. */
export function isoTolerance(nominalMm: number, cls: string): ToleranceZone {
  const c = parseClass(cls);
  const i = rangeIndex(nominalMm);
  const it = IT_UM[c.grade]![i]!;
  if (c.isHole) {
    // H: EI = 0
    return Object.freeze({ lowerUm: 0, upperUm: it });
  }
  const letter = c.letter as keyof typeof SHAFT_FD_UM;
  if (letter === 'g' || letter === 'h') {
    const es = SHAFT_FD_UM[letter][i]!;
    return Object.freeze({ lowerUm: es - it, upperUm: es });
  }
  const ei = letter === 'k' && c.grade > 7 ? 0 : SHAFT_FD_UM[letter][i]!;
  return Object.freeze({ lowerUm: ei, upperUm: ei + it });
}

/** A hole/shaft fit, e.g. isoFit(10, 'H7', 'g6'). */
export function isoFit(nominalMm: number, holeClass: string, shaftClass: string): IsoFit {
  const h = parseClass(holeClass);
  const s = parseClass(shaftClass);
  if (!h.isHole) {
    throw new DomainError('fit.class', `"${holeClass}" is a shaft class; the hole class comes first and is upper case (e.g. "H7").`);
  }
  if (s.isHole) {
    throw new DomainError('fit.class', `"${shaftClass}" is a hole class; the shaft class is lower case (e.g. "g6").`);
  }
  const hole = isoTolerance(nominalMm, holeClass);
  const shaft = isoTolerance(nominalMm, shaftClass);
  const min = hole.lowerUm - shaft.upperUm;
  const max = hole.upperUm - shaft.lowerUm;
  const kind = min >= 0 ? 'clearance' : max <= 0 ? 'interference' : 'transition';
  return Object.freeze({ hole, shaft, clearanceUm: Object.freeze({ min, max }), kind });
}

/** Size limits in mm for a class, e.g. a Ø10 H7 bore → { lowerMm: 10.000, upperMm: 10.015 }. */
export function isoLimitsMm(nominalMm: number, cls: string): { readonly lowerMm: number; readonly upperMm: number } {
  const t = isoTolerance(nominalMm, cls);
  return Object.freeze({ lowerMm: nominalMm + t.lowerUm / 1000, upperMm: nominalMm + t.upperUm / 1000 });
}
