import { describe, expect, it } from 'vitest';
import { bothUnits, editText, nextUnits, readLength, showLength, unitsLabel } from '../../../src/domain/editor/units';

const MM = { length: 'mm', fractions: false } as const;
const IN = { length: 'in', fractions: false } as const;
const FR = { length: 'in', fractions: true } as const;

describe('unit toggling in the editor', () => {
  it('cycles mm → inch → inch fractions → mm', () => {
    expect(nextUnits(MM)).toEqual(IN);
    expect(nextUnits(IN)).toEqual(FR);
    expect(nextUnits(FR)).toEqual(MM);
    expect([MM, IN, FR].map(unitsLabel)).toEqual(['mm', 'inch', 'inch (fractions)']);
  });

  it('shows one stored value in each unit', () => {
    // 1 in = 25.4 mm exactly (international inch)
    expect(showLength(12.7, MM)).toBe('12.70 mm');
    expect(showLength(12.7, IN)).toBe('0.500"');
    expect(showLength(12.7, FR)).toBe('1/2"');
    expect(showLength(10, FR)).toBe('≈25/64"'); // 10 mm = 0.3937 in, nearest 1/64 is 0.390625
  });

  it('gives cell text without the unit that reads back to the same value', () => {
    for (const units of [MM, IN, FR]) {
      for (const mm of [12.7, 9.525, 240, -145.3, 0]) {
        const t = editText(mm, units);
        const back = readLength(t, units);
        expect(back.ok).toBe(true);
        // inch text keeps 4 decimals: within 0.00005 in
        if (back.ok) expect(Math.abs(back.mm - mm)).toBeLessThanOrEqual(units.length === 'mm' ? 5e-4 : 0.00005 * 25.4 + 1e-9);
      }
    }
    expect(editText(9.525, FR)).toBe('3/8');
    expect(editText(10, FR)).toBe('0.3937'); // not an exact fraction: decimal inch
    expect(editText(12.7, MM)).toBe('12.7');
  });

  it('reads typed text in the display unit unless it names one', () => {
    expect(readLength('0.5', IN)).toEqual({ ok: true, mm: 12.7 });
    expect(readLength('12.7 mm', IN)).toEqual({ ok: true, mm: 12.7 });
    expect(readLength('1/2"', MM)).toEqual({ ok: true, mm: 12.7 });
    const bad = readLength('twelve', MM);
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.message).toMatch(/"twelve" is not a length/);
    const comma = readLength('12,7', MM);
    expect(comma.ok === false && comma.message).toMatch(/use a dot.*"12\.7"/);
    const zero = readLength('0', MM, { positive: true });
    expect(zero.ok === false && zero.message).toBe('must be greater than 0');
  });

  it('states a parsed length in both units', () => {
    expect(bothUnits(12.7)).toBe('12.700 mm = 0.5000 in');
  });
});
