import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DomainError } from '~/domain/errors';
import {
  evaluateStackUps,
  pilotStackUp,
  plateThicknessStackUp,
  releaseBearingStackUp,
  stackUp,
  stackUpInputsSchema,
  starterLandingStackUp,
  toothOverlapMm,
  type StackDimension,
} from '~/domain/stackUp';

function errorOf(fn: () => unknown): DomainError {
  try {
    fn();
  } catch (e) {
    if (e instanceof DomainError) return e;
    throw e;
  }
  throw new Error('expected a DomainError');
}

const tol = (nominalMm: number, plusMm = 0, minusMm = plusMm) => ({ nominalMm, plusMm, minusMm });

describe('stackUp (worst case and RSS)', () => {
  it('hand-worked chain with an asymmetric tolerance', () => {
    // All positions rearward from the block face (mm). Invented example:
    //   crank flange  −1.50 ± 0.10          band [−1.60, −1.40], mean −1.50, half band 0.10
    //   flywheel      28.00 + 0.20 / − 0     band [28.00, 28.20], mean 28.10, half band 0.10
    //   requirement   14.00 ± 0.30 (sense −) band [13.70, 14.30], mean 14.00, half band 0.30
    //   spacer         0.80 ± 0.05 (sense −) band [0.75, 0.85],  mean 0.80,  half band 0.05
    // nominal   = −1.50 + 28.00 − 14.00 − 0.80 = 11.70
    // worst min = −1.60 + 28.00 − 14.30 − 0.85 = 11.25
    // worst max = −1.40 + 28.20 − 13.70 − 0.75 = 12.35
    // mean      = −1.50 + 28.10 − 14.00 − 0.80 = 11.80
    // RSS half  = √(0.10² + 0.10² + 0.30² + 0.05²) = √0.1125 = 0.335410
    // RSS band  = 11.80 ± 0.335410 = [11.464590, 12.135410]
    // shares    = 0.01/0.1125 = 0.0889, 0.0889, 0.09/0.1125 = 0.8, 0.0025/0.1125 = 0.0222
    const chain: StackDimension[] = [
      { name: 'crank flange', nominalMm: -1.5, plusMm: 0.1, minusMm: 0.1, sense: 1 },
      { name: 'flywheel', nominalMm: 28, plusMm: 0.2, minusMm: 0, sense: 1 },
      { name: 'requirement', nominalMm: 14, plusMm: 0.3, minusMm: 0.3, sense: -1 },
      { name: 'spacer', nominalMm: 0.8, plusMm: 0.05, minusMm: 0.05, sense: -1 },
    ];
    const r = stackUp(chain);
    expect(r.nominalMm).toBeCloseTo(11.7, 12);
    expect(r.worstCase.minMm).toBeCloseTo(11.25, 12);
    expect(r.worstCase.maxMm).toBeCloseTo(12.35, 12);
    expect(r.meanMm).toBeCloseTo(11.8, 12);
    expect(r.rss.minMm).toBeCloseTo(11.46459, 5);
    expect(r.rss.maxMm).toBeCloseTo(12.13541, 5);
    expect(r.contributions.map((c) => c.name)).toEqual(['crank flange', 'flywheel', 'requirement', 'spacer']);
    expect(r.contributions.map((c) => c.shareOfVariance)).toEqual([
      expect.closeTo(0.0889, 4),
      expect.closeTo(0.0889, 4),
      expect.closeTo(0.8, 12),
      expect.closeTo(0.0222, 4),
    ]);
  });

  it('a subtracted asymmetric dimension flips its band', () => {
    // −(10 + 0.2 / − 0) = band [−10.2, −10.0], mean −10.1 (hand computed)
    const r = stackUp([{ name: 'a', nominalMm: 10, plusMm: 0.2, minusMm: 0, sense: -1 }]);
    expect(r.nominalMm).toBe(-10);
    expect(r.worstCase).toEqual({ minMm: -10.2, maxMm: -10 });
    expect(r.meanMm).toBeCloseTo(-10.1, 12);
    expect(r.rss.minMm).toBeCloseTo(-10.2, 12);
    expect(r.rss.maxMm).toBeCloseTo(-10, 12);
  });

  it('no tolerances: every band collapses to the nominal, shares are 0 (not NaN)', () => {
    const r = stackUp([{ name: 'a', nominalMm: 3, plusMm: 0, minusMm: 0, sense: 1 }]);
    expect(r.worstCase).toEqual({ minMm: 3, maxMm: 3 });
    expect(r.contributions[0]!.shareOfVariance).toBe(0);
  });

  it('RSS lies inside the worst case, shares sum to 1 (property)', () => {
    const dimArb = fc.record({
      name: fc.constant('d'),
      nominalMm: fc.double({ min: -100, max: 100, noNaN: true }),
      plusMm: fc.double({ min: 0, max: 1, noNaN: true }),
      minusMm: fc.double({ min: 0, max: 1, noNaN: true }),
      sense: fc.constantFrom(1 as const, -1 as const),
    });
    fc.assert(
      fc.property(fc.array(dimArb, { minLength: 1, maxLength: 12 }), (chain) => {
        const r = stackUp(chain);
        expect(r.rss.minMm).toBeGreaterThanOrEqual(r.worstCase.minMm - 1e-9);
        expect(r.rss.maxMm).toBeLessThanOrEqual(r.worstCase.maxMm + 1e-9);
        const total = r.contributions.reduce((s, c) => s + c.shareOfVariance, 0);
        if (chain.some((d) => d.plusMm + d.minusMm > 0)) expect(total).toBeCloseTo(1, 9);
      }),
    );
  });

  it('refuses bad dimensions, naming the index and field', () => {
    expect(errorOf(() => stackUp([])).code).toBe('stackUp.invalid');
    const e = errorOf(() => stackUp([{ name: 'x', nominalMm: 1, plusMm: -0.1, minusMm: 0, sense: 1 }]));
    expect(e.path).toEqual(['chain', 0, 'plusMm']);
    expect(errorOf(() => stackUp([{ name: 'x', nominalMm: NaN, plusMm: 0, minusMm: 0, sense: 1 }])).path).toEqual(['chain', 0, 'nominalMm']);
    expect(errorOf(() => stackUp([{ name: 'x', nominalMm: 1, plusMm: 0, minusMm: 0, sense: 0 as never }])).message).toMatch(/1 or -1/);
    expect(errorOf(() => stackUp([{ name: '', nominalMm: 1, plusMm: 0, minusMm: 0, sense: 1 }])).path).toEqual(['chain', 0, 'name']);
  });
});

describe('required plate thickness', () => {
  const input = {
    crankFlangePositionMm: tol(-1.5, 0.1),
    flywheelDepthMm: tol(28, 0.2, 0),
    requiredBellFaceToFrictionFaceMm: tol(14, 0.3),
    spacerMm: tol(0.8, 0.05),
  };

  it('same numbers as the hand-worked chain above', () => {
    const v = plateThicknessStackUp(input);
    expect(v.ok).toBe(true);
    expect(v.result.nominalMm).toBeCloseTo(11.7, 12);
    expect(v.result.worstCase.minMm).toBeCloseTo(11.25, 12);
    expect(v.result.worstCase.maxMm).toBeCloseTo(12.35, 12);
    expect(v.chain.map((d) => d.sense)).toEqual([1, 1, -1, -1]);
    expect(v.message).toContain('11.70 mm');
    expect(v.message).toContain('11.25 mm to 12.35 mm');
  });

  it('no plate can work when the friction face is already too far forward', () => {
    // −1.5 + 10 − 14 = −5.5 mm (hand computed)
    const v = plateThicknessStackUp({ ...input, flywheelDepthMm: tol(10), spacerMm: undefined });
    expect(v.ok).toBe(false);
    expect(v.result.nominalMm).toBeCloseTo(-5.5, 12);
    expect(v.message).toMatch(/No plate can work/);
    expect(v.message).toContain('5.50 mm');
  });

  it('flags a plate thinner than the builder’s minimum', () => {
    const v = plateThicknessStackUp({ ...input, minimumThicknessMm: 12 });
    expect(v.ok).toBe(false);
    expect(v.message).toContain('12.00 mm minimum');
  });
});

describe('pilot engagement and bottoming', () => {
  // tip = plate − protrusion = 12.70 − 26.00 = −13.30
  // engagement = bearing rear face − tip = −4.00 + 13.30 = 9.30
  //   worst min = −4.20 − 12.75 + 25.50 = 8.55, worst max = −3.80 − 12.65 + 26.00 = 9.55
  // bottom clearance = tip − bore bottom = −13.30 + 22.00 = 8.70
  //   worst min = 12.65 − 26.00 + 21.70 = 8.35, worst max = 12.75 − 25.50 + 22.30 = 9.55
  const input = {
    plateThicknessMm: tol(12.7, 0.05),
    pilotBearingRearFaceMm: tol(-4, 0.2),
    pilotBoreBottomMm: tol(-22, 0.3),
    pilotProtrusionMm: tol(26, 0, 0.5),
    minimumEngagementMm: 8,
  };

  it('hand-worked example', () => {
    const v = pilotStackUp(input);
    expect(v.result.nominalMm).toBeCloseTo(9.3, 12);
    expect(v.result.worstCase.minMm).toBeCloseTo(8.55, 12);
    expect(v.result.worstCase.maxMm).toBeCloseTo(9.55, 12);
    expect(v.bottomClearance.result.nominalMm).toBeCloseTo(8.7, 12);
    expect(v.bottomClearance.result.worstCase.minMm).toBeCloseTo(8.35, 12);
    expect(v.bottomClearance.result.worstCase.maxMm).toBeCloseTo(9.55, 12);
    // RSS of engagement: mean −4 − 12.7 + 25.75 = 9.05, half √(0.2² + 0.05² + 0.25²) = √0.105
    expect(v.result.rss.minMm).toBeCloseTo(9.05 - Math.sqrt(0.105), 12);
    expect(v.ok).toBe(true);
    expect(v.message).toContain('9.30 mm');
  });

  it('a thicker plate pulls the pilot out of the bearing', () => {
    // 16 mm plate: engagement −4 − 16 + 26 = 6.0 < 8
    const v = pilotStackUp({ ...input, plateThicknessMm: tol(16, 0.05) });
    expect(v.ok).toBe(false);
    expect(v.result.nominalMm).toBeCloseTo(6, 12);
    expect(v.message).toMatch(/Too little pilot engagement/);
  });

  it('a spacer counts like plate thickness', () => {
    const withSpacer = pilotStackUp({ ...input, plateThicknessMm: tol(10.7, 0.05), spacerMm: tol(2) });
    expect(withSpacer.result.nominalMm).toBeCloseTo(9.3, 12);
    expect(withSpacer.bottomClearance.result.nominalMm).toBeCloseTo(8.7, 12);
  });

  it('a long pilot bottoms', () => {
    // protrusion 36: tip = −23.3, clearance = −1.3
    const v = pilotStackUp({ ...input, pilotProtrusionMm: tol(36) });
    expect(v.ok).toBe(false);
    expect(v.bottomClearance.result.nominalMm).toBeCloseTo(-1.3, 12);
    expect(v.message).toMatch(/can bottom/);
  });
});

describe('starter pinion landing', () => {
  // ring gear front = crank −1.50 + 3.00 = 1.50; pinion front = plate 12.70 + mount −6.00 (pocket) + pinion −5.00 = 1.70
  // offset = 1.70 − 1.50 = 0.20; overlap = min(0.20 + 13, 16) − max(0.20, 0) = 13.00
  // worst offset min = 12.65 − 6.10 − 5.30 + 1.40 − 3.20 = −0.55 -> overlap min(12.45, 16) − 0 = 12.45
  // worst offset max = 12.75 − 5.90 − 4.70 + 1.60 − 2.80 =  0.95 -> overlap 13.95 − 0.95 = 13.00
  const input = {
    crankFlangePositionMm: tol(-1.5, 0.1),
    ringGearFrontFromCrankFlangeMm: tol(3, 0.2),
    ringGearFaceWidthMm: 16,
    starterMount: { reference: 'plateRear' as const, offsetMm: tol(-6, 0.1) },
    plateThicknessMm: tol(12.7, 0.05),
    engagedPinionFrontFromMountMm: tol(-5, 0.3),
    pinionFaceWidthMm: 13,
    minimumEngagementMm: 10,
  };

  it('hand-worked example with a 6 mm starter pocket', () => {
    const v = starterLandingStackUp(input);
    expect(v.result.nominalMm).toBeCloseTo(0.2, 12);
    expect(v.result.worstCase.minMm).toBeCloseTo(-0.55, 12);
    expect(v.result.worstCase.maxMm).toBeCloseTo(0.95, 12);
    expect(v.engagementMm.nominal).toBeCloseTo(13, 12);
    expect(v.engagementMm.worstCaseMin).toBeCloseTo(12.45, 12);
    expect(v.ok).toBe(true);
    expect(v.message).toContain('0.20 mm behind the ring gear front');
  });

  it('without the pocket the pinion lands too far back', () => {
    // offset 6.20 nominal -> overlap 16 − 6.20 = 9.80; worst max offset 6.95 -> overlap 9.05 < 10
    const v = starterLandingStackUp({ ...input, starterMount: { reference: 'plateRear', offsetMm: tol(0, 0.1) } });
    expect(v.engagementMm.nominal).toBeCloseTo(9.8, 12);
    expect(v.engagementMm.worstCaseMin).toBeCloseTo(9.05, 12);
    expect(v.ok).toBe(false);
    expect(v.message).toMatch(/Too little tooth overlap/);
  });

  it('a block-mounted starter does not move with the plate', () => {
    const a = starterLandingStackUp({ ...input, starterMount: { reference: 'blockFace', offsetMm: tol(6.7) }, plateThicknessMm: undefined });
    // 0 + 6.7 − 5 + 1.5 − 3 = 0.2
    expect(a.result.nominalMm).toBeCloseTo(0.2, 12);
    expect(a.chain.some((d) => d.name === 'plate thickness')).toBe(false);
  });

  it('tooth overlap is the intersection of the two faces', () => {
    // hand computed: pinion 10 wide, ring 15 wide
    expect(toothOverlapMm(0, 10, 15)).toBe(10);
    expect(toothOverlapMm(-3, 10, 15)).toBe(7);
    expect(toothOverlapMm(8, 10, 15)).toBe(7);
    expect(toothOverlapMm(20, 10, 15)).toBe(0);
    expect(toothOverlapMm(-12, 10, 15)).toBe(0);
  });

  it('needs the plate thickness when mounted to the plate', () => {
    const e = errorOf(() => starterLandingStackUp({ ...input, plateThicknessMm: undefined }));
    expect(e.code).toBe('stackUp.invalid');
    expect(e.path).toEqual(['starterLanding', 'plateThicknessMm']);
  });
});

describe('clutch release bearing', () => {
  // bearing at rest = plate 12.70 + 62.00 = 74.70; fingers engaged = crank −1.50 + flywheel 28.00 + 42.00 = 68.50
  // clearance = 74.70 − 68.50 = 6.20; worst min = 12.65 + 61.70 + 1.40 − 28.20 − 42.50 = 5.05
  //                                   worst max = 12.75 + 62.30 + 1.60 − 28.00 − 41.50 = 7.15
  // fingers disengaged = −1.50 + 28.00 + 35.00 = 61.50; travel = 74.70 − 61.50 = 13.20
  //   worst max = 12.75 + 62.30 + 1.60 − 28.00 − 34.50 = 14.15
  const input = {
    plateThicknessMm: tol(12.7, 0.05),
    crankFlangePositionMm: tol(-1.5, 0.1),
    flywheelDepthMm: tol(28, 0.2, 0),
    fingersEngagedFromFrictionFaceMm: tol(42, 0.5),
    fingersDisengagedFromFrictionFaceMm: tol(35, 0.5),
    bearingRestFromBellFaceMm: tol(62, 0.3),
    availableTravelMm: 15,
    minimumClearanceMm: 2,
  };

  it('hand-worked example', () => {
    const v = releaseBearingStackUp(input);
    expect(v.result.nominalMm).toBeCloseTo(6.2, 12);
    expect(v.result.worstCase.minMm).toBeCloseTo(5.05, 12);
    expect(v.result.worstCase.maxMm).toBeCloseTo(7.15, 12);
    expect(v.travelToDisengage.result.nominalMm).toBeCloseTo(13.2, 12);
    expect(v.travelToDisengage.result.worstCase.maxMm).toBeCloseTo(14.15, 12);
    expect(v.ok).toBe(true);
    expect(v.message).toContain('6.20 mm');
    expect(v.message).toContain('15.00 mm available');
  });

  it('not enough stroke', () => {
    const v = releaseBearingStackUp({ ...input, availableTravelMm: 14 });
    expect(v.ok).toBe(false);
    expect(v.message).toMatch(/Not enough stroke/);
  });

  it('a bearing pressing on the fingers at rest', () => {
    // bearing 8 mm further forward: clearance −1.80
    const v = releaseBearingStackUp({ ...input, bearingRestFromBellFaceMm: tol(54, 0.3), minimumClearanceMm: 0 });
    expect(v.result.nominalMm).toBeCloseTo(-1.8, 12);
    expect(v.ok).toBe(false);
    expect(v.message).toMatch(/press on the fingers/);
  });

  it('refuses disengaged fingers rearward of the engaged position', () => {
    const e = errorOf(() => releaseBearingStackUp({ ...input, fingersDisengagedFromFrictionFaceMm: tol(45) }));
    expect(e.path).toEqual(['releaseBearing', 'fingersDisengagedFromFrictionFaceMm', 'nominalMm']);
    expect(e.message).toMatch(/move forward to disengage/);
  });
});

describe('evaluateStackUps', () => {
  it('evaluates only the chains given', () => {
    expect(evaluateStackUps({})).toEqual({});
    const r = evaluateStackUps({
      plateThickness: {
        crankFlangePositionMm: tol(0),
        flywheelDepthMm: tol(25.4),
        requiredBellFaceToFrictionFaceMm: tol(12.7),
      },
    });
    expect(Object.keys(r)).toEqual(['plateThickness']);
    // 0 + 25.4 − 12.7 = 12.7 (a 1/2 in plate)
    expect(r.plateThickness!.result.nominalMm).toBeCloseTo(12.7, 12);
  });

  it('defaults missing tolerances to zero', () => {
    const parsed = stackUpInputsSchema.parse({
      plateThickness: { crankFlangePositionMm: { nominalMm: 1 }, flywheelDepthMm: { nominalMm: 2 }, requiredBellFaceToFrictionFaceMm: { nominalMm: 0.5 } },
    });
    expect(parsed.plateThickness!.crankFlangePositionMm).toEqual({ nominalMm: 1, plusMm: 0, minusMm: 0 });
  });

  it('refuses unknown keys, negative tolerances and missing fields with the path', () => {
    expect(errorOf(() => evaluateStackUps({ thickness: {} } as never)).code).toBe('stackUp.invalid');
    const neg = errorOf(() =>
      evaluateStackUps({
        plateThickness: {
          crankFlangePositionMm: { nominalMm: 0, plusMm: -1 },
          flywheelDepthMm: tol(1),
          requiredBellFaceToFrictionFaceMm: tol(1),
        },
      }),
    );
    expect(neg.path).toEqual(['plateThickness', 'crankFlangePositionMm', 'plusMm']);
    expect(neg.message).toContain('plateThickness.crankFlangePositionMm.plusMm');
    const missing = errorOf(() => evaluateStackUps({ pilot: { plateThicknessMm: tol(1) } } as never));
    expect(missing.message).toContain('pilot.pilotBearingRearFaceMm');
    const extra = errorOf(() =>
      evaluateStackUps({
        plateThickness: { crankFlangePositionMm: { nominalMm: 0, tol: 1 }, flywheelDepthMm: tol(1), requiredBellFaceToFrictionFaceMm: tol(1) },
      } as never),
    );
    expect(extra.message).toContain('plateThickness.crankFlangePositionMm');
  });
});
