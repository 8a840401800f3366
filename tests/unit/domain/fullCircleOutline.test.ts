/**
 * An outline given as ONE full-circle arc (start = end), as the exports and the kernel read it,
 * must count as a circle everywhere the layout is checked: inside, distance to the edge, area.
 */
import { describe, expect, it } from 'vitest';
import { layoutProblems } from '../../../src/domain/checks';
import { distanceToOutline, outlineArea, outlinePerimeterMm, pointInOutline } from '../../../src/domain/outline';
import type { OutlineSegment, PlateProfile } from '../../../src/domain/profileTypes';

const R = 150;
const fullCircle = (ccw: boolean): OutlineSegment[] => [
  { kind: 'arc', start: { x: R, y: 0 }, end: { x: R, y: 0 }, center: { x: 0, y: 0 }, radiusMm: R, ccw },
];

function profile(outline: OutlineSegment[]): PlateProfile {
  return {
    thicknessMm: 12,
    outline,
    outlineAreaMm2: Math.PI * R * R,
    bbox: { minX: -R, minY: -R, maxX: R, maxY: R },
    edgeChamferMm: 0,
    holes: [
      { id: 'C1', face: 'plate', operation: 'centreBore', center: { x: 0, y: 0 }, diameterMm: 90, depthMm: null, fromSide: 'engine' },
      { id: 'E1', face: 'engine', operation: 'through', center: { x: 100, y: 0 }, diameterMm: 11, depthMm: null, fromSide: 'engine' },
    ],
    pockets: [],
  };
}

describe('an outline of one full-circle arc', () => {
  it.each([true, false])('holds its centre and its holes (ccw = %s)', (ccw) => {
    const o = fullCircle(ccw);
    expect(pointInOutline(o, { x: 0, y: 0 })).toBe(true);
    expect(pointInOutline(o, { x: 100, y: 0 })).toBe(true);
    expect(pointInOutline(o, { x: 0, y: 149 })).toBe(true);
    expect(pointInOutline(o, { x: 0, y: 151 })).toBe(false);
    // distance from the centre is the radius; from (100, 0) it is 50 (hand computed)
    expect(distanceToOutline(o, { x: 0, y: 0 })).toBeCloseTo(R, 9);
    expect(distanceToOutline(o, { x: 0, y: 100 })).toBeCloseTo(50, 9);
    expect(distanceToOutline(o, { x: -120, y: 0 })).toBeCloseTo(30, 9);
  });

  it('has the area π·r² and perimeter 2π·r (hand computed)', () => {
    expect(Math.abs(outlineArea(fullCircle(true)))).toBeCloseTo(Math.PI * R * R, 6);
    expect(outlinePerimeterMm(fullCircle(true))).toBeCloseTo(2 * Math.PI * R, 9);
  });

  it('does not report the centre bore C1 (or a hole) as outside', () => {
    expect(layoutProblems(profile(fullCircle(true)))).toEqual([]);
    expect(layoutProblems(profile(fullCircle(false)))).toEqual([]);
  });

  it('still reports a hole that really is outside', () => {
    const p = profile(fullCircle(true));
    const out = { ...p, holes: [...p.holes, { id: 'E9', face: 'engine' as const, operation: 'through' as const, center: { x: 160, y: 0 }, diameterMm: 11, depthMm: null, fromSide: 'engine' as const }] };
    expect(layoutProblems(out).some((m) => m.startsWith('E9 is not inside'))).toBe(true);
  });
});
