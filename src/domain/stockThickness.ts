/**
 * Plate stock thicknesses, for snapping a computed thickness to something a supplier sells.
 * Metric 6, 8, 10, 12, 14, 16, 18, 20, 25 mm; inch 1/4, 3/8, 1/2, 5/8, 3/4, 1 in (the inch list
 * from memory).
 */
import { MM_PER_IN } from './units';

export type StockSystem = 'metric' | 'inch' | 'any';

export interface StockThickness {
  readonly thicknessMm: number;
  /** as the supplier writes it: "12 mm", "1/2 in" */
  readonly label: string;
  readonly system: 'metric' | 'inch';
}

const METRIC_MM = [6, 8, 10, 12, 14, 16, 18, 20, 25] as const;
const INCH: readonly (readonly [number, string])[] = [
  [1 / 4, '1/4 in'],
  [3 / 8, '3/8 in'],
  [1 / 2, '1/2 in'],
  [5 / 8, '5/8 in'],
  [3 / 4, '3/4 in'],
  [1, '1 in'],
];

/** A thickness within this of a stock size is that stock size (mm). */
export const STOCK_MATCH_TOLERANCE_MM = 0.01;

export const STOCK_THICKNESSES: readonly StockThickness[] = Object.freeze(
  [
    ...METRIC_MM.map((t) => ({ thicknessMm: t, label: `${t} mm`, system: 'metric' as const })),
    ...INCH.map(([t, label]) => ({ thicknessMm: t * MM_PER_IN, label, system: 'inch' as const })),
  ]
    .sort((a, b) => a.thicknessMm - b.thicknessMm)
    .map((s) => Object.freeze(s)),
);

/** Stock sizes of one system (or both), thinnest first. */
export function stockThicknesses(system: StockSystem): readonly StockThickness[] {
  return system === 'any' ? STOCK_THICKNESSES : STOCK_THICKNESSES.filter((s) => s.system === system);
}

/** The stock size equal to `thicknessMm`, if there is one. */
export function matchingStock(thicknessMm: number, system: StockSystem): StockThickness | null {
  return stockThicknesses(system).find((s) => Math.abs(s.thicknessMm - thicknessMm) <= STOCK_MATCH_TOLERANCE_MM) ?? null;
}

/** The thinnest stock at least `thicknessMm` thick (null when thicker than every stock size). */
export function stockAtLeast(thicknessMm: number, system: StockSystem): StockThickness | null {
  return stockThicknesses(system).find((s) => s.thicknessMm >= thicknessMm - STOCK_MATCH_TOLERANCE_MM) ?? null;
}
