/**
 * Position of a hole as machined against its nominal centre, in the diameter-zone form:
 * TP = 2·√(Δx² + Δy²) (ASME Y14.5). The value is the diameter of the smallest cylindrical zone,
 * centred on the nominal position, that holds the measured axis; it passes when TP ≤ the zone
 * diameter given as the position tolerance. Lengths in mm, plate coordinates.
 */
import { DomainError } from '../errors';

export interface PositionDeviation {
  /** measured − nominal */
  readonly dxMm: number;
  readonly dyMm: number;
  /** 2·√(Δx² + Δy²) */
  readonly truePositionMm: number;
}

/** Diameter-zone true position of a deviation vector (Δx, Δy). */
export function truePositionMm(dxMm: number, dyMm: number): number {
  if (!Number.isFinite(dxMm) || !Number.isFinite(dyMm)) {
    throw new DomainError('inspection.number', `True position needs finite deviations, got Δx ${String(dxMm)}, Δy ${String(dyMm)}.`);
  }
  return 2 * Math.hypot(dxMm, dyMm);
}

export function positionDeviation(
  nominal: { readonly x: number; readonly y: number },
  measured: { readonly x: number; readonly y: number },
): PositionDeviation {
  const dxMm = measured.x - nominal.x;
  const dyMm = measured.y - nominal.y;
  return Object.freeze({ dxMm, dyMm, truePositionMm: truePositionMm(dxMm, dyMm) });
}

/** Comparisons of measured values with limits allow this much float noise (far below any gauge). */
export const INSPECTION_COMPARE_EPSILON_MM = 1e-9;

export function withinZone(truePosition: number, zoneDiameterMm: number): boolean {
  return truePosition <= zoneDiameterMm + INSPECTION_COMPARE_EPSILON_MM;
}

export function withinLimits(value: number, lowerMm: number, upperMm: number): boolean {
  return value >= lowerMm - INSPECTION_COMPARE_EPSILON_MM && value <= upperMm + INSPECTION_COMPARE_EPSILON_MM;
}
