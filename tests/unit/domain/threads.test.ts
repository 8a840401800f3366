import { describe, expect, it } from 'vitest';
import { DomainError } from '~/domain/errors';
import { parseFastener, parseThread } from '~/domain/standards/threads';

function codeOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    if (e instanceof DomainError) return e.code;
    throw e;
  }
  return 'no error';
}

describe('parseFastener — ISO metric', () => {
  it.each(['M10', 'M10x1.5', 'M10 x 1.5', 'm10X1.5', ' M10×1.5 ', 'M10*1.5'])('reads %j as M10x1.5 coarse', (text) => {
    // ISO 261: M10 coarse pitch 1.5 mm (from memory; also REFERENCES tap drill table row M10x1.5)
    expect(parseFastener(text)).toEqual({
      system: 'metric',
      nominal: 'M10',
      nominalDiameterMm: 10,
      pitchMm: 1.5,
      tpi: null,
      series: 'coarse',
      designation: 'M10x1.5',
    });
  });

  it('reads fine pitches', () => {
    // ISO 261 fine pitches (from memory): M10x1.25, M12x1.5, M8x1
    expect(parseFastener('M10x1.25')).toMatchObject({ pitchMm: 1.25, series: 'fine', designation: 'M10x1.25' });
    expect(parseFastener('M12 x 1.5')).toMatchObject({ pitchMm: 1.5, series: 'fine', designation: 'M12x1.5' });
    expect(parseFastener('M8x1.0')).toMatchObject({ pitchMm: 1, series: 'fine', designation: 'M8x1' });
  });

  it.each([
    // REFERENCES tap drill table (ISO 261 coarse pitches)
    ['M6', 1],
    ['M8', 1.25],
    ['M12', 1.75],
    ['M14', 2],
    ['M16', 2],
  ])('%s has coarse pitch %d mm', (text, pitch) => {
    expect(parseFastener(text).pitchMm).toBe(pitch);
  });

  it('rejects unknown sizes and pitches with fastener.unknown', () => {
    expect(codeOf(() => parseFastener('M11'))).toBe('fastener.unknown');
    expect(codeOf(() => parseFastener('M10x1.6'))).toBe('fastener.unknown');
    expect(() => parseFastener('M10x1.6')).toThrow(/coarse 1\.5; fine 1\.25, 1/);
  });
});

describe('parseFastener — unified', () => {
  it('reads a bare size as the bolt size only', () => {
    expect(parseFastener('3/8')).toEqual({
      system: 'unified',
      nominal: '3/8',
      // 3/8 in = 9.525 mm
      nominalDiameterMm: expect.closeTo(9.525, 12),
      pitchMm: null,
      tpi: null,
      series: null,
      designation: '3/8',
    });
  });

  it.each(['3/8-16', '3/8-16 UNC', '3/8-16UNC', '3/8" - 16 unc', '3/8 UNC'])('reads %j as 3/8-16 UNC', (text) => {
    // ASME B1.1: 3/8 UNC is 16 threads per inch (from memory; REFERENCES tap drill row 3/8-16)
    const f = parseFastener(text);
    expect(f.designation).toBe('3/8-16 UNC');
    expect(f.tpi).toBe(16);
    expect(f.series).toBe('coarse');
    expect(f.pitchMm).toBeCloseTo(25.4 / 16, 12);
  });

  it('reads UNF and numbered sizes', () => {
    // ASME B1.1 (from memory): 1/2-20 UNF; #10 = 0.190 in, 24 UNC / 32 UNF
    expect(parseFastener('1/2-20 UNF')).toMatchObject({ designation: '1/2-20 UNF', series: 'fine', nominalDiameterMm: 12.7 });
    const n10 = parseFastener('#10-24');
    expect(n10.designation).toBe('#10-24 UNC');
    expect(n10.nominalDiameterMm).toBeCloseTo(0.19 * 25.4, 12);
    expect(parseFastener('#10-32 UNF').series).toBe('fine');
  });

  it('rejects wrong threads per inch and contradicting series', () => {
    expect(codeOf(() => parseFastener('3/8-20'))).toBe('fastener.unknown');
    expect(() => parseFastener('3/8-24 UNC')).toThrow(/is UNF, not UNC/);
    expect(codeOf(() => parseFastener('11/32-20'))).toBe('fastener.unknown');
  });

  it.each(['', 'bolt', '10mm', 'M', '3/8-16 BSW', 'UNC'])('rejects %j with fastener.unknown and examples', (text) => {
    expect(codeOf(() => parseFastener(text))).toBe('fastener.unknown');
    expect(() => parseFastener(text)).toThrow(/3\/8-16 UNC/);
  });
});

describe('parseThread', () => {
  it('requires a pitch for unified sizes', () => {
    expect(codeOf(() => parseThread('3/8'))).toBe('thread.pitchMissing');
    expect(() => parseThread('3/8')).toThrow(/3\/8-16 UNC/);
    expect(parseThread('M10').pitchMm).toBe(1.5);
  });
});

describe('parseFastener — input that is not text (JSON from an untyped caller)', () => {
  // common practice: the message says what was expected and what came instead, never "[object Object]"
  const cases: [unknown, RegExp][] = [
    [10, /got a number \(10\)/],
    [null, /got nothing/],
    [undefined, /got nothing/],
    [false, /got false \(yes\/no\)/],
    [['M10'], /got a list/],
    [{ size: 'M10' }, /got an object/],
  ];
  for (const [input, said] of cases) {
    it(`${JSON.stringify(input) ?? String(input)} → a DomainError saying a fastener must be text`, () => {
      let err: unknown;
      try {
        parseFastener(input as never);
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(DomainError);
      const e = err as DomainError;
      expect(e.code).toBe('fastener.unknown');
      expect(e.message).toMatch(/^A fastener must be text such as "M10x1\.5"/);
      expect(e.message).toMatch(said);
      expect(e.message).not.toMatch(/\[object Object\]|undefined/);
    });
  }
  it('parseThread passes the same message on', () => {
    expect(() => parseThread({} as never)).toThrow(/A fastener must be text such as "M10x1\.5".*got an object/);
  });
});
