import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DomainError } from '../../../src/domain/errors';
import {
  arcSweepRad,
  autoOutline,
  circleOutline,
  distanceToOutline,
  hullOfDiscs,
  outlineArea,
  outlineBBox,
  outlinePerimeterMm,
  outlineSignedAreaMm2,
  pointInOutline,
  polygonOutline,
  segmentTangent,
  type Disc,
} from '../../../src/domain/outline';
import type { BoundingBox, OutlineSegment, Point2 } from '../../../src/domain/profileTypes';

const disc = (x: number, y: number, r: number): Disc => ({ center: { x, y }, radiusMm: r });

/**
 * Independent reference: sample every circle densely, take the convex hull of the points
 * (Andrew's monotone chain) and its shoelace area. Converges to the exact hull of discs from
 * below with an error of order r²/n² per circle.
 */
function sampledHull(discs: readonly Disc[], perCircle = 20000): { area: number; points: Point2[] } {
  const pts: Point2[] = [];
  for (const d of discs) {
    for (let i = 0; i < perCircle; i++) {
      const a = (2 * Math.PI * i) / perCircle;
      pts.push({ x: d.center.x + d.radiusMm * Math.cos(a), y: d.center.y + d.radiusMm * Math.sin(a) });
    }
  }
  pts.sort((a, b) => a.x - b.x || a.y - b.y);
  const cross = (o: Point2, a: Point2, b: Point2) => (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x);
  const lower: Point2[] = [];
  for (const p of pts) {
    while (lower.length >= 2 && cross(lower[lower.length - 2]!, lower[lower.length - 1]!, p) <= 0) lower.pop();
    lower.push(p);
  }
  const upper: Point2[] = [];
  for (let i = pts.length - 1; i >= 0; i--) {
    const p = pts[i]!;
    while (upper.length >= 2 && cross(upper[upper.length - 2]!, upper[upper.length - 1]!, p) <= 0) upper.pop();
    upper.push(p);
  }
  const hull = [...lower.slice(0, -1), ...upper.slice(0, -1)];
  let a = 0;
  hull.forEach((p, i) => {
    const q = hull[(i + 1) % hull.length]!;
    a += p.x * q.y - q.x * p.y;
  });
  return { area: a / 2, points: hull };
}

function expectBox(actual: BoundingBox, expected: BoundingBox) {
  for (const k of ['minX', 'minY', 'maxX', 'maxY'] as const) expect(actual[k]).toBeCloseTo(expected[k], 12);
}

function expectClosed(chain: readonly OutlineSegment[]) {
  chain.forEach((s, i) => {
    const next = chain[(i + 1) % chain.length]!;
    // the very same coordinates, not merely close
    expect(next.start.x).toBe(s.end.x);
    expect(next.start.y).toBe(s.end.y);
  });
}

/** Largest angle (rad) between the end tangent of a segment and the start tangent of the next. */
function maxKinkRad(chain: readonly OutlineSegment[]): number {
  let worst = 0;
  chain.forEach((s, i) => {
    const a = segmentTangent(s, 'end');
    const b = segmentTangent(chain[(i + 1) % chain.length]!, 'start');
    worst = Math.max(worst, Math.abs(Math.atan2(a.x * b.y - a.y * b.x, a.x * b.x + a.y * b.y)));
  });
  return worst;
}

describe('hull of discs', () => {
  it('two equal circles make a stadium: area 2r·d + πr², perimeter 2d + 2πr (hand formula)', () => {
    const r = 20;
    const d = 100;
    const chain = hullOfDiscs([disc(0, 0, r), disc(d, 0, r)]);
    expect(chain.filter((s) => s.kind === 'line')).toHaveLength(2);
    expect(chain.filter((s) => s.kind === 'arc')).toHaveLength(2);
    expect(outlineArea(chain)).toBeCloseTo(2 * r * d + Math.PI * r * r, 9);
    expect(outlinePerimeterMm(chain)).toBeCloseTo(2 * d + 2 * Math.PI * r, 9);
    expect(outlineSignedAreaMm2(chain)).toBeGreaterThan(0);
    expectClosed(chain);
    const box = outlineBBox(chain);
    expect(box.minX).toBeCloseTo(-r, 12);
    expect(box.maxX).toBeCloseTo(d + r, 12);
    expect(box.minY).toBeCloseTo(-r, 12);
    expect(box.maxY).toBeCloseTo(r, 12);
  });

  it('three equal circles: area = A + P·r + πr² of the centre triangle (Steiner formula)', () => {
    const r = 15;
    const pts = [
      { x: 0, y: 0 },
      { x: 120, y: 10 },
      { x: 40, y: 90 },
    ];
    const chain = hullOfDiscs(pts.map((p) => disc(p.x, p.y, r)));
    const triArea = Math.abs((120 * 90 - 10 * 40) / 2);
    const triPerimeter =
      Math.hypot(120, 10) + Math.hypot(40 - 120, 90 - 10) + Math.hypot(40, 90);
    expect(outlineArea(chain)).toBeCloseTo(triArea + triPerimeter * r + Math.PI * r * r, 8);
    expect(outlinePerimeterMm(chain)).toBeCloseTo(triPerimeter + 2 * Math.PI * r, 9);
    expect(chain.filter((s) => s.kind === 'arc')).toHaveLength(3);
    expect(maxKinkRad(chain)).toBeLessThan(1e-9);
  });

  it('ignores a disc that lies inside the hull of the others', () => {
    const outer = [disc(0, 0, 10), disc(200, 0, 10), disc(100, 150, 10)];
    const withInner = [...outer, disc(100, 50, 30)];
    const a = hullOfDiscs(outer);
    const b = hullOfDiscs(withInner);
    expect(outlineArea(b)).toBeCloseTo(outlineArea(a), 9);
    expect(b.some((s) => s.kind === 'arc' && s.center.x === 100 && s.center.y === 50)).toBe(false);
  });

  it('a small disc that sticks out is wrapped by an arc of its own', () => {
    const big = disc(0, 0, 100);
    const chain = hullOfDiscs([big, disc(0, 110, 5)]);
    expect(chain.filter((s) => s.kind === 'arc' && s.radiusMm === 5)).toHaveLength(1);
    expect(outlineBBox(chain).maxY).toBeCloseTo(115, 12);
  });

  it('one disc gives a full circle of two true arcs', () => {
    const chain = hullOfDiscs([disc(5, -3, 40), disc(5, -3, 10)]);
    expect(chain).toHaveLength(2);
    expect(outlineArea(chain)).toBeCloseTo(Math.PI * 1600, 9);
  });

  it('collinear discs of equal size share one straight tangent (no zero-length pieces)', () => {
    const chain = hullOfDiscs([disc(0, 0, 10), disc(50, 0, 10), disc(100, 0, 10)]);
    expect(chain).toHaveLength(4);
    expect(outlineArea(chain)).toBeCloseTo(2 * 10 * 100 + Math.PI * 100, 9);
  });

  it('unequal discs: area matches a dense-sampling estimate (independent computation)', () => {
    const discs = [disc(0, 0, 45), disc(150, 20, 12), disc(-60, 140, 25), disc(-120, -30, 8), disc(30, -90, 18)];
    const chain = hullOfDiscs(discs);
    const ref = sampledHull(discs);
    expect(Math.abs(outlineArea(chain) - ref.area) / ref.area).toBeLessThan(1e-6);
    const box = outlineBBox(chain);
    const xs = ref.points.map((p) => p.x);
    const ys = ref.points.map((p) => p.y);
    expect(box.minX).toBeCloseTo(Math.min(...xs), 3);
    expect(box.maxX).toBeCloseTo(Math.max(...xs), 3);
    expect(box.minY).toBeCloseTo(Math.min(...ys), 3);
    expect(box.maxY).toBeCloseTo(Math.max(...ys), 3);
    // exact bbox of this hull: extreme points of the discs themselves
    expect(box.minX).toBeCloseTo(-128, 12);
    expect(box.maxY).toBeCloseTo(165, 12);
  });

  it('rejects an empty feature list with a clear error', () => {
    expect(() => hullOfDiscs([])).toThrowError(DomainError);
    expect(() => hullOfDiscs([])).toThrowError(/at least one feature/);
  });
});

describe('automatic outline (properties)', () => {
  const discArb = fc.record({
    x: fc.double({ min: -200, max: 200, noNaN: true }),
    y: fc.double({ min: -200, max: 200, noNaN: true }),
    r: fc.double({ min: 1, max: 50, noNaN: true }),
  });
  const inputArb = fc.record({
    discs: fc.array(discArb, { minLength: 1, maxLength: 9 }),
    margin: fc.double({ min: 0, max: 20, noNaN: true }),
    corner: fc.double({ min: 0, max: 30, noNaN: true }),
  });

  it('keeps every feature circle inside by at least the margin; closed, CCW, tangent-continuous', () => {
    fc.assert(
      fc.property(inputArb, ({ discs, margin, corner }) => {
        const features = discs.map((d) => disc(d.x, d.y, d.r));
        const chain = autoOutline(features, { edgeMarginMm: margin, cornerRadiusMm: corner });
        expectClosed(chain);
        expect(outlineSignedAreaMm2(chain)).toBeGreaterThan(0);
        // a convex hull only turns left
        expect(chain.every((s) => s.kind === 'line' || s.ccw)).toBe(true);
        expect(maxKinkRad(chain)).toBeLessThan(1e-7);
        for (const f of features) {
          expect(pointInOutline(chain, f.center)).toBe(true);
          expect(distanceToOutline(chain, f.center)).toBeGreaterThanOrEqual(f.radiusMm + margin - 1e-9);
        }
        chain.forEach((s) => {
          if (s.kind === 'arc') expect(s.radiusMm).toBeGreaterThanOrEqual(corner - 1e-12);
        });
      }),
      { numRuns: 300 },
    );
  });

  it('survives degenerate layouts: repeated, nested, collinear and nanometre-noisy discs', () => {
    const grid = fc.array(fc.record({ x: fc.integer({ min: -3, max: 3 }), y: fc.integer({ min: -3, max: 3 }), r: fc.integer({ min: 1, max: 3 }) }), {
      minLength: 1,
      maxLength: 10,
    });
    const noise = fc.array(fc.double({ min: -1e-9, max: 1e-9, noNaN: true }), { minLength: 30, maxLength: 30 });
    fc.assert(
      fc.property(grid, noise, (ds, n) => {
        const features = ds.map((d, i) => disc(d.x * 10 + n[i % 30]!, d.y * 10 + n[(i + 7) % 30]!, d.r * 5 + n[(i + 13) % 30]!));
        const chain = hullOfDiscs(features);
        expectClosed(chain);
        expect(outlineSignedAreaMm2(chain)).toBeGreaterThan(0);
        expect(maxKinkRad(chain)).toBeLessThan(1e-6);
        // nearly-equal discs are merged into one that encloses both
        for (const f of features) expect(distanceToOutline(chain, f.center)).toBeGreaterThanOrEqual(f.radiusMm - 1e-9);
      }),
      { numRuns: 3000 },
    );
  });

  it('area agrees with the dense-sampling estimate', () => {
    fc.assert(
      fc.property(inputArb, ({ discs, margin, corner }) => {
        const grown = discs.map((d) => disc(d.x, d.y, Math.max(d.r + margin, corner)));
        const chain = hullOfDiscs(grown);
        const ref = sampledHull(grown, 4000);
        expect(Math.abs(outlineArea(chain) - ref.area) / ref.area).toBeLessThan(1e-5);
      }),
      { numRuns: 60 },
    );
  });
});

describe('polygon outline', () => {
  it('rectangle 100 × 60 with 10 mm corners: area 6000 − (4 − π)·100, perimeter 320 − 80 + 20π (hand formula)', () => {
    const chain = polygonOutline(
      [
        { x: 0, y: 0 },
        { x: 100, y: 0 },
        { x: 100, y: 60 },
        { x: 0, y: 60 },
      ],
      10,
    );
    expect(chain.filter((s) => s.kind === 'arc')).toHaveLength(4);
    expect(outlineArea(chain)).toBeCloseTo(6000 - (4 - Math.PI) * 100, 9);
    expect(outlinePerimeterMm(chain)).toBeCloseTo(320 - 80 + 20 * Math.PI, 9);
    expectBox(outlineBBox(chain), { minX: 0, minY: 0, maxX: 100, maxY: 60 });
    expect(maxKinkRad(chain)).toBeLessThan(1e-12);
    expectClosed(chain);
  });

  it('a clockwise polygon is reversed to counter-clockwise', () => {
    const chain = polygonOutline([
      { x: 0, y: 0 },
      { x: 0, y: 50 },
      { x: 80, y: 50 },
      { x: 80, y: 0 },
    ]);
    expect(outlineSignedAreaMm2(chain)).toBeCloseTo(4000, 9);
  });

  it('L shape: the concave corner gets a clockwise fillet that adds (1 − π/4)·r² (hand formula)', () => {
    const r = 5;
    const chain = polygonOutline(
      [
        { x: 0, y: 0 },
        { x: 100, y: 0 },
        { x: 100, y: 40 },
        { x: 40, y: 40 },
        { x: 40, y: 100 },
        { x: 0, y: 100 },
      ],
      r,
    );
    const lArea = 100 * 40 + 40 * 60;
    const corner = (1 - Math.PI / 4) * r * r;
    // five convex corners lose a corner each, the concave one gains one
    expect(outlineArea(chain)).toBeCloseTo(lArea - 5 * corner + corner, 9);
    expect(chain.filter((s) => s.kind === 'arc' && !s.ccw)).toHaveLength(1);
    expect(pointInOutline(chain, { x: 41, y: 41 })).toBe(true);
    expect(pointInOutline(chain, { x: 60, y: 60 })).toBe(false);
  });

  it('rejects a crossing polygon and a fillet too big for its edges, naming the field', () => {
    const bowtie = [
      { x: 0, y: 0 },
      { x: 100, y: 100 },
      { x: 100, y: 0 },
      { x: 0, y: 100 },
    ];
    expect(() => polygonOutline(bowtie)).toThrowError(/crosses itself/);
    const square = [
      { x: 0, y: 0 },
      { x: 10, y: 0 },
      { x: 10, y: 10 },
      { x: 0, y: 10 },
    ];
    expect(() => polygonOutline(square, 6)).toThrowError(/outline\.cornerRadiusMm 6 mm is too large/);
    expect(() => polygonOutline(square.slice(0, 2))).toThrowError(/at least 3 corners/);
  });
});

describe('measures of a chain', () => {
  it('bbox of a quarter-free arc uses its end points, of a wide arc its quadrant points', () => {
    const c = { x: 0, y: 0 };
    const small: OutlineSegment = { kind: 'arc', start: { x: Math.cos(0.2) * 10, y: Math.sin(0.2) * 10 }, end: { x: Math.cos(1.2) * 10, y: Math.sin(1.2) * 10 }, center: c, radiusMm: 10, ccw: true };
    const chain: OutlineSegment[] = [small, { kind: 'line', start: small.end, end: small.start }];
    const box = outlineBBox(chain);
    expect(box.maxX).toBeCloseTo(Math.cos(0.2) * 10, 12);
    expect(box.maxY).toBeCloseTo(Math.sin(1.2) * 10, 12);
    expect(arcSweepRad(small)).toBeCloseTo(1, 12);
    const circle = circleOutline({ x: 3, y: 4 }, 5);
    expectBox(outlineBBox(circle), { minX: -2, minY: -1, maxX: 8, maxY: 9 });
  });

  it('point containment and distance on a stadium', () => {
    const chain = hullOfDiscs([disc(0, 0, 10), disc(100, 0, 10)]);
    expect(pointInOutline(chain, { x: -9.9, y: 0 })).toBe(true); // inside the end arc's bulge
    expect(pointInOutline(chain, { x: -9, y: 9 })).toBe(false); // in the bbox corner, outside the arc
    expect(pointInOutline(chain, { x: 50, y: 9.99 })).toBe(true);
    expect(pointInOutline(chain, { x: 50, y: 10.01 })).toBe(false);
    expect(distanceToOutline(chain, { x: 50, y: 0 })).toBeCloseTo(10, 12);
    expect(distanceToOutline(chain, { x: -20, y: 0 })).toBeCloseTo(10, 12);
    expect(distanceToOutline(chain, { x: 0, y: 0 })).toBeCloseTo(10, 12);
  });
});
