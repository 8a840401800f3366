import { describe, expect, it } from 'vitest';
import { DomainError } from '~/domain/errors';
import { boltCircle } from '~/domain/geometry/boltCircle';
import { FLYWHEEL_HOUSING_SIZES, flywheelHousing } from '~/domain/standards/flywheelHousings';

describe('SAE J617 flywheel housings', () => {
  // REFERENCES.md "Flywheel housing sizes — SAE J617" [S], inch; returned in mm (× 25.4)
  const table: [string, number, number, number, number, string][] = [
    ['00', 31.0, 31.01, 33.5, 16, '1/2-13 UNC'],
    ['0', 25.5, 25.51, 26.75, 16, '1/2-13 UNC'],
    ['1/2', 23.0, 23.008, 24.375, 12, '1/2-13 UNC'],
    ['1', 20.125, 20.13, 20.875, 12, '7/16-14 UNC'],
    ['2', 17.625, 17.63, 18.375, 12, '3/8-16 UNC'],
    ['3', 16.125, 16.13, 16.875, 12, '3/8-16 UNC'],
    ['4', 14.25, 14.255, 15.0, 12, '3/8-16 UNC'],
    ['5', 12.375, 12.38, 13.125, 8, '3/8-16 UNC'],
    ['6', 10.5, 10.505, 11.25, 8, '3/8-16 UNC'],
  ];

  it('lists every size in order', () => {
    expect(FLYWHEEL_HOUSING_SIZES).toEqual(table.map((r) => r[0]));
  });

  it.each(table)('SAE J617 size %s: bore %d/%d in, bolt circle %d in, %d × %s', (size, bore, boreUpper, bc, holes, thread) => {
    const h = flywheelHousing(size as never);
    expect(h.size).toBe(size);
    expect(h.boreMm).toBeCloseTo(bore * 25.4, 9);
    expect(h.boreUpperMm).toBeCloseTo(boreUpper * 25.4, 9);
    expect(h.boltCircleDiameterMm).toBeCloseTo(bc * 25.4, 9);
    expect(h.holeCount).toBe(holes);
    expect(h.thread).toBe(thread);
    expect(h.holeAnglesDeg).toHaveLength(holes);
  });

  it('crank-flange-to-housing-face depth: 3-15/16 in for 00–4, 2-13/16 in for 5–6 (SAE J617 via REFERENCES)', () => {
    for (const s of ['00', '0', '1/2', '1', '2', '3', '4'] as const) {
      expect(flywheelHousing(s).crankFlangeToHousingFaceMm).toBeCloseTo(100.0125, 9); // 3.9375 × 25.4
    }
    for (const s of ['5', '6'] as const) {
      expect(flywheelHousing(s).crankFlangeToHousingFaceMm).toBeCloseTo(71.4375, 9); // 2.8125 × 25.4
    }
  });

  it('holes straddle the vertical: 8 holes start 22.5° off vertical (SAE J617 [S])', () => {
    const h = flywheelHousing('5');
    const a = h.holeAnglesDeg;
    // first hole just right of top at 90 − 22.5 = 67.5°, then counter-clockwise
    expect(a).toEqual([67.5, 112.5, 157.5, 202.5, 247.5, 292.5, 337.5, 22.5]);
    expect(h.startAngleDeg).toBe(67.5);
    // no hole on the vertical centreline (90°, 270°), two holes at 90 ± 22.5
    expect(a).toContain(90 - 22.5);
    expect(a).toContain(90 + 22.5);
  });

  it('12 holes start 15° and 16 holes 11.25° off vertical (half pitch, from memory per REFERENCES [M])', () => {
    const a12 = flywheelHousing('3').holeAnglesDeg;
    expect(a12[0]).toBeCloseTo(90 - 15, 12);
    expect(a12).toContain(75);
    expect(a12).toContain(105);
    const a16 = flywheelHousing('00').holeAnglesDeg;
    expect(a16[0]).toBeCloseTo(90 - 11.25, 12);
    expect(a16.some((x) => Math.abs(x - 78.75) < 1e-9)).toBe(true);
    expect(a16.some((x) => Math.abs(x - 101.25) < 1e-9)).toBe(true);
  });

  it('every pattern is evenly spaced counter-clockwise and mirror-symmetric about the vertical', () => {
    for (const s of FLYWHEEL_HOUSING_SIZES) {
      const a = flywheelHousing(s).holeAnglesDeg;
      const pitch = 360 / a.length;
      for (let i = 1; i < a.length; i++) expect((((a[i]! - a[i - 1]!) % 360) + 360) % 360).toBeCloseTo(pitch, 9);
      for (const t of a) {
        expect(t).toBeGreaterThanOrEqual(0);
        expect(t).toBeLessThan(360);
      }
      // mirror about the vertical (x → −x) maps angle θ to 180 − θ
      for (const t of a) {
        const mirrored = (((180 - t) % 360) + 360) % 360;
        expect(a.some((u) => Math.abs(u - mirrored) < 1e-9)).toBe(true);
      }
    }
  });

  it('runout limits by housing bore (SAE max TIR, REFERENCES "Axis alignment")', () => {
    // bore ≤ 14¼ in 0.006; 14¼–20⅛ 0.008; 20⅛–25½ 0.010; 25½–31 0.012 in
    expect(flywheelHousing('4').maxRunoutTirMm).toBeCloseTo(0.006 * 25.4, 12);
    expect(flywheelHousing('6').maxRunoutTirMm).toBeCloseTo(0.006 * 25.4, 12);
    expect(flywheelHousing('1').maxRunoutTirMm).toBeCloseTo(0.008 * 25.4, 12);
    expect(flywheelHousing('1/2').maxRunoutTirMm).toBeCloseTo(0.01 * 25.4, 12);
    expect(flywheelHousing('0').maxRunoutTirMm).toBeCloseTo(0.01 * 25.4, 12);
    expect(flywheelHousing('00').maxRunoutTirMm).toBeCloseTo(0.012 * 25.4, 12);
  });

  it('its start angle reproduces the hole list through boltCircle', () => {
    const h = flywheelHousing('2');
    const holes = boltCircle({ diameterMm: h.boltCircleDiameterMm, count: h.holeCount, startAngleDeg: h.startAngleDeg });
    holes.forEach((p, i) => expect(p.angleDeg).toBeCloseTo(h.holeAnglesDeg[i]!, 9));
    // SAE J617 size 2 bolt circle 18.375 in: radius 233.3625 mm
    expect(Math.hypot(holes[0]!.x, holes[0]!.y)).toBeCloseTo(18.375 * 25.4 / 2, 9);
  });

  it('refuses an unknown size', () => {
    expect(() => flywheelHousing('7' as never)).toThrow(DomainError);
    expect(() => flywheelHousing('7' as never)).toThrow(/00, 0, 1\/2/);
  });
});
