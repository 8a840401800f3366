import { describe, expect, it } from 'vitest';
import { parseHoleRows, readSizeCell } from '../../../src/domain/editor/paste';

describe('pasting hole rows', () => {
  it('reads tab-separated X, Y, size in the display unit (mm)', () => {
    const r = parseHoleRows('10\t20\tM10x1.5\n-30.5\t40\t11\n', 'mm');
    expect(r.separator).toBe('tab');
    expect(r.problems).toEqual([]);
    expect(r.rows).toHaveLength(2);
    expect(r.rows[0]).toMatchObject({ line: 1, xMm: 10, yMm: 20, fastener: 'M10x1.5' });
    // a bare decimal in the size column is an explicit diameter, not a fastener
    expect(r.rows[1]).toMatchObject({ line: 2, xMm: -30.5, yMm: 40, diameterMm: 11 });
    expect(r.rows[1]!.fastener).toBeUndefined();
  });

  it('reads inch values without a unit when the display unit is inch, and units in cells', () => {
    const r = parseHoleRows('1.5, 2\n1-1/4", 30 mm', 'in');
    expect(r.separator).toBe('comma');
    expect(r.problems).toEqual([]);
    expect(r.rows[0]!.xMm).toBeCloseTo(38.1, 9); // 1.5 in × 25.4
    expect(r.rows[0]!.yMm).toBeCloseTo(50.8, 9);
    expect(r.rows[1]!.xMm).toBeCloseTo(31.75, 9); // 1 1/4 in
    expect(r.rows[1]!.yMm).toBeCloseTo(30, 9);
  });

  it('uses a header row for column order and column units', () => {
    const r = parseHoleRows('Hole;Y (in);X (mm);Size\nT20;1;10;3/8-16 UNC\nT21;2;20;3/8', 'mm');
    expect(r.headerFound).toBe(true);
    expect(r.problems).toEqual([]);
    expect(r.rows[0]).toMatchObject({ id: 'T20', xMm: 10, fastener: '3/8-16 UNC' });
    expect(r.rows[0]!.yMm).toBeCloseTo(25.4, 9);
    // a bare fraction in the size column is an inch bolt size
    expect(r.rows[1]!.fastener).toBe('3/8');
  });

  it('detects an id column without a header', () => {
    const r = parseHoleRows('E9 12 34 M8\nE10 -12 34 M8', 'mm');
    expect(r.separator).toBe('space');
    expect(r.rows.map((x) => x.id)).toEqual(['E9', 'E10']);
    expect(r.rows[1]!.xMm).toBe(-12);
  });

  it('reports each bad line by number and keeps the good ones', () => {
    const r = parseHoleRows('10\t20\n12,5\t7\nabc\tdef\n5\t6\tM99x9\n7', 'mm');
    expect(r.rows.map((x) => x.line)).toEqual([1]);
    expect(r.problems.map((p) => p.line)).toEqual([2, 3, 4, 5]);
    expect(r.problems[0]!.message).toMatch(/line 2: X "12,5" is not a length \(use a dot/);
    expect(r.problems[2]!.message).toMatch(/M99x9/);
    expect(r.problems[3]!.message).toMatch(/needs X and Y/);
  });

  it('ignores blank lines, Windows line ends and a trailing separator', () => {
    const r = parseHoleRows('\r\n1\t2\t\r\n\r\n3\t4\t\r\n', 'mm');
    expect(r.problems).toEqual([]);
    expect(r.rows.map((x) => [x.line, x.xMm, x.yMm])).toEqual([[2, 1, 2], [4, 3, 4]]);
  });

  it('tells a fastener from a diameter', () => {
    expect(readSizeCell('M12', 'mm')).toEqual({ fastener: 'M12x1.75' });
    expect(readSizeCell('0.406"', 'mm')).toEqual({ diameterMm: expect.closeTo(10.3124, 9) });
    expect(readSizeCell('-3', 'mm')).toHaveProperty('error');
    expect(readSizeCell('', 'mm')).toEqual({});
  });
});
