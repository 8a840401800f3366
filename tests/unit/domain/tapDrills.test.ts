import { describe, expect, it } from 'vitest';
import { DomainError } from '~/domain/errors';
import { tapDrill, tapDrillMm, threadMinorDiameterMm } from '~/domain/standards/tapDrills';

function codeOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    if (e instanceof DomainError) return e.code;
    throw e;
  }
  return 'no error';
}

describe('metric coarse tap drills and minor diameters', () => {
  // REFERENCES.md "Tap drills": ISO 261 / ISO 965 basis, drill and basic minor diameter D1 [S]; 6H D1 max [M, from memory]
  const table: [string, number, number, number][] = [
    ['M6x1', 5.0, 4.917, 5.153],
    ['M8x1.25', 6.8, 6.647, 6.912],
    ['M10x1.5', 8.5, 8.376, 8.676],
    ['M12x1.75', 10.2, 10.106, 10.441],
    ['M14x2', 12.0, 11.835, 12.21],
    ['M16x2', 14.0, 13.835, 14.21],
  ];
  it.each(table)('ISO 261/965: %s -> drill %d mm, D1 %d mm', (thread, drill, d1) => {
    expect(tapDrillMm(thread)).toBe(drill);
    // ISO 724: D1 = D − 1.0825·P, tabulated to 3 decimals
    expect(threadMinorDiameterMm(thread)).toBeCloseTo(d1, 3);
  });

  it.each(table)('%s: drill lies between D1 and the 6H max minor diameter (6H column from memory)', (thread, _d, d1, d1max) => {
    const drill = tapDrillMm(thread);
    expect(drill).toBeGreaterThan(d1);
    expect(drill).toBeLessThan(d1max);
  });

  it('bare metric size means coarse pitch', () => {
    // ISO 261 / 965 table: M10x1.5 -> 8.5 mm
    expect(tapDrillMm('M10')).toBe(8.5);
    expect(tapDrill('m10 x 1.5')).toMatchObject({ thread: 'M10x1.5', drillLabel: '8.5 mm' });
  });
});

describe('metric fine tap drills', () => {
  // rule of thumb tap drill ≈ D − P (common practice, REFERENCES), rounded to the usual 0.1 mm drill
  const fine: [string, number, number, number][] = [
    ['M8x1', 8, 1, 7.0],
    ['M10x1.25', 10, 1.25, 8.8],
    ['M10x1', 10, 1, 9.0],
    ['M12x1.5', 12, 1.5, 10.5],
    ['M12x1.25', 12, 1.25, 10.8],
    ['M14x1.5', 14, 1.5, 12.5],
    ['M16x1.5', 16, 1.5, 14.5],
  ];
  it.each(fine)('%s -> %d − %d ≈ %d mm', (thread, d, p, drill) => {
    expect(tapDrillMm(thread)).toBe(drill);
    expect(Math.abs(drill - (d - p))).toBeLessThanOrEqual(0.05 + 1e-9);
    // the drill must be above the basic minor diameter (no interference with the thread crest)
    expect(drill).toBeGreaterThan(threadMinorDiameterMm(thread));
  });
});

describe('unified tap drills (75 % thread)', () => {
  // REFERENCES.md "Tap drills" unified [S]
  const table: [string, string, number][] = [
    ['1/4-20 UNC', '#7', 0.201],
    ['1/4-28 UNF', '#3', 0.213],
    ['5/16-18 UNC', 'F', 0.257],
    ['5/16-24 UNF', 'I', 0.272],
    ['3/8-16 UNC', '5/16', 0.3125],
    ['3/8-24 UNF', 'Q', 0.332],
    ['7/16-14 UNC', 'U', 0.368],
    ['1/2-13 UNC', '27/64', 0.422],
  ];
  it.each(table)('%s -> %s (%d in)', (thread, label, inch) => {
    const t = tapDrill(thread);
    expect(t.drillLabel).toBe(label);
    // REFERENCES gives 3 decimals (27/64 = 0.421875 is shown as .422)
    expect(t.drillMm / 25.4).toBeCloseTo(inch, 3);
  });

  it('values outside the REFERENCES table (common shop charts, from memory)', () => {
    // from memory: 7/16-20 25/64, 1/2-20 29/64, 5/8-11 17/32, 5/8-18 37/64
    expect(tapDrillMm('7/16-20 UNF')).toBeCloseTo((25 / 64) * 25.4, 9);
    expect(tapDrillMm('1/2-20')).toBeCloseTo((29 / 64) * 25.4, 9);
    expect(tapDrillMm('5/8-11')).toBeCloseTo((17 / 32) * 25.4, 9);
    expect(tapDrillMm('5/8-18 UNF')).toBeCloseTo((37 / 64) * 25.4, 9);
  });

  it('every unified drill is within 0.02 in of D − P (rule of thumb, common practice)', () => {
    for (const [thread, , inch] of table) {
      const m = /^(\d+)\/(\d+)-(\d+)/.exec(thread)!;
      const d = Number(m[1]) / Number(m[2]);
      const p = 1 / Number(m[3]);
      expect(Math.abs(inch - (d - p))).toBeLessThan(0.02);
    }
  });

  it('unified basic minor diameter', () => {
    // ASME B1.1 basic minor diameter 1/4-20: 0.1959 in (from memory) = 0.25 − 1.082532/20
    expect(threadMinorDiameterMm('1/4-20') / 25.4).toBeCloseTo(0.1959, 4);
  });
});

describe('bad input', () => {
  it('refuses bare unified sizes, untabulated threads and garbage', () => {
    expect(codeOf(() => tapDrillMm('3/8'))).toBe('thread.pitchMissing');
    expect(codeOf(() => tapDrillMm('M5'))).toBe('tapDrill.unsupported');
    expect(codeOf(() => tapDrillMm('M6x0.75'))).toBe('tapDrill.unsupported');
    expect(codeOf(() => tapDrillMm('M10x1.6'))).toBe('fastener.unknown');
    expect(codeOf(() => threadMinorDiameterMm('1/2'))).toBe('thread.pitchMissing');
  });
});
