import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DomainError } from '~/domain/errors';
import { formatLength, MM_PER_IN, parseLength } from '~/domain/units';

function errorOf(fn: () => unknown): DomainError {
  try {
    fn();
  } catch (e) {
    if (e instanceof DomainError) return e;
    throw e;
  }
  throw new Error('expected a DomainError');
}

describe('MM_PER_IN', () => {
  it('is the international inch', () => {
    // international yard and pound agreement (1959): 1 in = 25.4 mm exactly
    expect(MM_PER_IN).toBe(25.4);
  });
});

describe('parseLength', () => {
  const cases: [string, 'mm' | 'in', number][] = [
    ['12.7', 'mm', 12.7],
    ['12.7 mm', 'in', 12.7],
    ['25.4mm', 'in', 25.4],
    ['0.5in', 'mm', 12.7],
    ['0.5"', 'mm', 12.7],
    ['1/2 in', 'mm', 12.7],
    ['1-1/4"', 'mm', 31.75],
    ['1 1/4 in', 'mm', 31.75],
    ['3/8', 'in', 9.525],
    ['3/8', 'mm', 0.375],
    ['3/8in', 'mm', 9.525],
    ['.375"', 'mm', 9.525],
    ['9.525', 'mm', 9.525],
    ['-3.2', 'mm', -3.2],
    ['-1-1/4"', 'mm', -31.75],
    ['+2', 'in', 50.8],
    ['  12.70  MM ', 'in', 12.7],
    ['2 inches', 'mm', 50.8],
    ['1 inch', 'mm', 25.4],
    ['12.', 'mm', 12],
    ['0', 'in', 0],
  ];
  it.each(cases)('reads %s (default %s) as %d mm', (text, unit, mm) => {
    // 1 in = 25.4 mm exactly: 3/8 in = 9.525 mm, 1-1/4 in = 31.75 mm (hand computed)
    expect(parseLength(text, unit)).toBeCloseTo(mm, 12);
  });

  it('returns +0 for -0', () => {
    expect(Object.is(parseLength('-0', 'mm'), 0)).toBe(true);
  });

  it.each(['', '   ', 'abc', '12 furlongs', '1/0', '1-1/0', '1 1/0 in', 'NaN', 'Infinity', '-Infinity', '1e3', '1..2', '--1', '1/2/3', 'mm', '"', '1-5/4'])(
    'rejects %j with length.invalid, quoting the input and the accepted forms',
    (text) => {
      const e = errorOf(() => parseLength(text, 'mm'));
      expect(e.code).toBe('length.invalid');
      expect(e.message).toContain(`"${text}"`);
      expect(e.message).toContain('accepted forms');
      expect(e.message).toContain('1-1/4"');
    },
  );

  it('names the zero denominator', () => {
    expect(errorOf(() => parseLength('3/0', 'in')).message).toContain('zero denominator');
  });

  it('rejects a decimal comma and suggests the dot form', () => {
    const e = errorOf(() => parseLength('1,5', 'mm'));
    expect(e.code).toBe('length.invalid');
    expect(e.message).toContain('"1.5"');
    expect(errorOf(() => parseLength('1,000 mm', 'mm')).message).toContain('thousands');
  });

  it('rejects numbers too large to be finite', () => {
    const e = errorOf(() => parseLength('9'.repeat(400), 'mm'));
    expect(e.code).toBe('length.invalid');
  });

  it('attaches the field path when given', () => {
    const e = errorOf(() => parseLength('x', 'mm', ['engineFace', 'holes', 3, 'x']));
    expect(e.path).toEqual(['engineFace', 'holes', 3, 'x']);
    expect(e.message).toContain('engineFace.holes.3.x');
  });

  it('rejects an unknown default unit', () => {
    expect(errorOf(() => parseLength('1', 'cm' as never)).code).toBe('length.unit');
  });
});

describe('formatLength', () => {
  it('shows millimetres with fixed decimals', () => {
    expect(formatLength(12.7, 'mm')).toBe('12.70 mm');
    expect(formatLength(12.7, 'mm', { decimals: 1, showUnit: false })).toBe('12.7');
    expect(formatLength(-0.001, 'mm')).toBe('0.00 mm');
  });

  it('shows decimal inches', () => {
    expect(formatLength(12.7, 'in')).toBe('0.500"');
    expect(formatLength(9.525, 'in', { decimals: 4 })).toBe('0.3750"');
    expect(formatLength(25.4, 'in', { showUnit: false })).toBe('1.000');
  });

  it('shows reduced fractions to 1/64', () => {
    expect(formatLength(31.75, 'in', { fraction: true })).toBe('1-1/4"');
    expect(formatLength(9.525, 'in', { fraction: true })).toBe('3/8"');
    expect(formatLength(50.8, 'in', { fraction: true })).toBe('2"');
    expect(formatLength(25.4 / 64, 'in', { fraction: true })).toBe('1/64"');
    expect(formatLength(-31.75, 'in', { fraction: true })).toBe('-1-1/4"');
    expect(formatLength(0, 'in', { fraction: true, showUnit: false })).toBe('0');
  });

  it('marks a fraction that is off by more than 0.0005 in with ≈', () => {
    // 10 mm = 0.393701 in; nearest 1/64 is 25/64 = 0.390625 (off 0.0031 in)
    expect(formatLength(10, 'in', { fraction: true })).toBe('≈25/64"');
    // 0.3754 in is 0.0004 in from 3/8: shown as exact
    expect(formatLength(0.3754 * 25.4, 'in', { fraction: true })).toBe('3/8"');
    // 0.3756 in is 0.0006 in from 3/8
    expect(formatLength(0.3756 * 25.4, 'in', { fraction: true })).toBe('≈3/8"');
    // 0.999 in rounds up to a whole inch
    expect(formatLength(0.999 * 25.4, 'in', { fraction: true })).toBe('≈1"');
  });

  it('rejects non-finite values and bad options', () => {
    expect(errorOf(() => formatLength(NaN, 'mm')).code).toBe('length.invalid');
    expect(errorOf(() => formatLength(Infinity, 'in')).code).toBe('length.invalid');
    expect(errorOf(() => formatLength(1, 'mm', { decimals: 1.5 })).code).toBe('length.decimals');
  });

  it('round-trips through parseLength (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -2000, max: 2000, noNaN: true }), (mm) => {
        const asMm = parseLength(formatLength(mm, 'mm', { decimals: 6 }), 'in');
        expect(Math.abs(asMm - mm)).toBeLessThanOrEqual(0.5e-6 + 1e-9);
        const asIn = parseLength(formatLength(mm, 'in', { decimals: 7 }), 'mm');
        expect(Math.abs(asIn - mm)).toBeLessThanOrEqual(0.5e-7 * 25.4 + 1e-9);
      }),
    );
  });

  it('fractions round-trip exactly for every 1/64 (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: -6400, max: 6400 }), (sixtyFourths) => {
        const mm = (sixtyFourths / 64) * 25.4;
        const text = formatLength(mm, 'in', { fraction: true });
        expect(text.startsWith('≈')).toBe(false);
        expect(parseLength(text, 'mm')).toBeCloseTo(mm, 9);
      }),
    );
  });
});

describe('parseLength — input that is not text (JSON from an untyped caller)', () => {
  // common practice: the message says what was expected and what came instead, never "[object Object]"
  const cases: [unknown, RegExp][] = [
    [12, /got a number \(12\)/],
    [Number.NaN, /got a number that is not finite/],
    [null, /got nothing/],
    [undefined, /got nothing/],
    [true, /got true \(yes\/no\)/],
    [[], /got a list/],
    [{ value: 12 }, /got an object/],
  ];
  for (const [input, said] of cases) {
    it(`${JSON.stringify(input) ?? String(input)} → a DomainError saying a length must be text`, () => {
      let err: unknown;
      try {
        parseLength(input as never, 'mm', ['holes', 0, 'diameter']);
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(DomainError);
      const e = err as DomainError;
      expect(e.code).toBe('length.invalid');
      expect(e.message).toMatch(/^A length at holes\.0\.diameter must be text such as "12\.7"/);
      expect(e.message).toMatch(said);
      expect(e.message).not.toMatch(/\[object Object\]|undefined|NaN/);
    });
  }
});
