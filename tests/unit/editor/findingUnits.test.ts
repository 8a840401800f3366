import { describe, expect, it } from 'vitest';
import { lengthsInUnits } from '../../../src/domain/editor/findingUnits';
import { checkPlate } from '../../../src/domain';
import { plate } from '../domain/plateFixture';

const IN = { length: 'in' as const };
const MM = { length: 'mm' as const };

describe('finding text in the display unit', () => {
  it('leaves millimetre mode alone', () => {
    expect(lengthsInUnits('E1 and E2 overlap by 1.50 mm.', MM)).toBe('E1 and E2 overlap by 1.50 mm.');
  });
  it('writes inch first with the mm in brackets (25.4 mm = 1 in exactly)', () => {
    expect(lengthsInUnits('E1 is 25.40 mm from the edge, under 12.70 mm.', IN)).toBe('E1 is 1.000 in [25.40 mm] from the edge, under 0.500 in [12.70 mm].');
    expect(lengthsInUnits('lands 0.127 mm off', IN)).toBe('lands 0.0050 in [0.127 mm] off');
    expect(lengthsInUnits('Ø-2.54 mm', IN)).toBe('Ø-0.100 in [-2.54 mm]');
    expect(lengthsInUnits('ligament ≥ 0.8 mm', IN)).toBe('ligament ≥ 0.031 in [0.8 mm]');
  });
  it('does not touch areas, rates, ids or figures without mm', () => {
    expect(lengthsInUnits('area 120 mm² at 0.05 mm/m, M10 bolt, 2×D', IN)).toBe('area 120 mm² at 0.05 mm/m, M10 bolt, 2×D');
  });
  it('every mm figure of a real finding gets its inch value', () => {
    // two holes put on top of each other: the overlap message carries mm figures
    const spec = plate((s) => {
      s.engineFace.holes[4].x = 100;
      s.engineFace.holes[4].y = 3;
    });
    const f = checkPlate(spec).find((x) => / mm/.test(x.message))!;
    expect(f).toBeDefined();
    const shown = lengthsInUnits(f.message, IN);
    const mmFigures = f.message.match(/\d+(?:\.\d+)? mm(?![\w²/])/g)!;
    expect(shown.match(/ in \[/g)!.length).toBe(mmFigures.length);
  });
});
