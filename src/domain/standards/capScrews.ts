/**
 * Socket head cap screw heads and the counterbores that hide them.
 *
 * Metric ISO 4762: head diameter dk (max) M6 10 … M16 24 mm; head height k = d.
 * Counterbore diameters for them per DIN 974-1 (from memory): 11, 15, 18, 20, 24, 26 mm.
 * Inch ASME B18.3: head diameter A (max) and head height H (max) = D (from memory, matches the
 * published B18.3 tables); counterbore diameters are the usual shop-chart values (from memory).
 * Counterbore depth = head height + 0.5 mm, so the head sits below the surface (common practice).
 */
import { DomainError } from '../errors';
import { MM_PER_IN } from '../units';
import { parseFastener } from './threads';

/** Depth added to the head height so the head sits below the face (common practice). */
export const COUNTERBORE_DEPTH_ALLOWANCE_MM = 0.5;

export interface CapScrewHead {
  readonly nominal: string;
  readonly headDiameterMm: number;
  readonly headHeightMm: number;
  readonly counterboreDiameterMm: number;
  readonly counterboreDepthMm: number;
  readonly standard: 'ISO 4762' | 'ASME B18.3';
}

/** ISO 4762 dk max, k max; DIN 974-1 counterbore Ø (mm). */
const METRIC_HEADS: Readonly<Record<string, readonly [number, number, number]>> = Object.freeze({
  M6: [10, 6, 11],
  M8: [13, 8, 15],
  M10: [16, 10, 18],
  M12: [18, 12, 20],
  M14: [21, 14, 24],
  M16: [24, 16, 26],
});

/** ASME B18.3 A max, H max; shop-chart counterbore Ø (inch). */
const INCH_HEADS: Readonly<Record<string, readonly [number, number, number]>> = Object.freeze({
  '1/4': [0.375, 0.25, 7 / 16],
  '5/16': [0.469, 0.312, 17 / 32],
  '3/8': [0.562, 0.375, 5 / 8],
  '7/16': [0.656, 0.438, 23 / 32],
  '1/2': [0.75, 0.5, 13 / 16],
  '5/8': [0.938, 0.625, 1],
});

/** Head and counterbore of a socket head cap screw (`'M10'`, `'M10x1.5'`, `'3/8'`, `'3/8-16 UNC'`). */
export function capScrewHead(fastener: string): CapScrewHead {
  const f = parseFastener(fastener);
  const metric = f.system === 'metric';
  const row = metric ? METRIC_HEADS[f.nominal] : INCH_HEADS[f.nominal];
  if (!row) {
    const known = [...Object.keys(METRIC_HEADS), ...Object.keys(INCH_HEADS)].join(', ');
    throw new DomainError(
      'capScrew.unsupported',
      `No socket head cap screw tabulated for "${fastener}" (${f.nominal}); sizes in the table: ${known}.`,
    );
  }
  const k = metric ? 1 : MM_PER_IN;
  const headHeightMm = row[1] * k;
  return Object.freeze({
    nominal: f.nominal,
    headDiameterMm: row[0] * k,
    headHeightMm,
    counterboreDiameterMm: row[2] * k,
    counterboreDepthMm: headHeightMm + COUNTERBORE_DEPTH_ALLOWANCE_MM,
    standard: metric ? ('ISO 4762' as const) : ('ASME B18.3' as const),
  });
}
