import { describe, expect, it } from 'vitest';
import { DomainError } from '~/domain/errors';
import {
  iso286RangeLabel,
  isoFit,
  isoLimitsMm,
  isoTolerance,
  standardToleranceUm,
} from '~/domain/standards/isoFits';

function codeOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    if (e instanceof DomainError) return e.code;
    throw e;
  }
  return 'no error';
}

// A representative size inside each REFERENCES column ("over … up to and including")
const columns: [string, number][] = [
  ['6–10', 8],
  ['10–18', 15],
  ['18–30', 25],
  ['30–50', 40],
  ['50–80', 60],
  ['80–120', 100],
  ['120–180', 150],
];

describe('standard tolerances IT6 / IT7', () => {
  // REFERENCES.md "ISO 286 limits and fits" [S: ISO 286-1 via JIS B 0401 excerpts and bearing-fit tables]
  const it6 = [9, 11, 13, 16, 19, 22, 25];
  const it7 = [15, 18, 21, 25, 30, 35, 40];
  it.each(columns.map((c, i) => [...c, it6[i]!, it7[i]!] as const))('ISO 286-1 %s mm: IT6 %d, IT7 %d µm', (_label, size, v6, v7) => {
    expect(standardToleranceUm(size, 6)).toBe(v6);
    expect(standardToleranceUm(size, 7)).toBe(v7);
  });

  it('values outside the REFERENCES columns (from memory of ISO 286-1 Table 1)', () => {
    // from memory: IT8 30–50 = 39 µm, IT5 18–30 = 9, IT6 180–250 = 29, IT8 400–500 = 97, IT7 3–6 = 12
    expect(standardToleranceUm(40, 8)).toBe(39);
    expect(standardToleranceUm(25, 5)).toBe(9);
    expect(standardToleranceUm(200, 6)).toBe(29);
    expect(standardToleranceUm(450, 8)).toBe(97);
    expect(standardToleranceUm(5, 7)).toBe(12);
    // IT7 120–180 = 40 µm (REFERENCES column, and from memory)
    expect(standardToleranceUm(150, 7)).toBe(40);
  });

  it('every tabulated IT5–IT8 over 3 mm is within 10 % of the ISO 286-1 formula k·i, i = 0.45∛D + 0.001D', () => {
    // ISO 286-1 tolerance factor (REFERENCES brief): D = geometric mean of the range limits; IT5 = 7i, IT6 = 10i, IT7 = 16i, IT8 = 25i
    const bounds = [3, 6, 10, 18, 30, 50, 80, 120, 180, 250, 315, 400, 500];
    const k: Record<number, number> = { 5: 7, 6: 10, 7: 16, 8: 25 };
    for (let r = 1; r < bounds.length; r++) {
      const lo = bounds[r - 1]!;
      const hi = bounds[r]!;
      const D = Math.sqrt(lo * hi);
      const i = 0.45 * Math.cbrt(D) + 0.001 * D;
      for (const grade of [5, 6, 7, 8]) {
        const table = standardToleranceUm((lo + hi) / 2, grade);
        expect(Math.abs(table - k[grade]! * i) / (k[grade]! * i)).toBeLessThan(0.1);
      }
    }
  });
});

describe('shaft fundamental deviations', () => {
  // REFERENCES.md "ISO 286 limits and fits": g es, k/m/n/p ei [S; k and m above 80 mm M, from memory]
  const g = [-5, -6, -7, -9, -10, -12, -14];
  const k = [1, 1, 2, 2, 2, 3, 3];
  const m = [6, 7, 8, 9, 11, 13, 15];
  const n = [10, 12, 15, 17, 20, 23, 27];
  const p = [15, 18, 22, 26, 32, 37, 43];
  it.each(columns.map((c, i) => [...c, i] as const))('ISO 286-1 %s mm (size %d): g es, k m n p ei', (_label, size, i) => {
    expect(isoTolerance(size, 'g6').upperUm).toBe(g[i]);
    expect(isoTolerance(size, 'k6').lowerUm).toBe(k[i]);
    expect(isoTolerance(size, 'm6').lowerUm).toBe(m[i]);
    expect(isoTolerance(size, 'n6').lowerUm).toBe(n[i]);
    expect(isoTolerance(size, 'p6').lowerUm).toBe(p[i]);
    // h: es = 0; H: EI = 0 (REFERENCES)
    expect(isoTolerance(size, 'h6').upperUm).toBe(0);
    expect(isoTolerance(size, 'H7').lowerUm).toBe(0);
  });

  it('tolerance zones span the IT grade', () => {
    // ISO 286-1: g6 at 6–10 = es −5, ei = −5 − 9 = −14 µm; m6 = +6 … +15; H7 = 0 … +15
    expect(isoTolerance(10, 'g6')).toEqual({ lowerUm: -14, upperUm: -5 });
    expect(isoTolerance(10, 'm6')).toEqual({ lowerUm: 6, upperUm: 15 });
    expect(isoTolerance(10, 'h7')).toEqual({ lowerUm: -15, upperUm: 0 });
  });

  it('k above IT7 has ei = 0 (ISO 286-1 rule, from memory)', () => {
    expect(isoTolerance(40, 'k8')).toEqual({ lowerUm: 0, upperUm: 39 });
    expect(isoTolerance(40, 'k7').lowerUm).toBe(2);
  });

  it('values outside the REFERENCES columns (from memory of ISO 286-2)', () => {
    // from memory: g 250–315 es −17; p 400–500 ei +68; n 3–6 ei +8; m 180–250 ei +17
    expect(isoTolerance(300, 'g6').upperUm).toBe(-17);
    expect(isoTolerance(480, 'p6').lowerUm).toBe(68);
    expect(isoTolerance(5, 'n6').lowerUm).toBe(8);
    expect(isoTolerance(200, 'm6').lowerUm).toBe(17);
  });
});

describe('worked fits at Ø10 and Ø100', () => {
  // REFERENCES.md "Worked fits" [C], clearance + / interference −
  it('H7 hole', () => {
    expect(isoTolerance(10, 'H7')).toEqual({ lowerUm: 0, upperUm: 15 });
    expect(isoTolerance(100, 'H7')).toEqual({ lowerUm: 0, upperUm: 35 });
  });
  it('H7/h6: 0 … +24 at Ø10, 0 … +57 at Ø100', () => {
    expect(isoFit(10, 'H7', 'h6').clearanceUm).toEqual({ min: 0, max: 24 });
    expect(isoFit(100, 'H7', 'h6').clearanceUm).toEqual({ min: 0, max: 57 });
  });
  it('H7/g6: +5 … +29 at Ø10, +12 … +69 at Ø100', () => {
    expect(isoFit(10, 'H7', 'g6').clearanceUm).toEqual({ min: 5, max: 29 });
    const f = isoFit(100, 'H7', 'g6');
    expect(f.clearanceUm).toEqual({ min: 12, max: 69 });
    expect(f.kind).toBe('clearance');
  });
  it('H7/m6: −15 … +9 at Ø10, −35 … +22 at Ø100', () => {
    const f = isoFit(10, 'H7', 'm6');
    expect(f.clearanceUm).toEqual({ min: -15, max: 9 });
    expect(f.kind).toBe('transition');
    expect(isoFit(100, 'H7', 'm6').clearanceUm).toEqual({ min: -35, max: 22 });
  });
  it('H7/p6 is an interference fit at Ø40 (ISO 286-1: p6 +26 … +42, H7 0 … +25)', () => {
    const f = isoFit(40, 'H7', 'p6');
    expect(f.clearanceUm).toEqual({ min: -42, max: -1 });
    expect(f.kind).toBe('interference');
  });
});

describe('size ranges are "over … up to and including"', () => {
  it('10 mm belongs to 6–10, 120 mm to 80–120 (REFERENCES note)', () => {
    expect(iso286RangeLabel(10)).toBe('over 6 up to and including 10 mm');
    expect(standardToleranceUm(10, 7)).toBe(15);
    expect(standardToleranceUm(10.000001, 7)).toBe(18);
    expect(iso286RangeLabel(120)).toBe('over 80 up to and including 120 mm');
    expect(standardToleranceUm(120, 7)).toBe(35);
    // float noise from an inch conversion stays on the boundary
    expect(standardToleranceUm((10 / 25.4) * 25.4, 7)).toBe(15);
  });

  it('limits in mm', () => {
    // Ø10 H7 = 10.000 … 10.015 mm
    const l = isoLimitsMm(10, 'H7');
    expect(l.lowerMm).toBe(10);
    expect(l.upperMm).toBeCloseTo(10.015, 12);
  });
});

describe('bad input', () => {
  it.each([0, -5, 500.01, NaN, Infinity])('refuses size %d with fit.size', (size) => {
    expect(codeOf(() => isoTolerance(size, 'H7'))).toBe('fit.size');
  });
  it('accepts 500 mm (last range, up to and including)', () => {
    expect(standardToleranceUm(500, 7)).toBe(63);
  });
  it.each(['F7', 'H9', 'x6', 'H', '7H', '', 'js6'])('refuses class %j with fit.class', (cls) => {
    expect(codeOf(() => isoTolerance(10, cls))).toBe('fit.class');
  });
  it('refuses swapped hole and shaft classes', () => {
    expect(codeOf(() => isoFit(10, 'g6', 'H7'))).toBe('fit.class');
    expect(codeOf(() => isoFit(10, 'H7', 'H7'))).toBe('fit.class');
    expect(() => isoFit(10, 'H7', 'H7')).toThrow(/lower case/);
  });
  it('refuses an unknown grade', () => {
    expect(codeOf(() => standardToleranceUm(10, 9))).toBe('fit.grade');
  });
});
