/**
 * Lengths in the editor: what a builder types (mm or inch text) and how a value is shown in the
 * display unit chosen for the plate. Pure: shared by the editor, its tests and the bench.
 */
import { formatLength, MM_PER_IN, parseLength, type LengthUnit } from '../units';
import { isDomainError } from '../errors';

export interface DisplayUnits {
  readonly length: LengthUnit;
  /** inch only: show fractions to 1/64 */
  readonly fractions: boolean;
}

export const MM_DISPLAY: DisplayUnits = Object.freeze({ length: 'mm', fractions: false });

/** A value in the display unit, e.g. `12.70 mm`, `0.500"` or `1/2"`. */
export function showLength(mm: number, units: DisplayUnits, opts: { showUnit?: boolean; decimals?: number } = {}): string {
  if (!Number.isFinite(mm)) return '—';
  return formatLength(mm, units.length, { fraction: units.length === 'in' && units.fractions, showUnit: opts.showUnit ?? true, decimals: opts.decimals });
}

/** Text for an editable cell in the display unit, without the unit (it is in the column head). */
export function editText(mm: number | undefined, units: DisplayUnits): string {
  if (mm === undefined || !Number.isFinite(mm)) return '';
  if (units.length === 'mm') return trimZeros(mm.toFixed(3));
  if (units.fractions) {
    const f = formatLength(mm, 'in', { fraction: true, showUnit: false });
    if (!f.startsWith('≈')) return f;
  }
  return trimZeros((mm / MM_PER_IN).toFixed(4));
}

function trimZeros(s: string): string {
  if (!s.includes('.')) return s;
  const t = s.replace(/0+$/, '').replace(/\.$/, '');
  return t === '-0' ? '0' : t;
}

/**
 * The value in the unit that is NOT the display unit, for the small second line of a table cell:
 * `2.000 in` under a mm value, `50.80 mm` under an inch value.
 */
export function otherUnitText(mm: number | undefined, units: DisplayUnits): string {
  if (mm === undefined || !Number.isFinite(mm)) return '';
  return units.length === 'mm' ? `${formatLength(mm, 'in', { decimals: 3, showUnit: false })} in` : formatLength(mm, 'mm', { decimals: 2 });
}

/** Both units at once, for the "parsed as" hint under a length input: `12.700 mm = 0.5000 in`. */
export function bothUnits(mm: number): string {
  return `${formatLength(mm, 'mm', { decimals: 3 })} = ${formatLength(mm / 1, 'in', { decimals: 4, showUnit: false })} in`;
}

export type LengthRead = { readonly ok: true; readonly mm: number } | { readonly ok: false; readonly message: string };

/**
 * Reads a typed length. Without a unit the display unit applies. Adds the editor's own limits
 * (e.g. "must be greater than 0") so the message names what the field needs.
 */
export function readLength(text: string, units: DisplayUnits, opts: { min?: number; positive?: boolean; optional?: boolean } = {}): LengthRead {
  if (opts.optional && text.trim() === '') return { ok: true, mm: Number.NaN };
  let mm: number;
  try {
    mm = parseLength(text, units.length);
  } catch (e) {
    if (isDomainError(e)) return { ok: false, message: shortLengthMessage(text, units.length) };
    throw e;
  }
  if (opts.positive && !(mm > 0)) return { ok: false, message: 'must be greater than 0' };
  if (opts.min !== undefined && mm < opts.min) return { ok: false, message: `must be at least ${showLength(opts.min, units)}` };
  return { ok: true, mm };
}

/** A short inline message: the full accepted-forms list is too long for a table cell. */
export function shortLengthMessage(text: string, unit: LengthUnit): string {
  const t = text.trim();
  if (t === '') return 'enter a length';
  if (t.includes(',')) return `use a dot for decimals ("${t.replace(/,/g, '.')}")`;
  return `"${t}" is not a length — try 12.7, 12.7 mm, 0.5in, 1/2" (no unit = ${unit === 'mm' ? 'mm' : 'inch'})`;
}

/** The next display-unit setting of the units switch: mm → inch (decimal) → inch (fractions) → mm. */
export function nextUnits(u: DisplayUnits): DisplayUnits {
  if (u.length === 'mm') return { length: 'in', fractions: false };
  if (!u.fractions) return { length: 'in', fractions: true };
  return { length: 'mm', fractions: false };
}

export function unitsLabel(u: DisplayUnits): string {
  return u.length === 'mm' ? 'mm' : u.fractions ? 'inch (fractions)' : 'inch';
}
