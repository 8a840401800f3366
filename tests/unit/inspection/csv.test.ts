import { describe, expect, it } from 'vitest';
import { inspectionCsv, parseInspectionCsv, rowProblems } from '../../../src/domain/inspection';
import { demoPlan, perfectRows } from './fixture';

describe('inspection CSV', () => {
  it('reads columns by header in any order, with units suffix, quotes and comments', () => {
    const text = '# probe export\nDiameter_mm,Y,X,ID\n10.008,50.714,108.757,"ED1"\n\n9.05,10.459,119.543,E1\n';
    const r = parseInspectionCsv(text, demoPlan);
    expect(r.errors).toEqual([]);
    expect(r.rows).toEqual([
      { featureId: 'ED1', x: 108.757, y: 50.714, diameter: 10.008 },
      { featureId: 'E1', x: 119.543, y: 10.459, diameter: 9.05 },
    ]);
  });
  it('semicolon files with decimal commas', () => {
    const r = parseInspectionCsv('id;x;y;z;diameter\nE1;119,543;10,459;;9,05\nTHK1;;;12,71;\n', demoPlan);
    expect(r.errors).toEqual([]);
    expect(r.rows).toEqual([{ featureId: 'E1', x: 119.543, y: 10.459, diameter: 9.05 }, { featureId: 'THK1', z: 12.71 }]);
    // THK1 without z is a row error, and then nothing of the file is kept
    const bad = parseInspectionCsv('id;x;y;diameter\nE1;119,543;10,459;9,05\nTHK1;;;\n', demoPlan);
    expect(bad.errors).toEqual([expect.objectContaining({ row: 3, featureId: 'THK1', column: 'z' })]);
    expect(bad.rows).toEqual([]);
  });
  it('reports each bad row with its line, and keeps none of the file', () => {
    const text = ['id,x,y,diameter,depth', 'E1,119.543,10.459,9.05,', 'E99,1,2,9,', 'E2,84.8.5,84.853,9,', 'E3,10.459,,9,', 'E1,119.5,10.4,9,', 'ED1,1,2,-10,', ',1,2,3,'].join('\n');
    const r = parseInspectionCsv(text, demoPlan);
    expect(r.rows).toEqual([]);
    const byLine = Object.fromEntries(r.errors.map((e) => [e.row, e.message]));
    expect(byLine[3]).toMatch(/unknown feature id "E99"/);
    expect(byLine[4]).toMatch(/"84\.8\.5" in column x is not a number/);
    expect(byLine[5]).toMatch(/both x and y/);
    expect(byLine[6]).toMatch(/E1 is already given in row 2/);
    expect(byLine[7]).toMatch(/greater than 0/);
    expect(byLine[8]).toMatch(/no feature id/);
    expect(byLine[2]).toBeUndefined();
  });
  it('missing columns are reported on the header line', () => {
    expect(parseInspectionCsv('x,y,diameter\n1,2,3\n', demoPlan).errors[0]).toMatchObject({ row: 1, message: expect.stringMatching(/feature id/) });
    expect(parseInspectionCsv('id,x,diameter\nE1,1,9\n', demoPlan).errors[0]!.message).toMatch(/missing column y/);
    expect(parseInspectionCsv('id,colour\nE1,red\n', demoPlan).errors.map((e) => e.message).join(' ')).toMatch(/unknown column "colour"/);
    expect(parseInspectionCsv('\n\n', demoPlan).errors[0]!.message).toMatch(/empty/);
  });
  it('round-trips the perfect set through inspectionCsv', () => {
    const rows = perfectRows();
    const back = parseInspectionCsv(inspectionCsv(rows), demoPlan);
    expect(back.errors).toEqual([]);
    expect(back.rows).toEqual(rows);
  });
  it('JSON rows get the same row checks', () => {
    const errs = rowProblems(demoPlan, [{ featureId: 'E1', x: 1 }, { featureId: 'ZZ9', x: 1, y: 2 }, { featureId: 'FP1', x: 1, y: 2 }]);
    expect(errs.map((e) => [e.row, e.column])).toEqual([[0, 'y'], [1, 'featureId'], [2, 'z']]);
  });
});
