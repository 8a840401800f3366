/**
 * Tap drills and basic minor diameters for tapped holes.
 *
 * Metric coarse (ISO 261 / ISO 965 basis): M6x1 5.0 … M16x2 14.0 mm. Metric fine: drill = D − P
 * rounded to the usual drill size (common practice). Unified: the usual 75 % thread drills
 * (number, letter and fraction drills), tabulated in inch.
 *
 * The basic minor diameter of the internal thread is D1 = D − 2·(5/8)·H with H = (√3/2)·P,
 * i.e. D1 = D − 1.082532·P (ISO 724 for metric; the unified basic profile is the same
 * 60° profile, ASME B1.1).
 */
import { DomainError } from '../errors';
import { MM_PER_IN } from '../units';
import { parseThread } from './threads';

/** 2 · 5/8 · √3/2 = 5√3/8 */
export const MINOR_DIAMETER_FACTOR = (5 * Math.sqrt(3)) / 8;

export interface TapDrill {
  /** normalised thread designation, e.g. 'M10x1.5', '3/8-16 UNC' */
  readonly thread: string;
  readonly drillMm: number;
  /** how the drill is called in the shop: '8.5 mm', '#7', 'F', '5/16' */
  readonly drillLabel: string;
  /** drill size in the unit it is sold in */
  readonly tabulated: { readonly value: number; readonly unit: 'mm' | 'in' };
}

/** Metric tap drills, mm. Coarse from the ISO 261 / 965 table; fine as D − P (common practice). */
const METRIC_TAP_DRILL_MM: Readonly<Record<string, number>> = Object.freeze({
  'M6x1': 5.0,
  'M8x1.25': 6.8,
  'M10x1.5': 8.5,
  'M12x1.75': 10.2,
  'M14x2': 12.0,
  'M16x2': 14.0,
  'M8x1': 7.0,
  'M10x1.25': 8.8,
  'M10x1': 9.0,
  'M12x1.5': 10.5,
  'M12x1.25': 10.8,
  'M14x1.5': 12.5,
  'M16x1.5': 14.5,
});

/** Unified 75 % thread tap drills: label and diameter, inch. */
const UNIFIED_TAP_DRILL_IN: Readonly<Record<string, { label: string; diameterIn: number }>> = Object.freeze({
  '1/4-20 UNC': { label: '#7', diameterIn: 0.201 },
  '1/4-28 UNF': { label: '#3', diameterIn: 0.213 },
  '5/16-18 UNC': { label: 'F', diameterIn: 0.257 },
  '5/16-24 UNF': { label: 'I', diameterIn: 0.272 },
  '3/8-16 UNC': { label: '5/16', diameterIn: 5 / 16 },
  '3/8-24 UNF': { label: 'Q', diameterIn: 0.332 },
  '7/16-14 UNC': { label: 'U', diameterIn: 0.368 },
  '7/16-20 UNF': { label: '25/64', diameterIn: 25 / 64 },
  '1/2-13 UNC': { label: '27/64', diameterIn: 27 / 64 },
  '1/2-20 UNF': { label: '29/64', diameterIn: 29 / 64 },
  '5/8-11 UNC': { label: '17/32', diameterIn: 17 / 32 },
  '5/8-18 UNF': { label: '37/64', diameterIn: 37 / 64 },
});

export const TAP_DRILL_THREADS: readonly string[] = Object.freeze([
  ...Object.keys(METRIC_TAP_DRILL_MM),
  ...Object.keys(UNIFIED_TAP_DRILL_IN),
]);

/** Tap drill for a thread (`'M10'` = `'M10x1.5'`, `'3/8-16'`, `'3/8-16 UNC'`). */
export function tapDrill(thread: string): TapDrill {
  const t = parseThread(thread);
  if (t.system === 'metric') {
    const mm = METRIC_TAP_DRILL_MM[t.designation];
    if (mm !== undefined) {
      return Object.freeze({
        thread: t.designation,
        drillMm: mm,
        drillLabel: `${mm.toFixed(1)} mm`,
        tabulated: Object.freeze({ value: mm, unit: 'mm' as const }),
      });
    }
  } else {
    const row = UNIFIED_TAP_DRILL_IN[t.designation];
    if (row !== undefined) {
      return Object.freeze({
        thread: t.designation,
        drillMm: row.diameterIn * MM_PER_IN,
        drillLabel: row.label,
        tabulated: Object.freeze({ value: row.diameterIn, unit: 'in' as const }),
      });
    }
  }
  throw new DomainError(
    'tapDrill.unsupported',
    `No tap drill tabulated for "${thread}" (${t.designation}); threads in the table: ${TAP_DRILL_THREADS.join(', ')}.`,
  );
}

/** Tap drill diameter, mm. */
export function tapDrillMm(thread: string): number {
  return tapDrill(thread).drillMm;
}

/** Basic minor diameter D1 of the internal thread, mm: D − 1.082532·P. */
export function threadMinorDiameterMm(thread: string): number {
  const t = parseThread(thread);
  return t.nominalDiameterMm - MINOR_DIAMETER_FACTOR * t.pitchMm;
}
