import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DomainError } from '~/domain/errors';
import { fitCircle } from '~/domain/fit/circle';
import { faceAxes, fitPlane, toFaceCoordinates } from '~/domain/fit/plane';
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

type P3 = { x: number; y: number; z: number };

function grid(n: number, size: number, z: (x: number, y: number) => number): P3[] {
  const out: P3[] = [];
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const x = -size / 2 + (size * i) / (n - 1);
      const y = -size / 2 + (size * j) / (n - 1);
      out.push({ x, y, z: z(x, y) });
    }
  }
  return out;
}

describe('fitPlane', () => {
  it('a tilted exact plane: normal ∝ (−a, −b, 1), zero flatness', () => {
    // hand computed: z = 0.01x − 0.02y + 5 has normal (−0.01, 0.02, 1)/√1.0005
    const pts = grid(11, 200, (x, y) => 0.01 * x - 0.02 * y + 5);
    const f = fitPlane(pts);
    const len = Math.sqrt(1.0005);
    expect(f.normal.x).toBeCloseTo(-0.01 / len, 12);
    expect(f.normal.y).toBeCloseTo(0.02 / len, 12);
    expect(f.normal.z).toBeCloseTo(1 / len, 12);
    expect(f.centroid).toEqual({ x: expect.closeTo(0, 12), y: expect.closeTo(0, 12), z: expect.closeTo(5, 12) });
    expect(f.flatness).toBeLessThan(1e-10);
    expect(f.rms).toBeLessThan(1e-10);
    expect(f.n).toBe(121);
  });

  it('a twisted square: z = h·x·y on (±1, ±1) fits z = 0 with flatness 2h and rms h (hand computed)', () => {
    // by symmetry Σx·z = Σy·z = 0, so the least-squares plane is z = 0 and the corners sit at ±h
    const h = 0.05;
    const pts = [-1, 1].flatMap((x) => [-1, 1].map((y) => ({ x, y, z: h * x * y })));
    const f = fitPlane(pts);
    expect(f.normal.z).toBeCloseTo(1, 12);
    expect(f.flatness).toBeCloseTo(2 * h, 12);
    expect(f.rms).toBeCloseTo(h, 12);
  });

  it('seeded noise: rms ≈ σ, normal within the expected scatter', () => {
    const rnd = seededRandom(11);
    const sigma = 0.005;
    const pts = grid(40, 300, (x, y) => 0.001 * x + 0.002 * y + sigma * rnd.normal());
    const f = fitPlane(pts);
    expect(f.rms).toBeGreaterThan(0.9 * sigma);
    expect(f.rms).toBeLessThan(1.1 * sigma);
    expect(f.flatness).toBeGreaterThan(4 * sigma);
    expect(f.flatness).toBeLessThan(10 * sigma);
    expect(f.normal.x / f.normal.z).toBeCloseTo(-0.001, 5);
    expect(f.normal.y / f.normal.z).toBeCloseTo(-0.002, 5);
  });

  it('orients the normal: z > 0, else y > 0, else x > 0', () => {
    const down = grid(5, 10, (x) => -2 * x);
    expect(fitPlane(down).normal.z).toBeGreaterThan(0);
    // the plane y = 3 (vertical, normal along Y)
    const vertical = [0, 1, 2].flatMap((x) => [0, 1, 2].map((z) => ({ x, y: 3, z })));
    expect(fitPlane(vertical).normal).toEqual({ x: expect.closeTo(0, 12), y: expect.closeTo(1, 12), z: expect.closeTo(0, 12) });
    const alongX = [0, 1, 2].flatMap((y) => [0, 1, 2].map((z) => ({ x: -4, y, z })));
    expect(fitPlane(alongX).normal.x).toBeCloseTo(1, 12);
  });

  it('Float64Array input gives the same result as objects', () => {
    const pts = grid(6, 50, (x, y) => 0.1 * x * y * 1e-3 + 0.3 * y);
    const flat = Float64Array.from(pts.flatMap((p) => [p.x, p.y, p.z]));
    expect(fitPlane(flat)).toEqual(fitPlane(pts));
  });

  it('no other direction gives smaller squared distances (least-squares optimality, property)', () => {
    const rnd = seededRandom(5);
    const pts = grid(8, 100, (x, y) => 0.02 * x - 0.01 * y + 0.1 * rnd.normal());
    const f = fitPlane(pts);
    const ss = (nx: number, ny: number, nz: number): number => {
      const l = Math.hypot(nx, ny, nz);
      return pts.reduce((s, p) => s + (((p.x - f.centroid.x) * nx + (p.y - f.centroid.y) * ny + (p.z - f.centroid.z) * nz) / l) ** 2, 0);
    };
    const best = ss(f.normal.x, f.normal.y, f.normal.z);
    expect(best / pts.length).toBeCloseTo(f.rms ** 2, 12);
    fc.assert(
      fc.property(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: 0.1, max: 1, noNaN: true }), (x, y, z) => {
        expect(ss(x, y, z)).toBeGreaterThanOrEqual(best * (1 - 1e-12));
      }),
    );
  });

  it('rigid motions move the plane and keep flatness and rms (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1e6 }),
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        fc.double({ min: -0.5, max: 0.5, noNaN: true }),
        fc.double({ min: -1000, max: 1000, noNaN: true }),
        (seed, yaw, pitch, t) => {
          const rnd = seededRandom(seed);
          const pts = grid(6, 100, () => 0.05 * rnd.normal());
          const base = fitPlane(pts);
          // rotation about Z by yaw, then about X by pitch, then translation (t, −t, 2t)
          const cz = Math.cos(yaw);
          const sz = Math.sin(yaw);
          const cx = Math.cos(pitch);
          const sx = Math.sin(pitch);
          const rot = (p: P3): P3 => {
            const x1 = cz * p.x - sz * p.y;
            const y1 = sz * p.x + cz * p.y;
            return { x: x1, y: cx * y1 - sx * p.z, z: sx * y1 + cx * p.z };
          };
          const moved = pts.map((p) => {
            const r = rot(p);
            return { x: r.x + t, y: r.y - t, z: r.z + 2 * t };
          });
          const f = fitPlane(moved);
          expect(f.flatness).toBeCloseTo(base.flatness, 8);
          expect(f.rms).toBeCloseTo(base.rms, 8);
          const n = rot(base.normal);
          const sign = Math.sign(n.x * f.normal.x + n.y * f.normal.y + n.z * f.normal.z);
          expect(sign * n.x).toBeCloseTo(f.normal.x, 8);
          expect(sign * n.y).toBeCloseTo(f.normal.y, 8);
          expect(sign * n.z).toBeCloseTo(f.normal.z, 8);
        },
      ),
    );
  });
});

describe('toFaceCoordinates', () => {
  it('a face seen along Z: u = x − cx, v = y − cy, w = z − cz', () => {
    const pts = grid(3, 10, () => 2);
    const plane = fitPlane(pts);
    const uvw = toFaceCoordinates([{ x: 4, y: -1, z: 2.5 }], plane);
    expect(Array.from(uvw)).toEqual([expect.closeTo(4, 12), expect.closeTo(-1, 12), expect.closeTo(0.5, 12)]);
  });

  it('keeps distances and gives a right-handed frame', () => {
    const plane = fitPlane(grid(5, 40, (x, y) => 0.3 * x + 0.2 * y));
    const axes = faceAxes(plane);
    const dot = (a: P3, b: P3): number => a.x * b.x + a.y * b.y + a.z * b.z;
    expect(dot(axes.u, axes.v)).toBeCloseTo(0, 12);
    expect(dot(axes.u, axes.w)).toBeCloseTo(0, 12);
    // u × v = w
    expect(axes.u.y * axes.v.z - axes.u.z * axes.v.y).toBeCloseTo(axes.w.x, 12);
    expect(axes.u.x * axes.v.y - axes.u.y * axes.v.x).toBeCloseTo(axes.w.z, 12);
    const p = { x: 7, y: -3, z: 11 };
    const [u, v, w] = Array.from(toFaceCoordinates([p], plane));
    const c = plane.centroid;
    expect(Math.hypot(u!, v!, w!)).toBeCloseTo(Math.hypot(p.x - c.x, p.y - c.y, p.z - c.z), 10);
  });

  it('a bore probed on a tilted face: plane fit, then circle fit in face coordinates recovers the radius', () => {
    // circle of radius 40 about (10, 20, 30) in a plane tilted 20° about X
    const tilt = (20 * Math.PI) / 180;
    const rim = Array.from({ length: 24 }, (_, i) => {
      const t = (2 * Math.PI * i) / 24;
      const x = 40 * Math.cos(t);
      const y = 40 * Math.sin(t);
      return { x: 10 + x, y: 20 + Math.cos(tilt) * y, z: 30 + Math.sin(tilt) * y };
    });
    const plane = fitPlane(rim);
    expect(plane.normal.z).toBeCloseTo(Math.cos(tilt), 12);
    const uvw = toFaceCoordinates(rim, plane);
    const uv = new Float64Array((uvw.length / 3) * 2);
    for (let i = 0; i < uvw.length / 3; i++) {
      uv[2 * i] = uvw[3 * i]!;
      uv[2 * i + 1] = uvw[3 * i + 1]!;
      expect(Math.abs(uvw[3 * i + 2]!)).toBeLessThan(1e-9);
    }
    const c = fitCircle(uv);
    expect(c.radius).toBeCloseTo(40, 9);
    expect(Math.hypot(c.centerX, c.centerY)).toBeLessThan(1e-9);
  });

  it('refuses a non-unit normal', () => {
    expect(codeOf(() => toFaceCoordinates([], { normal: { x: 0, y: 0, z: 2 }, centroid: { x: 0, y: 0, z: 0 } }))).toBe('fit.input');
  });
});

describe('degenerate input', () => {
  it('fewer than 3 points', () => {
    expect(codeOf(() => fitPlane([{ x: 0, y: 0, z: 0 }, { x: 1, y: 0, z: 0 }]))).toBe('fit.tooFewPoints');
  });
  it('collinear points', () => {
    const line = Array.from({ length: 6 }, (_, i) => ({ x: i, y: 2 * i, z: -i }));
    expect(codeOf(() => fitPlane(line))).toBe('fit.collinear');
    expect(() => fitPlane(line)).toThrow(/straight line/);
  });
  it('coincident points', () => {
    expect(codeOf(() => fitPlane(Array.from({ length: 4 }, () => ({ x: 1, y: 2, z: 3 }))))).toBe('fit.coincident');
  });
  it('NaN, missing z, bad array length', () => {
    expect(codeOf(() => fitPlane([{ x: 0, y: 0, z: 0 }, { x: 1, y: 0, z: NaN }, { x: 0, y: 1, z: 0 }]))).toBe('fit.nonFinite');
    expect(() => fitPlane([{ x: 0, y: 0 }, { x: 1, y: 0 }, { x: 0, y: 1 }] as never)).toThrow(/point 0 has a non-finite z/);
    expect(codeOf(() => fitPlane(new Float64Array(10)))).toBe('fit.input');
  });
});
