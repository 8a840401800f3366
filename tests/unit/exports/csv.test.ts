import { describe, expect, it } from 'vitest';
import { HOLE_TABLE_CSV_HEADER, holeTableCsv } from '../../../src/domain/exports/csv';
import { compareFeatureIds, holeTable } from '../../../src/domain/exports/holeTable';
import { referencePlate, simplePlate } from '../../fixtures/profiles';

describe('hole table CSV', () => {
  it('has exactly the agreed header', () => {
    expect(holeTableCsv(simplePlate).split('\r\n')[0]).toBe('id,face,operation,x_mm,y_mm,diameter_mm,thread,depth_mm');
    expect(HOLE_TABLE_CSV_HEADER).toBe('id,face,operation,x_mm,y_mm,diameter_mm,thread,depth_mm');
  });

  it('lists every operation of the simple plate (hand-written rows)', () => {
    const lines = holeTableCsv(simplePlate).trimEnd().split('\r\n');
    expect(lines.slice(1)).toEqual([
      'C1,engine,centreBore,0,0,60,,',
      'E1,engine,through,80,55,10,,',
      'E1,engine,counterbore,80,55,16,,5',
      'E2,engine,through,-80,55,10,,',
      'E3,engine,through,-80,-55,10,,',
      'E4,engine,through,80,-55,10,,',
      'T1,transmission,tapDrill,0,55,8.5,M10x1.5,6',
    ]);
  });

  it('has one row per hole plus one per counterbore on the reference plate, ids in natural order', () => {
    const rows = holeTable(referencePlate);
    expect(rows).toHaveLength(31 + 10);
    const ids = [...new Set(rows.map((r) => r.id))];
    expect(ids.slice(0, 6)).toEqual(['C1', 'D1', 'D2', 'D3', 'D4', 'E1']);
    expect(ids.indexOf('E10')).toBeGreaterThan(ids.indexOf('E9'));
    expect(compareFeatureIds('T2', 'T10')).toBeLessThan(0);
    const e1 = holeTableCsv(referencePlate).split('\r\n').find((l) => l.startsWith('E1,'))!;
    // E1 at 120 mm radius, 15° (fixture): cos 15° × 120 = 115.9111, sin 15° × 120 = 31.0583
    expect(e1).toBe('E1,engine,through,115.9111,31.0583,11,,');
  });

  it('quotes a field that holds a comma', () => {
    const p = { ...simplePlate, holes: simplePlate.holes.map((h) => (h.id === 'T1' ? { ...h, thread: 'M10x1.5, 6H' } : h)) };
    expect(holeTableCsv(p)).toContain('T1,transmission,tapDrill,0,55,8.5,"M10x1.5, 6H",6');
  });
});
