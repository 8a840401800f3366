import { describe, expect, it } from 'vitest';
import { blankVolumeMm3 } from '../../../src/cad/analyticVolume';
import { offsetOutlineInward } from '../../../src/cad/offsetOutline';
import { chainSignedAreaMm2 } from '../../../src/domain/exports/outlineMath';
import { chamferBlock, referencePlate, roundedRectangle } from '../../fixtures/profiles';
import type { PlateProfile } from '../../../src/domain/profileTypes';

/**
 * Independent check of the chamfer formula: the band volume is ∫₀ᶜ A(d) dd, where A(d) is the
 * area of the outline offset inward by d, built here segment by segment. A(d) is quadratic in d,
 * so Simpson's rule integrates it exactly (hand computation).
 */
function simpsonBlank(p: PlateProfile): number {
  const c = p.edgeChamferMm;
  const t = p.thicknessMm;
  const A = (d: number) => chainSignedAreaMm2(offsetOutlineInward(p.outline, d));
  const band = (c / 6) * (A(0) + 4 * A(c / 2) + A(c));
  return A(0) * (t - 2 * c) + 2 * band;
}

describe('analytic blank volume with the edge chamfer', () => {
  it('matches Simpson integration of the offset outline areas (filleted, concave corners)', () => {
    const v = blankVolumeMm3(referencePlate);
    expect(Math.abs(v - simpsonBlank(referencePlate)) / v).toBeLessThan(1e-12);
  });

  it('matches the hand formula for a sharp rectangle (mitred corners)', () => {
    // 120 × 80 × 12, c = 2: V = A·t − P·c² + (8/3)·c³ (hand computation)
    const hand = 9600 * 12 - 400 * 4 + (8 / 3) * 8;
    expect(blankVolumeMm3(chamferBlock)).toBeCloseTo(hand, 8);
    expect(simpsonBlank(chamferBlock)).toBeCloseTo(hand, 8);
  });

  it('an inset rounded rectangle keeps its arcs concentric with the radius reduced', () => {
    const inset = offsetOutlineInward(roundedRectangle(100, 60, 10), 2);
    const arcs = inset.filter((s) => s.kind === 'arc');
    expect(arcs).toHaveLength(4);
    for (const a of arcs) if (a.kind === 'arc') expect(a.radiusMm).toBeCloseTo(8, 12);
    // (100 − 4) × (60 − 4) − (4 − π)·8² (hand computation)
    expect(chainSignedAreaMm2(inset)).toBeCloseTo(96 * 56 - (4 - Math.PI) * 64, 9);
  });
});
