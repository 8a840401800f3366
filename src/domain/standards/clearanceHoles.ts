/**
 * Clearance holes for bolts.
 *
 * Metric: ISO 273 (now ISO 20273) fine (H12) / medium (H13) / coarse (H14) series.
 * Inch: ASME B18.2.8 close / normal / loose fit, tabulated in inch and returned in mm.
 *
 * Class names across systems: ASME B18.2.8's metric table uses the ISO 273 values for its
 * close / normal / loose classes, so for metric bolts close ≡ fine, normal ≡ medium,
 * loose ≡ coarse. We apply the same correspondence the other way for inch bolts
 * (fine → close, medium → normal, coarse → loose), so a plate can carry one class for all its
 * holes whatever the bolt system. `clearanceHole(...)` reports the class in the standard's own
 * words (e.g. 'normal' for a 3/8 bolt asked for 'medium').
 */
import { DomainError } from '../errors';
import { MM_PER_IN } from '../units';
import { parseFastener } from './threads';

export type ClearanceClass = 'fine' | 'medium' | 'coarse' | 'close' | 'normal' | 'loose';

export const CLEARANCE_CLASSES: readonly ClearanceClass[] = Object.freeze([
  'fine',
  'medium',
  'coarse',
  'close',
  'normal',
  'loose',
]);

type Triple = readonly [number, number, number];

/** ISO 273 fine / medium / coarse, mm. */
const ISO_273_MM: Readonly<Record<string, Triple>> = Object.freeze({
  M6: [6.4, 6.6, 7.0],
  M8: [8.4, 9.0, 10.0],
  M10: [10.5, 11.0, 12.0],
  M12: [13.0, 13.5, 14.5],
  M14: [15.0, 15.5, 16.5],
  M16: [17.0, 17.5, 18.5],
});

/** ASME B18.2.8 close / normal / loose, inch. */
const ASME_B18_2_8_IN: Readonly<Record<string, Triple>> = Object.freeze({
  '1/4': [0.266, 0.281, 0.297],
  '5/16': [0.328, 0.344, 0.359],
  '3/8': [0.391, 0.406, 0.422],
  '7/16': [0.453, 0.469, 0.484],
  '1/2': [0.531, 0.562, 0.609],
  '5/8': [0.656, 0.688, 0.734],
});

const CLASS_INDEX: Readonly<Record<ClearanceClass, 0 | 1 | 2>> = {
  fine: 0,
  close: 0,
  medium: 1,
  normal: 1,
  coarse: 2,
  loose: 2,
};

const METRIC_NAMES = ['fine', 'medium', 'coarse'] as const;
const INCH_NAMES = ['close', 'normal', 'loose'] as const;

export interface ClearanceHole {
  /** fastener nominal, e.g. 'M10', '3/8' */
  readonly nominal: string;
  /** the class in the standard's own words (e.g. 'medium' for ISO 273, 'normal' for ASME) */
  readonly fitClass: ClearanceClass;
  readonly diameterMm: number;
  /** the value as tabulated (mm for ISO 273, inch for ASME B18.2.8) */
  readonly tabulated: { readonly value: number; readonly unit: 'mm' | 'in' };
  readonly standard: 'ISO 273' | 'ASME B18.2.8';
}

function tableFor(fastener: string): { nominal: string; row: Triple; metric: boolean } {
  const f = parseFastener(fastener);
  const metric = f.system === 'metric';
  const row = metric ? ISO_273_MM[f.nominal] : ASME_B18_2_8_IN[f.nominal];
  if (!row) {
    const known = [...Object.keys(ISO_273_MM), ...Object.keys(ASME_B18_2_8_IN)].join(', ');
    throw new DomainError(
      'clearance.unsupported',
      `No clearance hole tabulated for "${fastener}" (${f.nominal}); sizes in the table: ${known}.`,
    );
  }
  return { nominal: f.nominal, row, metric };
}

/** Clearance hole with the class and value as the standard states them. */
export function clearanceHole(fastener: string, fitClass: ClearanceClass): ClearanceHole {
  const index = CLASS_INDEX[fitClass as ClearanceClass];
  if (index === undefined) {
    throw new DomainError(
      'clearance.class',
      `Unknown clearance class "${String(fitClass)}": use fine, medium or coarse (ISO 273) or close, normal or loose (ASME B18.2.8).`,
    );
  }
  const { nominal, row, metric } = tableFor(fastener);
  const value = row[index];
  return Object.freeze({
    nominal,
    fitClass: metric ? METRIC_NAMES[index] : INCH_NAMES[index],
    diameterMm: metric ? value : value * MM_PER_IN,
    tabulated: Object.freeze({ value, unit: metric ? ('mm' as const) : ('in' as const) }),
    standard: metric ? ('ISO 273' as const) : ('ASME B18.2.8' as const),
  });
}

/** Clearance hole diameter, mm, for a bolt (`'M10'`, `'M10x1.5'`, `'3/8'`, `'3/8-16 UNC'`). */
export function clearanceHoleMm(fastener: string, fitClass: ClearanceClass): number {
  return clearanceHole(fastener, fitClass).diameterMm;
}

/** Smallest (finest class) and largest (coarsest class) clearance hole for the bolt, mm. */
export function clearanceRangeMm(fastener: string): { readonly minMm: number; readonly maxMm: number } {
  const { row, metric } = tableFor(fastener);
  const k = metric ? 1 : MM_PER_IN;
  return Object.freeze({ minMm: row[0] * k, maxMm: row[2] * k });
}
