import { describe, expect, it } from 'vitest';
import {
  insertVertexAfter,
  moveVertex,
  parseVertexRows,
  polygonOf,
  polygonProblems,
  rectangleAround,
  removeVertex,
  withPolygon,
  type OutlineVertex,
} from '../../../src/domain/editor/outlinePolygon';
import { checkPlate, plateSpecSchema, resolvePlate } from '../../../src/domain';
import { outlineArea, polygonOutline } from '../../../src/domain/outline';
import { baseInput } from '../domain/plateFixture';

const v = (xMm: number, yMm: number, radiusMm: number | null = null): OutlineVertex => ({ xMm, yMm, radiusMm });
const square = [v(-150, -150), v(150, -150), v(150, 150), v(-150, 150)];

describe('vertex table operations', () => {
  it('inserts a corner in the middle of the edge after it (also the closing edge)', () => {
    expect(insertVertexAfter(square, 0)[1]).toEqual(v(0, -150));
    const closing = insertVertexAfter(square, 3);
    expect(closing).toHaveLength(5);
    expect(closing[4]).toEqual(v(-150, 0));
  });
  it('deletes and reorders corners, ends stay put', () => {
    expect(removeVertex(square, 1).map((p) => p.xMm)).toEqual([-150, 150, -150]);
    expect(moveVertex(square, 1, -1).slice(0, 2)).toEqual([square[1], square[0]]);
    expect(moveVertex(square, 0, -1)).toEqual(square);
    expect(moveVertex(square, 3, 1)).toEqual(square);
  });
  it('round-trips through the document, own radii only when a corner has one', () => {
    const doc = withPolygon(baseInput(), { vertices: square, cornerRadiusMm: 8 });
    expect(doc.outline).toEqual({ kind: 'polygon', points: square.map((p) => ({ x: p.xMm, y: p.yMm })), cornerRadiusMm: 8 });
    const own = withPolygon(doc, { vertices: [v(-150, -150, 20), ...square.slice(1)], cornerRadiusMm: 8 });
    expect((own.outline as { cornerRadiiMm?: unknown }).cornerRadiiMm).toEqual([20, null, null, null]);
    expect(polygonOf(own)?.vertices[0]).toEqual(v(-150, -150, 20));
    expect(polygonOf(baseInput())).toBeNull();
    expect(plateSpecSchema.safeParse(own).success).toBe(true);
  });
  it('starts from the rectangle round a bounding box, widened to whole millimetres', () => {
    expect(rectangleAround({ minX: -160.797, minY: -155.403, maxX: 160.297, maxY: 162.5 }, 3).vertices).toEqual([v(-161, -156), v(161, -156), v(161, 163), v(-161, 163)]);
    // exact millimetres stay as they are, float noise included
    expect(rectangleAround({ minX: -10.0000000001, minY: -5, maxX: 10, maxY: 5.0000000001 }, 3).vertices).toEqual([v(-10, -5), v(10, -5), v(10, 5), v(-10, 5)]);
  });
});

describe('per-corner radii in the outline', () => {
  it('a 100 × 60 rectangle with one 10 mm corner: area 6000 − (1 − π/4)·100 (hand formula)', () => {
    const chain = polygonOutline([{ x: 0, y: 0 }, { x: 100, y: 0 }, { x: 100, y: 60 }, { x: 0, y: 60 }], 0, [10, 0, null, undefined]);
    expect(chain.filter((s) => s.kind === 'arc')).toHaveLength(1);
    expect(outlineArea(chain)).toBeCloseTo(6000 - (1 - Math.PI / 4) * 100, 9);
  });
  it('own radii override the common one; 0 keeps a corner sharp', () => {
    const chain = polygonOutline([{ x: 0, y: 0 }, { x: 100, y: 0 }, { x: 100, y: 60 }, { x: 0, y: 60 }], 5, [0, 0, 0, null]);
    const arcs = chain.filter((s) => s.kind === 'arc');
    expect(arcs).toHaveLength(1);
    expect(arcs[0]!.kind === 'arc' && arcs[0]!.radiusMm).toBe(5);
  });
});

describe('polygon problems, naming the corner (never a throw)', () => {
  it('fewer than 3 corners', () => {
    expect(polygonProblems({ vertices: square.slice(0, 2), cornerRadiusMm: 0 })[0]!.message).toMatch(/at least 3 corners; it has 2/);
  });
  it('a self-intersecting (bow-tie) polygon names both edges', () => {
    const bow = [v(0, 0), v(100, 100), v(100, 0), v(0, 100)];
    const p = polygonProblems({ vertices: bow, cornerRadiusMm: 0 });
    expect(p[0]!.message).toMatch(/crosses itself: the edge from corner 1 to 2 crosses the edge from corner 3 to 4/);
    expect(p[0]!.vertex).toBe(0);
  });
  it('two corners at the same place', () => {
    const p = polygonProblems({ vertices: [v(0, 0), v(0, 0), v(100, 0), v(0, 100)], cornerRadiusMm: 0 });
    expect(p[0]).toEqual({ message: 'Corners 1 and 2 are at the same place; delete one or move it.', vertex: 1 });
  });
  it('a radius too big for its corner names the corner', () => {
    // 100 × 60 rectangle: a 90° corner's fillet needs r of each edge, so r = 70 at corner 2 needs 70 + 0 > 60 on the edge 2→3
    const p = polygonProblems({ vertices: [v(0, 0), v(100, 0, 70), v(100, 60), v(0, 60)], cornerRadiusMm: 0 });
    expect(p[0]!.message).toMatch(/corner radii are too large for the edge from corner 2 to corner 3/);
    expect(p[0]!.vertex).toBe(1);
    const common = polygonProblems({ vertices: [v(0, 0), v(100, 0), v(100, 60), v(0, 60)], cornerRadiusMm: 31 });
    expect(common[0]!.message).toMatch(/^The common corner radius is too large/);
  });
  it('a good polygon has none', () => {
    expect(polygonProblems({ vertices: square, cornerRadiusMm: 10 })).toEqual([]);
  });
});

describe('a polygon outline in the whole plate', () => {
  it('a hole outside it is a check finding; the plate still lays out', () => {
    // the fixture's engine holes sit on Ø200 at 45°: (±70.7, ±70.7); a 120 mm square leaves them outside
    const small = withPolygon(baseInput(), { vertices: [v(-60, -60), v(60, -60), v(60, 60), v(-60, 60)], cornerRadiusMm: 0 });
    const spec = plateSpecSchema.parse(small);
    expect(() => resolvePlate(spec)).not.toThrow();
    const out = checkPlate(spec).filter((f) => f.code.startsWith('outline') || /outline/.test(f.message));
    expect(out.map((f) => f.featureIds[0])).toEqual(expect.arrayContaining(['E1', 'E2', 'E3', 'E4']));
  });
});

describe('pasting corner rows', () => {
  it('reads X, Y and an optional radius with a unit header; reports bad lines by number', () => {
    const r = parseVertexRows('X (in)\tY (in)\tR\n0\t0\n4\t0\t0.5\n4\t3\nfoo\tbar\n0\t3\t-1', 'mm');
    // 4 in = 101.6 mm, 0.5 in = 12.7 mm (exact inch definition)
    const want = [v(0, 0), v(101.6, 0, 12.7), v(101.6, 76.2)];
    expect(r.vertices).toHaveLength(3);
    r.vertices.forEach((got, i) => {
      expect(got.xMm).toBeCloseTo(want[i]!.xMm, 9);
      expect(got.yMm).toBeCloseTo(want[i]!.yMm, 9);
      if (want[i]!.radiusMm === null) expect(got.radiusMm).toBeNull();
      else expect(got.radiusMm).toBeCloseTo(want[i]!.radiusMm!, 9);
    });
    expect(r.problems.map((p) => p.line)).toEqual([5, 6]);
    expect(r.problems[0]!.message).toMatch(/line 5/);
  });
  it('comma rows in the display unit, inch text in mm mode', () => {
    const r = parseVertexRows('10, 20\n1/2", 30 mm\n5,5,2', 'mm');
    expect(r.vertices).toEqual([v(10, 20), v(12.7, 30), v(5, 5, 2)]);
    expect(r.problems).toEqual([]);
  });
});
