import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DomainError } from '~/domain/errors';
import { fitBoltCircle } from '~/domain/fit/boltCircleFit';
import { boltCircle } from '~/domain/geometry/boltCircle';
import { seededRandom } from './seededRandom';

function codeOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    if (e instanceof DomainError) return e.code;
    throw e;
  }
  return 'no error';
}

const rotateAbout = (p: { x: number; y: number }, cx: number, cy: number, deg: number) => {
  const t = (deg * Math.PI) / 180;
  const dx = p.x - cx;
  const dy = p.y - cy;
  return { x: cx + dx * Math.cos(t) - dy * Math.sin(t), y: cy + dx * Math.sin(t) + dy * Math.cos(t) };
};

describe('fitBoltCircle', () => {
  it('recovers an exact pattern: centre, diameter, pitch, start angle, zero deviations', () => {
    const holes = boltCircle({ diameterMm: 150, count: 6, startAngleDeg: 30, centerX: 4, centerY: -2 });
    const f = fitBoltCircle(holes);
    expect(f.centerX).toBeCloseTo(4, 9);
    expect(f.centerY).toBeCloseTo(-2, 9);
    expect(f.diameterMm).toBeCloseTo(150, 9);
    expect(f.count).toBe(6);
    expect(f.pitchDeg).toBe(60);
    expect(f.startAngleDeg).toBeCloseTo(30, 9);
    expect(f.rms).toBeLessThan(1e-9);
    f.angles.forEach((a, i) => {
      expect(a.index).toBe(i);
      expect(a.slot).toBe(i);
      expect(a.angleDeg).toBeCloseTo(30 + 60 * i, 9);
      expect(a.nearestRegularDeg).toBeCloseTo(30 + 60 * i, 9);
      expect(Math.abs(a.deviationDeg)).toBeLessThan(1e-9);
    });
  });

  it('reports the start angle in [0, pitch)', () => {
    // 4 holes from 100°: positions 100, 190, 280, 10 -> start 10°, the hole at 100° is slot 1
    const f = fitBoltCircle(boltCircle({ diameterMm: 80, count: 4, startAngleDeg: 100 }));
    expect(f.startAngleDeg).toBeCloseTo(10, 9);
    expect(f.angles[0]!.slot).toBe(1);
  });

  it('one hole 0.6° off: deviations 0.6·(1 − 1/n) for it and −0.6/n for the others (hand computed, n = 6)', () => {
    // the moved hole stays on the circle, so the fitted circle is unchanged; the least-squares start
    // shifts by the mean deviation 0.6/6 = 0.1°
    const holes = boltCircle({ diameterMm: 200, count: 6, startAngleDeg: 0 });
    holes[2] = rotateAbout(holes[2]!, 0, 0, 0.6) as never;
    const f = fitBoltCircle(holes);
    expect(f.diameterMm).toBeCloseTo(200, 9);
    expect(f.startAngleDeg).toBeCloseTo(0.1, 9);
    expect(f.angles[2]!.deviationDeg).toBeCloseTo(0.5, 9);
    for (const i of [0, 1, 3, 4, 5]) expect(f.angles[i]!.deviationDeg).toBeCloseTo(-0.1, 9);
    // rms of (0.5, −0.1 × 5) = √((0.25 + 0.05)/6) = √0.05
    expect(f.angularRmsDeg).toBeCloseTo(Math.sqrt(0.05), 9);
  });

  it('a pattern with missing holes, given the full count', () => {
    // 8-hole J617-style pattern from 22.5°, holes at slots 2 and 5 missing, input shuffled
    const all = boltCircle({ diameterMm: 333.375, count: 8, startAngleDeg: 22.5 });
    const present = [7, 0, 3, 1, 6, 4].map((k) => all[k]!);
    const f = fitBoltCircle(present, { count: 8 });
    expect(f.pitchDeg).toBe(45);
    expect(f.startAngleDeg).toBeCloseTo(22.5, 9);
    expect(f.angles.map((a) => a.slot)).toEqual([7, 0, 3, 1, 6, 4]);
    expect(f.angles.map((a) => a.index)).toEqual([0, 1, 2, 3, 4, 5]);
    expect(f.diameterMm).toBeCloseTo(333.375, 9);
  });

  it('seeded measurement noise: diameter and angles within the scatter, radial deviations reported', () => {
    const rnd = seededRandom(99);
    const sigma = 0.02;
    const holes = boltCircle({ diameterMm: 260, count: 10, startAngleDeg: 9, centerX: 1.5, centerY: 0.5 }).map((h) => ({
      x: h.x + sigma * rnd.normal(),
      y: h.y + sigma * rnd.normal(),
    }));
    const f = fitBoltCircle(holes);
    expect(Math.abs(f.diameterMm - 260)).toBeLessThan(0.05);
    expect(Math.abs(f.startAngleDeg - 9)).toBeLessThan(0.05);
    // 0.02 mm at r 130 is 0.0088°; allow 5σ per hole
    for (const a of f.angles) expect(Math.abs(a.deviationDeg)).toBeLessThan(0.05);
    const rmsRadial = Math.sqrt(f.angles.reduce((s, a) => s + a.radialDeviationMm ** 2, 0) / f.angles.length);
    expect(rmsRadial).toBeCloseTo(f.rms, 12);
  });

  it('rotating the pattern shifts the start angle by the same amount modulo the pitch (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 3, max: 16 }), fc.double({ min: 0, max: 360, noNaN: true, maxExcluded: true }), (n, start) => {
        const f = fitBoltCircle(boltCircle({ diameterMm: 120, count: n, startAngleDeg: start }));
        const pitch = 360 / n;
        const expected = ((start % pitch) + pitch) % pitch;
        const diff = Math.abs(f.startAngleDeg - expected);
        expect(Math.min(diff, pitch - diff)).toBeLessThan(1e-7);
        expect(f.startAngleDeg).toBeGreaterThanOrEqual(0);
        expect(f.startAngleDeg).toBeLessThan(pitch);
      }),
    );
  });

  it('refuses bad input', () => {
    const pts = boltCircle({ diameterMm: 100, count: 6, startAngleDeg: 0 });
    expect(codeOf(() => fitBoltCircle(pts.slice(0, 2)))).toBe('fit.tooFewPoints');
    expect(codeOf(() => fitBoltCircle(pts, { count: 5 }))).toBe('fit.boltCircle.count');
    expect(codeOf(() => fitBoltCircle(pts, { count: 6.5 }))).toBe('fit.boltCircle.count');
    expect(codeOf(() => fitBoltCircle([{ x: 0, y: 0 }, { x: 1, y: 1 }, { x: 2, y: 2 }]))).toBe('fit.collinear');
    expect(codeOf(() => fitBoltCircle([...pts.slice(0, 5), { x: NaN, y: 0 }]))).toBe('fit.nonFinite');
    expect(codeOf(() => fitBoltCircle('holes' as never))).toBe('fit.input');
  });

  it('refuses two holes on the same position of the pattern', () => {
    // a 4-hole pattern plus a hole 10° from the first: with count 5 (pitch 72°) two share a position
    const holes = [...boltCircle({ diameterMm: 100, count: 4, startAngleDeg: 0 }), ...boltCircle({ diameterMm: 100, anglesDeg: [10] })];
    expect(codeOf(() => fitBoltCircle(holes))).toBe('fit.boltCircle.duplicate');
    expect(() => fitBoltCircle(holes)).toThrow(/larger count/);
  });
});
