import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DomainError } from '~/domain/errors';
import { fitCircle, type CircleFitMethod } from '~/domain/fit/circle';
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

/** Points on a circle at the given angles (radians), plus optional radial noise. */
function circlePoints(cx: number, cy: number, r: number, angles: number[], noise: () => number = () => 0): { x: number; y: number }[] {
  return angles.map((t) => {
    const rr = r + noise();
    return { x: cx + rr * Math.cos(t), y: cy + rr * Math.sin(t) };
  });
}

const even = (n: number, from = 0, span = 2 * Math.PI): number[] => Array.from({ length: n }, (_, i) => from + (span * i) / n);

// Gander, Golub & Strebel, "Least-squares fitting of circles and ellipses", BIT 34 (1994) — REFERENCES.md
const GGS = [
  { x: 1, y: 7 },
  { x: 2, y: 6 },
  { x: 5, y: 8 },
  { x: 7, y: 7 },
  { x: 9, y: 5 },
  { x: 3, y: 7 },
];

describe('Gander–Golub–Strebel worked example', () => {
  it('algebraic fit (‖u‖ = 1 via SVD): centre (5.3794, 7.2532), r = 3.0370 [S]', () => {
    const f = fitCircle(GGS, { method: 'algebraic' });
    expect(f.centerX).toBeCloseTo(5.3794, 4);
    expect(f.centerY).toBeCloseTo(7.2532, 4);
    expect(f.radius).toBeCloseTo(3.037, 4);
    expect(f.method).toBe('algebraic');
    expect(f.n).toBe(6);
  });

  it('geometric fit: centre (4.7398, 2.9835), r = 4.7142 [S]; residual sum of squares 1.2276 [C]', () => {
    const f = fitCircle(GGS);
    expect(f.method).toBe('geometric');
    expect(f.centerX).toBeCloseTo(4.7398, 4);
    expect(f.centerY).toBeCloseTo(2.9835, 4);
    expect(f.radius).toBeCloseTo(4.7142, 4);
    expect(f.rms * f.rms * f.n).toBeCloseTo(1.2276, 4);
  });

  it('the same from an interleaved Float64Array', () => {
    const flat = Float64Array.from(GGS.flatMap((p) => [p.x, p.y]));
    const f = fitCircle(flat);
    expect(f.centerX).toBeCloseTo(4.7398, 4);
    expect(f.radius).toBeCloseTo(4.7142, 4);
    expect(fitCircle(flat, { method: 'algebraic' }).centerY).toBeCloseTo(7.2532, 4);
  });

  it('the geometric fit is a true least-squares minimum: nudging the circle only raises the residuals', () => {
    const f = fitCircle(GGS);
    const ss = (cx: number, cy: number, r: number): number =>
      GGS.reduce((s, p) => s + (Math.hypot(p.x - cx, p.y - cy) - r) ** 2, 0);
    const best = ss(f.centerX, f.centerY, f.radius);
    for (const [dx, dy, dr] of [
      [1e-3, 0, 0],
      [-1e-3, 0, 0],
      [0, 1e-3, 0],
      [0, -1e-3, 0],
      [0, 0, 1e-3],
      [0, 0, -1e-3],
    ] as const) {
      expect(ss(f.centerX + dx, f.centerY + dy, f.radius + dr)).toBeGreaterThan(best);
    }
  });

  it('the published algebraic form depends on the origin (documented), the geometric fit does not', () => {
    const shifted = GGS.map((p) => ({ x: p.x + 100, y: p.y - 50 }));
    const a0 = fitCircle(GGS, { method: 'algebraic' });
    const a1 = fitCircle(shifted, { method: 'algebraic' });
    expect(Math.abs(a1.centerX - 100 - a0.centerX)).toBeGreaterThan(1e-3);
    const g1 = fitCircle(shifted);
    expect(g1.centerX - 100).toBeCloseTo(4.7398, 4);
    expect(g1.centerY + 50).toBeCloseTo(2.9835, 4);
  });
});

describe('synthetic circles', () => {
  const methods: CircleFitMethod[] = ['geometric', 'algebraic', 'kasa'];

  it.each(methods)('%s: a perfect circle returns itself, with zero deviation', (method) => {
    const pts = circlePoints(12.5, -40.25, 33.3, even(17, 0.3));
    const f = fitCircle(pts, { method });
    expect(f.centerX).toBeCloseTo(12.5, 9);
    expect(f.centerY).toBeCloseTo(-40.25, 9);
    expect(f.radius).toBeCloseTo(33.3, 9);
    expect(f.rms).toBeLessThan(1e-9);
    expect(f.maxDeviation).toBeLessThan(1e-9);
    expect(f.roundness).toBeLessThan(1e-9);
  });

  it('three points give their circumcircle', () => {
    // hand computed: (0,0) (4,0) (0,3) -> centre (2, 1.5), r 2.5 (right triangle, hypotenuse = diameter)
    const f = fitCircle([
      { x: 0, y: 0 },
      { x: 4, y: 0 },
      { x: 0, y: 3 },
    ]);
    expect(f.centerX).toBeCloseTo(2, 12);
    expect(f.centerY).toBeCloseTo(1.5, 12);
    expect(f.radius).toBeCloseTo(2.5, 12);
  });

  it('seeded noise: centre and radius within the expected scatter, rms ≈ σ', () => {
    const rnd = seededRandom(42);
    const sigma = 0.01;
    const pts = circlePoints(123.4, -56.7, 45, even(720), () => sigma * rnd.normal());
    const f = fitCircle(pts);
    // standard error of the centre ≈ σ·√(2/n) = 0.0005; allow 6 of them
    expect(Math.abs(f.centerX - 123.4)).toBeLessThan(0.003);
    expect(Math.abs(f.centerY + 56.7)).toBeLessThan(0.003);
    expect(Math.abs(f.radius - 45)).toBeLessThan(0.003);
    expect(f.rms).toBeGreaterThan(0.9 * sigma);
    expect(f.rms).toBeLessThan(1.1 * sigma);
    expect(f.maxDeviation).toBeGreaterThan(2 * sigma);
    expect(f.roundness).toBeGreaterThan(f.maxDeviation);
  });

  it('short noisy arc: the geometric fit is closer to the true radius than the Kåsa fit (known Kåsa bias)', () => {
    const rnd = seededRandom(7);
    const pts = circlePoints(0, 0, 100, even(200, 0, Math.PI / 4), () => 0.2 * rnd.normal());
    const g = fitCircle(pts);
    const k = fitCircle(pts, { method: 'kasa' });
    expect(Math.abs(g.radius - 100)).toBeLessThan(Math.abs(k.radius - 100));
    expect(g.rms).toBeLessThanOrEqual(k.rms);
  });

  it('coordinates far from the origin lose no precision (data are centred first)', () => {
    const pts = circlePoints(1e6 + 0.125, -2e6 + 0.5, 10, even(12, 0.1));
    for (const method of ['geometric', 'kasa'] as const) {
      const f = fitCircle(pts, { method });
      expect(f.centerX - 1e6).toBeCloseTo(0.125, 6);
      expect(f.centerY + 2e6).toBeCloseTo(0.5, 6);
      expect(f.radius).toBeCloseTo(10, 6);
    }
  });

  it('roundness of an ellipse ≈ a − b (semi-axes 50 and 49.9, sampled through its vertices)', () => {
    const a = 50;
    const b = 49.9;
    const pts = even(360).map((t) => ({ x: 7 + a * Math.cos(t), y: -3 + b * Math.sin(t) }));
    const f = fitCircle(pts);
    expect(f.centerX).toBeCloseTo(7, 9);
    expect(f.centerY).toBeCloseTo(-3, 9);
    expect(f.roundness).toBeCloseTo(a - b, 9);
    expect(f.radius).toBeGreaterThan(b);
    expect(f.radius).toBeLessThan(a);
  });

  it('2,000,000 points from a Float64Array', () => {
    const rnd = seededRandom(2024);
    const n = 2_000_000;
    const flat = new Float64Array(2 * n);
    const cx = 1000.5;
    const cy = -2000.25;
    const r = 150;
    for (let i = 0; i < n; i++) {
      const t = (2 * Math.PI * i) / n;
      const rr = r + 0.02 * rnd.normal();
      flat[2 * i] = cx + rr * Math.cos(t);
      flat[2 * i + 1] = cy + rr * Math.sin(t);
    }
    const f = fitCircle(flat);
    expect(f.n).toBe(n);
    // standard error ≈ 0.02·√(2/n) = 2e-5
    expect(Math.abs(f.centerX - cx)).toBeLessThan(2e-4);
    expect(Math.abs(f.centerY - cy)).toBeLessThan(2e-4);
    expect(Math.abs(f.radius - r)).toBeLessThan(2e-4);
    expect(f.rms).toBeCloseTo(0.02, 3);
  });
});

describe('properties', () => {
  const circleArb = fc.record({
    cx: fc.double({ min: -500, max: 500, noNaN: true }),
    cy: fc.double({ min: -500, max: 500, noNaN: true }),
    r: fc.double({ min: 1, max: 300, noNaN: true }),
    n: fc.integer({ min: 3, max: 40 }),
    from: fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }),
    span: fc.double({ min: Math.PI / 3, max: 2 * Math.PI, noNaN: true }),
  });

  it('a perfect circle returns itself (any arc ≥ 60°, 3–40 points)', () => {
    fc.assert(
      fc.property(circleArb, ({ cx, cy, r, n, from, span }) => {
        const f = fitCircle(circlePoints(cx, cy, r, even(n, from, span)));
        const tol = 1e-7 * Math.max(r, Math.abs(cx), Math.abs(cy));
        expect(Math.abs(f.centerX - cx)).toBeLessThan(tol);
        expect(Math.abs(f.centerY - cy)).toBeLessThan(tol);
        expect(Math.abs(f.radius - r)).toBeLessThan(tol);
      }),
    );
  });

  it.each(['geometric', 'kasa'] as const)('%s fit: translation and rotation invariant', (method) => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1e6 }),
        fc.double({ min: -1000, max: 1000, noNaN: true }),
        fc.double({ min: -1000, max: 1000, noNaN: true }),
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        (seed, tx, ty, theta) => {
          const rnd = seededRandom(seed);
          const pts = circlePoints(20 * rnd.uniform(), 20 * rnd.uniform(), 30 + 50 * rnd.uniform(), even(25, 0, 1.5 * Math.PI), () => 0.3 * rnd.normal());
          const base = fitCircle(pts, { method });
          const c = Math.cos(theta);
          const s = Math.sin(theta);
          const moved = pts.map((p) => ({ x: c * p.x - s * p.y + tx, y: s * p.x + c * p.y + ty }));
          const f = fitCircle(moved, { method });
          expect(f.centerX).toBeCloseTo(c * base.centerX - s * base.centerY + tx, 6);
          expect(f.centerY).toBeCloseTo(s * base.centerX + c * base.centerY + ty, 6);
          expect(f.radius).toBeCloseTo(base.radius, 6);
          expect(f.rms).toBeCloseTo(base.rms, 6);
          expect(f.roundness).toBeCloseTo(base.roundness, 6);
        },
      ),
    );
  });

  it('algebraic fit: invariant under rotation about the origin (‖u‖ = 1 is rotation invariant)', () => {
    fc.assert(
      fc.property(fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }), (theta) => {
        const base = fitCircle(GGS, { method: 'algebraic' });
        const c = Math.cos(theta);
        const s = Math.sin(theta);
        const f = fitCircle(
          GGS.map((p) => ({ x: c * p.x - s * p.y, y: s * p.x + c * p.y })),
          { method: 'algebraic' },
        );
        expect(f.centerX).toBeCloseTo(c * base.centerX - s * base.centerY, 8);
        expect(f.radius).toBeCloseTo(base.radius, 8);
      }),
    );
  });

  it('roundness of an ellipse ≈ a − b (random ellipses, centred and rotated)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 10, max: 200, noNaN: true }),
        fc.double({ min: 0.9, max: 1, noNaN: true }),
        fc.double({ min: 0, max: Math.PI, noNaN: true }),
        fc.double({ min: -100, max: 100, noNaN: true }),
        (a, ratio, phi, offset) => {
          const b = a * ratio;
          const c = Math.cos(phi);
          const s = Math.sin(phi);
          const pts = even(240).map((t) => {
            const x = a * Math.cos(t);
            const y = b * Math.sin(t);
            return { x: offset + c * x - s * y, y: -offset + s * x + c * y };
          });
          const f = fitCircle(pts);
          expect(Math.abs(f.roundness - (a - b))).toBeLessThan(1e-6 * a);
        },
      ),
    );
  });
});

describe('degenerate input', () => {
  it('fewer than 3 points', () => {
    expect(codeOf(() => fitCircle([{ x: 0, y: 0 }, { x: 1, y: 1 }]))).toBe('fit.tooFewPoints');
    expect(codeOf(() => fitCircle(new Float64Array(4)))).toBe('fit.tooFewPoints');
    expect(codeOf(() => fitCircle([]))).toBe('fit.tooFewPoints');
  });
  it('collinear points', () => {
    const line = Array.from({ length: 10 }, (_, i) => ({ x: i, y: 2 * i + 1 }));
    for (const method of ['geometric', 'algebraic', 'kasa'] as const) {
      expect(codeOf(() => fitCircle(line, { method }))).toBe('fit.collinear');
    }
    expect(() => fitCircle(line)).toThrow(/straight line/);
  });
  it('coincident points', () => {
    const same = Array.from({ length: 5 }, () => ({ x: 3, y: 4 }));
    expect(codeOf(() => fitCircle(same))).toBe('fit.coincident');
  });
  it('NaN or infinite coordinates, naming the point', () => {
    const pts = [{ x: 0, y: 0 }, { x: 1, y: NaN }, { x: 0, y: 1 }];
    expect(codeOf(() => fitCircle(pts))).toBe('fit.nonFinite');
    expect(() => fitCircle(pts)).toThrow(/point 1 has a non-finite y/);
    expect(codeOf(() => fitCircle(Float64Array.of(0, 0, 1, 0, 0, Infinity)))).toBe('fit.nonFinite');
  });
  it('a line with one point slightly off: the circle runs off to infinity and is refused, not returned', () => {
    const pts = [...Array.from({ length: 20 }, (_, i) => ({ x: i - 10, y: 0 })), { x: 0, y: 1e-9 }];
    expect(codeOf(() => fitCircle(pts))).toMatch(/^fit\.(collinear|notConverged)$/);
  });

  it('never NaN: any finite input gives a finite circle or a DomainError (property)', () => {
    const pointArb = fc.record({ x: fc.integer({ min: -3, max: 3 }), y: fc.integer({ min: -3, max: 3 }) });
    fc.assert(
      fc.property(fc.array(pointArb, { minLength: 0, maxLength: 8 }), fc.constantFrom('geometric', 'algebraic', 'kasa' as const), (pts, method) => {
        try {
          const f = fitCircle(pts, { method: method as CircleFitMethod });
          for (const v of [f.centerX, f.centerY, f.radius, f.rms, f.maxDeviation, f.roundness]) expect(Number.isFinite(v)).toBe(true);
          expect(f.radius).toBeGreaterThan(0);
        } catch (e) {
          expect(e).toBeInstanceOf(DomainError);
        }
      }),
      { numRuns: 500 },
    );
  });

  it('malformed input', () => {
    expect(codeOf(() => fitCircle(new Float64Array(7)))).toBe('fit.input');
    expect(codeOf(() => fitCircle('points' as never))).toBe('fit.input');
    expect(codeOf(() => fitCircle(GGS, { method: 'best' as never }))).toBe('fit.method');
  });
});
