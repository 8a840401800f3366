import { describe, expect, it } from 'vitest';
import { DomainError } from '~/domain/errors';
import { clearanceHole, clearanceHoleMm, clearanceRangeMm } from '~/domain/standards/clearanceHoles';

function codeOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    if (e instanceof DomainError) return e.code;
    throw e;
  }
  return 'no error';
}

describe('ISO 273 metric clearance holes', () => {
  // ISO 273 fine (H12) / medium (H13) / coarse (H14), mm — REFERENCES.md "Clearance holes"
  const table: [string, number, number, number][] = [
    ['M6', 6.4, 6.6, 7.0],
    ['M8', 8.4, 9.0, 10.0],
    ['M10', 10.5, 11.0, 12.0],
    ['M12', 13.0, 13.5, 14.5],
    ['M14', 15.0, 15.5, 16.5],
    ['M16', 17.0, 17.5, 18.5],
  ];
  it.each(table)('ISO 273: %s -> fine %d / medium %d / coarse %d mm', (bolt, fine, medium, coarse) => {
    expect(clearanceHoleMm(bolt, 'fine')).toBe(fine);
    expect(clearanceHoleMm(bolt, 'medium')).toBe(medium);
    expect(clearanceHoleMm(bolt, 'coarse')).toBe(coarse);
    expect(clearanceRangeMm(bolt)).toEqual({ minMm: fine, maxMm: coarse });
  });

  it('accepts a thread designation for the bolt', () => {
    // ISO 273 medium series (H13): M10 -> 11.0 mm
    expect(clearanceHoleMm('M10x1.25', 'medium')).toBe(11.0);
  });

  it('maps the ASME class names onto the ISO series for metric bolts', () => {
    // Machinery's Handbook 31st ed. (via REFERENCES): ASME B18.2.8 metric uses the ISO 273 classes
    expect(clearanceHoleMm('M12', 'close')).toBe(13.0);
    expect(clearanceHoleMm('M12', 'normal')).toBe(13.5);
    expect(clearanceHoleMm('M12', 'loose')).toBe(14.5);
    expect(clearanceHole('M12', 'normal')).toMatchObject({ fitClass: 'medium', standard: 'ISO 273' });
  });

  it('second source: a fastener supplier\'s ISO 273 table gives the same M10 close/fine hole', () => {
    // ISO 273 as reprinted in a fastener supplier's socket-screw calculator: M10 close (fine) 10.5 mm
    expect(clearanceHoleMm('M10', 'fine')).toBe(10.5);
    // each series is wider than the one before and every hole clears the bolt
    for (const [bolt, fine, medium, coarse] of table) {
      expect(fine).toBeGreaterThan(Number(bolt.slice(1)));
      expect(medium).toBeGreaterThan(fine);
      expect(coarse).toBeGreaterThan(medium);
    }
  });

  it('sizes outside the project table are refused, not guessed', () => {
    // ISO 273 has M20 (medium 22 mm, from memory) but this table stops at M16
    expect(codeOf(() => clearanceHoleMm('M20', 'medium'))).toBe('clearance.unsupported');
  });
});

describe('ASME B18.2.8 inch clearance holes', () => {
  // ASME B18.2.8 close / normal / loose, inch — REFERENCES.md "Clearance holes"
  const table: [string, number, number, number][] = [
    ['1/4', 0.266, 0.281, 0.297],
    ['5/16', 0.328, 0.344, 0.359],
    ['3/8', 0.391, 0.406, 0.422],
    ['7/16', 0.453, 0.469, 0.484],
    ['1/2', 0.531, 0.562, 0.609],
    ['5/8', 0.656, 0.688, 0.734],
  ];
  it.each(table)('ASME B18.2.8: %s -> close %d / normal %d / loose %d in (returned × 25.4 mm)', (bolt, close, normal, loose) => {
    expect(clearanceHoleMm(bolt, 'close')).toBeCloseTo(close * 25.4, 9);
    expect(clearanceHoleMm(bolt, 'normal')).toBeCloseTo(normal * 25.4, 9);
    expect(clearanceHoleMm(bolt, 'loose')).toBeCloseTo(loose * 25.4, 9);
    const range = clearanceRangeMm(bolt);
    expect(range.minMm).toBeCloseTo(close * 25.4, 9);
    expect(range.maxMm).toBeCloseTo(loose * 25.4, 9);
  });

  it('second check: every inch clearance hole is a fractional drill (n/64 in) rounded to 3 decimals (from memory)', () => {
    // e.g. 3/8 close 25/64 = 0.3906, normal 13/32 = 0.4062, loose 27/64 = 0.4219; 1/2 normal 9/16 = 0.5625
    for (const [bolt, ...values] of table) {
      for (const inch of values) {
        const sixtyFourths = Math.round(inch * 64);
        expect(Math.abs(sixtyFourths / 64 - inch)).toBeLessThanOrEqual(0.0005 + 1e-12);
        // and the hole is larger than the bolt
        expect(inch).toBeGreaterThan(Number(bolt.split('/')[0]) / Number(bolt.split('/')[1]));
      }
    }
  });

  it('accepts a thread designation and reports the class in ASME words', () => {
    // ASME B18.2.8 normal fit: 3/8 -> 0.406 in = 10.3124 mm
    expect(clearanceHoleMm('3/8-16 UNC', 'normal')).toBeCloseTo(10.3124, 9);
    const h = clearanceHole('3/8-16 UNC', 'medium');
    expect(h).toMatchObject({ fitClass: 'normal', standard: 'ASME B18.2.8', tabulated: { value: 0.406, unit: 'in' } });
  });

  it('maps the ISO series names onto the ASME classes for inch bolts (our convention)', () => {
    // ASME B18.2.8 close: 1/2 -> 0.531 in; loose: 0.609 in
    expect(clearanceHoleMm('1/2', 'fine')).toBeCloseTo(0.531 * 25.4, 9);
    expect(clearanceHoleMm('1/2', 'coarse')).toBeCloseTo(0.609 * 25.4, 9);
  });
});

describe('bad input', () => {
  it('refuses unknown classes, untabulated sizes and garbage', () => {
    expect(codeOf(() => clearanceHoleMm('M10', 'snug' as never))).toBe('clearance.class');
    expect(codeOf(() => clearanceHoleMm('#10', 'normal'))).toBe('clearance.unsupported');
    expect(codeOf(() => clearanceHoleMm('M5', 'fine'))).toBe('clearance.unsupported');
    expect(codeOf(() => clearanceHoleMm('big bolt', 'fine'))).toBe('fastener.unknown');
    expect(() => clearanceHoleMm('M5', 'fine')).toThrow(/M6, M8, M10/);
  });
});
