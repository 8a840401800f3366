import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DomainError } from '~/domain/errors';
import { boltCircle } from '~/domain/geometry/boltCircle';

describe('boltCircle', () => {
  it('places evenly spaced holes CCW from +X', () => {
    // hand computed: Ø100, 4 holes from 0° -> (50,0) (0,50) (−50,0) (0,−50)
    const holes = boltCircle({ diameterMm: 100, count: 4, startAngleDeg: 0 });
    expect(holes).toEqual([
      { x: 50, y: 0, angleDeg: 0 },
      { x: 0, y: 50, angleDeg: 90 },
      { x: -50, y: 0, angleDeg: 180 },
      { x: 0, y: -50, angleDeg: 270 },
    ]);
  });

  it('offsets the centre and normalises angles', () => {
    // hand computed: Ø20 about (5, −3), 3 holes from 90°: 90°, 210°, 330°
    const holes = boltCircle({ diameterMm: 20, count: 3, startAngleDeg: 90, centerX: 5, centerY: -3 });
    expect(holes[0]).toEqual({ x: 5, y: 7, angleDeg: 90 });
    expect(holes[1]!.x).toBeCloseTo(5 - 10 * Math.cos(Math.PI / 6), 12);
    expect(holes[1]!.y).toBeCloseTo(-3 - 5, 12);
    expect(holes[1]!.angleDeg).toBeCloseTo(210, 12);
    expect(holes[2]!.angleDeg).toBeCloseTo(330, 12);
  });

  it('takes explicit angles in the order given', () => {
    const holes = boltCircle({ diameterMm: 200, anglesDeg: [-45, 45, 400] });
    expect(holes.map((h) => h.angleDeg)).toEqual([315, 45, 40]);
    // cos 45° = √2/2
    expect(holes[1]!.x).toBeCloseTo(100 * Math.SQRT1_2, 12);
    expect(holes[0]!.y).toBeCloseTo(-100 * Math.SQRT1_2, 12);
  });

  it('every hole lies on the circle, spaced by the pitch (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 1000, noNaN: true }),
        fc.integer({ min: 2, max: 36 }),
        fc.double({ min: -720, max: 720, noNaN: true }),
        (d, n, start) => {
          const holes = boltCircle({ diameterMm: d, count: n, startAngleDeg: start, centerX: 10, centerY: 20 });
          expect(holes).toHaveLength(n);
          for (const h of holes) expect(Math.hypot(h.x - 10, h.y - 20)).toBeCloseTo(d / 2, 9);
          // chord between neighbours = d·sin(π/n)
          for (let i = 1; i < n; i++) {
            const a = holes[i - 1]!;
            const b = holes[i]!;
            expect(Math.hypot(b.x - a.x, b.y - a.y)).toBeCloseTo(d * Math.sin(Math.PI / n), 8);
          }
        },
      ),
    );
  });

  it.each([
    [{ diameterMm: 0, count: 4, startAngleDeg: 0 }, /greater than 0/],
    [{ diameterMm: NaN, count: 4, startAngleDeg: 0 }, /finite/],
    [{ diameterMm: 100, count: 2.5, startAngleDeg: 0 }, /whole number/],
    [{ diameterMm: 100, count: 0, startAngleDeg: 0 }, /whole number/],
    [{ diameterMm: 100, count: 4, startAngleDeg: Infinity }, /startAngleDeg/],
    [{ diameterMm: 100, anglesDeg: [] }, /at least one/],
    [{ diameterMm: 100, anglesDeg: [0, NaN] }, /anglesDeg\[1\]/],
  ])('refuses %j', (input, message) => {
    expect(() => boltCircle(input as never)).toThrow(DomainError);
    expect(() => boltCircle(input as never)).toThrow(message);
  });
});
