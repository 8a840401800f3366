/**
 * Lengths as people type them, and as the product shows them.
 *
 * Everything inside the domain is millimetres. This module is the only door between text and
 * numbers: `parseLength` reads what a builder types (decimal or fractional, mm or inch) and
 * `formatLength` shows a millimetre value back in the builder's unit.
 */
import { DomainError } from './errors';

export type LengthUnit = 'mm' | 'in';

/** Exact by definition (international inch, 1959). */
export const MM_PER_IN = 25.4;

/** An inch fraction is shown without `≈` when it is this close to the value (inch). */
export const FRACTION_EXACT_TOLERANCE_IN = 0.0005;

/** Finest fraction `formatLength` rounds to. */
export const FRACTION_DENOMINATOR = 64;

const ACCEPTED_FORMS =
  'accepted forms: 12.7, 12.7 mm, 25.4mm, 0.5in, 0.5", .375", 1/2 in, 3/8, 1-1/4", 1 1/4 in, -3.2';

const UNIT_PATTERN = '(mm|millimet(?:er|re)s?|in|inch|inches|"|″|”|\'\')';
const LENGTH_RE = new RegExp(
  '^([+-]?)' +
    '(?:' +
    // mixed number: 1-1/4 or 1 1/4
    '(\\d+)(?:-|\\s+)(\\d+)/(\\d+)' +
    '|' +
    // plain fraction: 3/8
    '(\\d+)/(\\d+)' +
    '|' +
    // decimal: 12, 12.7, 12., .375
    '(\\d+(?:\\.\\d*)?|\\.\\d+)' +
    ')' +
    '\\s*' +
    UNIT_PATTERN +
    '?$',
  'i',
);

function unitOf(token: string | undefined, defaultUnit: LengthUnit): LengthUnit {
  if (token === undefined) return defaultUnit;
  return token.toLowerCase().startsWith('m') ? 'mm' : 'in';
}

/** What a value that is not text is, in words, for messages: "a number (12)", "a list", "nothing". */
export function describeValue(v: unknown): string {
  if (v === null || v === undefined) return 'nothing';
  if (typeof v === 'number') return Number.isFinite(v) ? `a number (${v})` : 'a number that is not finite';
  if (typeof v === 'boolean') return `${v} (yes/no)`;
  if (Array.isArray(v)) return 'a list';
  if (typeof v === 'object') return 'an object';
  return `a ${typeof v}`;
}

function invalid(text: string, why: string, defaultUnit: LengthUnit, path?: (string | number)[]): DomainError {
  const where = path && path.length > 0 ? ` at ${path.join('.')}` : '';
  return new DomainError(
    'length.invalid',
    `Cannot read "${text}" as a length${where}: ${why} (${ACCEPTED_FORMS}; without a unit: ${defaultUnit}).`,
    path,
  );
}

/**
 * Reads a length typed by a person and returns millimetres.
 *
 * Accepts decimals (`12.7`, `.375`), fractions (`3/8`), mixed numbers (`1-1/4`, `1 1/4`), an
 * optional sign and an optional unit (`mm`, `in`, `inch`, `"`). Without a unit the value is in
 * `defaultUnit`. A comma is never a decimal separator here: `1,5` is rejected with a hint,
 * because "1,5" and "1,500" mean different things to different people.
 *
 * @param path optional field path, quoted in the error message and attached to the error
 * @throws DomainError `length.invalid` for anything else (empty, garbage, zero denominator,
 *   non-finite results); `length.unit` for an unknown default unit
 */
export function parseLength(text: string, defaultUnit: LengthUnit, path?: (string | number)[]): number {
  if (defaultUnit !== 'mm' && defaultUnit !== 'in') {
    throw new DomainError('length.unit', `Unknown length unit "${String(defaultUnit)}": use "mm" or "in".`, path);
  }
  if (typeof text !== 'string') {
    const where = path && path.length > 0 ? ` at ${path.join('.')}` : '';
    throw new DomainError('length.invalid', `A length${where} must be text such as "12.7", "12.7 mm" or "1/2 in"; got ${describeValue(text)} (without a unit: ${defaultUnit}).`, path);
  }
  const trimmed = text.trim();
  if (trimmed === '') throw invalid(text, 'the field is empty', defaultUnit, path);

  if (trimmed.includes(',')) {
    const suggestion = trimmed.replace(/,/g, '.');
    throw invalid(
      text,
      `a comma is not accepted — write the decimal with a dot (e.g. "${suggestion}") and leave out thousands separators`,
      defaultUnit,
      path,
    );
  }

  const m = LENGTH_RE.exec(trimmed);
  if (!m) throw invalid(text, 'not a number with an optional unit', defaultUnit, path);

  const sign = m[1] === '-' ? -1 : 1;
  const unit = unitOf(m[8], defaultUnit);
  let magnitude: number;

  if (m[2] !== undefined) {
    const whole = Number(m[2]);
    const num = Number(m[3]);
    const den = Number(m[4]);
    if (den === 0) throw invalid(text, 'the fraction has a zero denominator', defaultUnit, path);
    if (num >= den) {
      throw invalid(text, `in a mixed number the fraction must be less than 1 (got ${num}/${den})`, defaultUnit, path);
    }
    magnitude = whole + num / den;
  } else if (m[5] !== undefined) {
    const num = Number(m[5]);
    const den = Number(m[6]);
    if (den === 0) throw invalid(text, 'the fraction has a zero denominator', defaultUnit, path);
    magnitude = num / den;
  } else {
    magnitude = Number(m[7]);
  }

  const mm = sign * magnitude * (unit === 'in' ? MM_PER_IN : 1);
  if (!Number.isFinite(mm)) throw invalid(text, 'the number is too large', defaultUnit, path);
  // -0 is not a length anyone typed on purpose
  return mm === 0 ? 0 : mm;
}

export interface FormatLengthOptions {
  /** decimals shown; default 2 for mm, 3 for inch (ignored with `fraction`) */
  readonly decimals?: number;
  /** inch only: nearest fraction to 1/64, reduced, e.g. `1-1/4"` */
  readonly fraction?: boolean;
  /** append the unit (` mm` or `"`); default true */
  readonly showUnit?: boolean;
}

function gcd(a: number, b: number): number {
  let x = a;
  let y = b;
  while (y !== 0) {
    const t = x % y;
    x = y;
    y = t;
  }
  return x;
}

function fixed(value: number, decimals: number): string {
  const s = value.toFixed(decimals);
  // no "-0.00"
  return Number(s) === 0 ? s.replace(/^-/, '') : s;
}

/**
 * Shows a millimetre value in the given unit.
 *
 * - mm: `12.70 mm` (fixed decimals, default 2)
 * - inch, decimal: `0.500"` (default 3 decimals)
 * - inch, fraction: nearest 1/64 reduced (`1-1/4"`, `3/8"`, `2"`), prefixed with `≈` when the
 *   fraction is off the value by more than 0.0005 in.
 *
 * The output (without `≈`) is accepted back by `parseLength`.
 */
export function formatLength(mm: number, unit: LengthUnit, opts: FormatLengthOptions = {}): string {
  if (typeof mm !== 'number' || !Number.isFinite(mm)) {
    throw new DomainError('length.invalid', `Cannot format ${String(mm)} as a length: expected a finite number of millimetres.`);
  }
  if (unit !== 'mm' && unit !== 'in') {
    throw new DomainError('length.unit', `Unknown length unit "${String(unit)}": use "mm" or "in".`);
  }
  const showUnit = opts.showUnit ?? true;
  const decimals = opts.decimals ?? (unit === 'mm' ? 2 : 3);
  if (!Number.isInteger(decimals) || decimals < 0 || decimals > 12) {
    throw new DomainError('length.decimals', `decimals must be a whole number from 0 to 12, got ${String(decimals)}.`);
  }

  if (unit === 'mm') {
    const s = fixed(mm, decimals);
    return showUnit ? `${s} mm` : s;
  }

  const inches = mm / MM_PER_IN;
  const suffix = showUnit ? '"' : '';
  if (!opts.fraction) return fixed(inches, decimals) + suffix;

  const magnitude = Math.abs(inches);
  const steps = Math.round(magnitude * FRACTION_DENOMINATOR);
  const approximate = Math.abs(magnitude - steps / FRACTION_DENOMINATOR) > FRACTION_EXACT_TOLERANCE_IN + 1e-12;
  const whole = Math.floor(steps / FRACTION_DENOMINATOR);
  const rest = steps % FRACTION_DENOMINATOR;
  let body: string;
  if (rest === 0) {
    body = String(whole);
  } else {
    const g = gcd(rest, FRACTION_DENOMINATOR);
    const frac = `${rest / g}/${FRACTION_DENOMINATOR / g}`;
    body = whole > 0 ? `${whole}-${frac}` : frac;
  }
  const sign = inches < 0 && steps > 0 ? '-' : '';
  return `${approximate ? '≈' : ''}${sign}${body}${suffix}`;
}
