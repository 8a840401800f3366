import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DomainError } from '~/domain/errors';
import { gearCenterDistanceMm, gearModuleMm } from '~/domain/standards/gears';

describe('ring gear / pinion centre distance', () => {
  it('module form a = m(z1 + z2)/2 (ISO 21771 basics via REFERENCES)', () => {
    // hand computed: m 2.5, 130 + 10 teeth -> 2.5 × 140 / 2 = 175 mm
    expect(gearCenterDistanceMm({ ringTeeth: 130, pinionTeeth: 10, moduleMm: 2.5 })).toBe(175);
    // m 2.1167, 129 + 11 -> 148.169 mm
    expect(gearCenterDistanceMm({ ringTeeth: 129, pinionTeeth: 11, moduleMm: 2.1167 })).toBeCloseTo(148.169, 9);
  });

  it('diametral pitch form a = (N1 + N2)/(2P) in (AGMA basics via REFERENCES)', () => {
    // hand computed: P 8, 153 + 9 teeth -> 162/16 = 10.125 in = 257.175 mm
    expect(gearCenterDistanceMm({ ringTeeth: 153, pinionTeeth: 9, diametralPitch: 8 })).toBeCloseTo(257.175, 9);
    // P 10, 168 + 12 -> 9 in = 228.6 mm
    expect(gearCenterDistanceMm({ ringTeeth: 168, pinionTeeth: 12, diametralPitch: 10 })).toBeCloseTo(228.6, 9);
  });

  it('diametral pitch P equals module 25.4/P (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 50, max: 200 }), fc.integer({ min: 7, max: 15 }), fc.double({ min: 4, max: 16, noNaN: true }), (z1, z2, p) => {
        const dp = gearCenterDistanceMm({ ringTeeth: z1, pinionTeeth: z2, diametralPitch: p });
        const m = gearCenterDistanceMm({ ringTeeth: z1, pinionTeeth: z2, moduleMm: 25.4 / p });
        expect(dp).toBeCloseTo(m, 9);
      }),
    );
    expect(gearModuleMm({ ringTeeth: 1, pinionTeeth: 1, diametralPitch: 10 })).toBeCloseTo(2.54, 12);
  });

  it.each([
    [{ ringTeeth: 130.5, pinionTeeth: 10, moduleMm: 2.5 }, /ringTeeth/],
    [{ ringTeeth: 130, pinionTeeth: 0, moduleMm: 2.5 }, /pinionTeeth/],
    [{ ringTeeth: 130, pinionTeeth: 10, moduleMm: -1 }, /moduleMm/],
    [{ ringTeeth: 130, pinionTeeth: 10, diametralPitch: 0 }, /diametralPitch/],
    [{ ringTeeth: 130, pinionTeeth: 10 }, /either moduleMm/],
    [{ ringTeeth: 130, pinionTeeth: 10, moduleMm: 2.5, diametralPitch: 10 }, /not both/],
  ])('refuses %j', (input, message) => {
    expect(() => gearCenterDistanceMm(input as never)).toThrow(DomainError);
    expect(() => gearCenterDistanceMm(input as never)).toThrow(message);
  });
});
