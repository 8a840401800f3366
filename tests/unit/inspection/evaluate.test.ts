import { describe, expect, it } from 'vitest';
import { isoFit, isoTolerance } from '../../../src/domain';
import { evaluateInspection, inspectionPlan, type HoleResult, type MeasurementRow, type PatternResult, type ThicknessResult, type FlatnessResult } from '../../../src/domain/inspection';
import { demoPlan, demoProfile, demoSpec, perfectRows } from './fixture';

const hole = (rows: MeasurementRow[], id: string) => evaluateInspection(demoPlan, rows).features.find((f) => f.featureId === id) as HoleResult;
const withRow = (id: string, patch: Partial<MeasurementRow>) => perfectRows().map((r) => (r.featureId === id ? { ...r, ...patch } : r));

describe('H7 dowel hole Ø10 (demo plate ED1)', () => {
  it('takes its limits from ISO 286: H7 at Ø10 is 0 … +15 µm', () => {
    // ISO 286-1 (REFERENCES.md): 10 mm lies in "over 6 up to and including 10", IT7 = 15 µm, H: EI = 0
    expect(isoTolerance(10, 'H7')).toEqual({ lowerUm: 0, upperUm: 15 });
    expect(isoFit(10, 'H7', 'm6').hole).toEqual({ lowerUm: 0, upperUm: 15 });
    const ed1 = demoPlan.holes.find((h) => h.id === 'ED1')!;
    expect(ed1.size.lowerMm).toBeCloseTo(10 + isoTolerance(10, 'H7').lowerUm / 1000, 12);
    expect(ed1.size.upperMm).toBeCloseTo(10 + isoTolerance(10, 'H7').upperUm / 1000, 12);
    expect(ed1.size.source).toMatch(/ISO 286/);
    expect(ed1.sizeRequired).toBe(true);
  });
  it('measured 10.020 fails (+20 µm > +15 µm), 10.008 passes (0 ≤ +8 ≤ +15)', () => {
    const bad = hole(withRow('ED1', { diameter: 10.02 }), 'ED1');
    expect(bad.result).toBe('fail');
    expect(bad.sizeDeviationMm).toBeCloseTo(0.02, 9);
    expect(bad.notes.join(' ')).toMatch(/10\.020 outside H7/);
    const good = hole(withRow('ED1', { diameter: 10.008 }), 'ED1');
    expect(good.result).toBe('pass');
    expect(good.sizeDeviationMm).toBeCloseTo(0.008, 9);
  });
  it('an undersize 9.998 fails (below EI = 0) and a missing Ø leaves the dowel not measured', () => {
    expect(hole(withRow('ED1', { diameter: 9.998 }), 'ED1').result).toBe('fail');
    const rows = perfectRows().map((r) => (r.featureId === 'ED1' ? { featureId: 'ED1', x: r.x, y: r.y } : r));
    expect(hole(rows, 'ED1').result).toBe('not_measured');
    expect(evaluateInspection(demoPlan, rows).overall).toBe('incomplete');
  });
});

describe('inspection of the demo plate', () => {
  it('a perfect part passes everything', () => {
    const r = evaluateInspection(demoPlan, perfectRows());
    expect(r.failing).toEqual([]);
    expect(r.counts.notMeasured).toBe(0);
    expect(r.overall).toBe('passed');
    // holes + two bolt circles + thickness + flatness
    expect(r.features.length).toBe(demoProfile.holes.length + 2 + 2);
  });
  it('E1 moved by (+0.05, −0.12): TP 0.26 (worked in truePosition.test) > Ø0.10 zone of the spec → failed', () => {
    const e1 = demoPlan.holes.find((h) => h.id === 'E1')!;
    const rows = withRow('E1', { x: e1.nominal.x + 0.05, y: e1.nominal.y - 0.12 });
    const r = evaluateInspection(demoPlan, rows);
    const f = r.features.find((x) => x.featureId === 'E1') as HoleResult;
    expect(f.truePositionMm).toBeCloseTo(0.26, 9);
    expect(f.positionToleranceMm).toBe(demoSpec.tolerances.holePositionMm);
    expect(f.result).toBe('fail');
    expect(r.overall).toBe('failed');
    expect(r.failing).toContain('E1');
  });
  it('a clearance hole size uses ± tolerances.generalMm and names it', () => {
    const e2 = demoPlan.holes.find((h) => h.id === 'E2')!;
    expect(e2.size.source).toMatch(/tolerances\.generalMm/);
    expect(hole(withRow('E2', { diameter: e2.diameterMm + demoSpec.tolerances.generalMm + 0.01 }), 'E2').result).toBe('fail');
    expect(hole(withRow('E2', { diameter: e2.diameterMm + demoSpec.tolerances.generalMm - 0.01 }), 'E2').result).toBe('pass');
  });
  it('a whole engine pattern shifted by (0.06, 0.08): every hole TP = 2·0.1 = 0.20, fitted centre off by 0.10 → concentricity Ø0.20 > TIR 0.127', () => {
    const ids = new Set(demoPlan.patterns.find((p) => p.id === 'BC-engine')!.holeIds);
    const rows = perfectRows().map((r) => (ids.has(r.featureId) ? { ...r, x: r.x! + 0.06, y: r.y! + 0.08 } : r));
    const r = evaluateInspection(demoPlan, rows);
    const bc = r.features.find((f) => f.featureId === 'BC-engine') as PatternResult;
    expect(bc.concentricityMm).toBeCloseTo(0.2, 6);
    expect(bc.fittedDiameterMm).toBeCloseTo(240, 6); // demo engine bolt circle Ø240 (E1 at r = √(119.543² + 10.459²) ≈ 120)
    expect(bc.result).toBe('fail');
    const bct = r.features.find((f) => f.featureId === 'BC-transmission') as PatternResult;
    expect(bct.concentricityMm).toBeLessThan(1e-6);
    expect(bct.result).toBe('pass');
  });
  it('thickness: range and limits ±tolerances.thicknessMm; flatness from a reading or a plane through FP points', () => {
    const nominal = demoPlan.thickness.nominalMm; // 12.7 (1/2 in stock)
    const rows = perfectRows().map((r) => (r.featureId === 'THK2' ? { ...r, z: nominal + 0.06 } : r.featureId === 'THK3' ? { ...r, z: nominal - 0.02 } : r));
    const r = evaluateInspection(demoPlan, rows);
    const t = r.features.find((f) => f.kind === 'thickness') as ThicknessResult;
    expect(t.rangeMm).toBeCloseTo(0.08, 9); // (12.76 − 12.68)
    expect(t.result).toBe('fail'); // +0.06 > +0.05
    // plane z = 0 through three corners, one point 0.07 high: max − min distance from the LSQ plane
    const fp = [
      { featureId: 'FP1', x: -100, y: -100, z: 0 },
      { featureId: 'FP2', x: 100, y: -100, z: 0 },
      { featureId: 'FP3', x: 100, y: 100, z: 0 },
      { featureId: 'FP4', x: -100, y: 100, z: 0 },
      { featureId: 'FP5', x: 0, y: 0, z: 0.07 },
    ];
    const flatRows = [...perfectRows().filter((x) => x.featureId !== 'FLAT'), ...fp];
    const fl = evaluateInspection(demoPlan, flatRows).features.find((f) => f.kind === 'flatness') as FlatnessResult;
    // LSQ plane: z = mean = 0.014 (symmetric corners), so distances −0.014 … +0.056 → flatness 0.07
    expect(fl.fittedMm).toBeCloseTo(0.07, 9);
    expect(fl.result).toBe('fail'); // 0.07 > 0.05
  });
  it('tolerances the spec states are named as the spec’s; defaults say so', () => {
    const stated = inspectionPlan(demoProfile, demoSpec.tolerances, new Set(['holePositionMm']));
    expect(stated.holes[0]!.positionSource).toBe('spec tolerances.holePositionMm');
    const defaults = inspectionPlan(demoProfile, demoSpec.tolerances);
    expect(defaults.holes[0]!.positionSource).toMatch(/default/);
    const c1 = defaults.holes.find((h) => h.id === 'C1')!;
    expect(c1.positionToleranceMm).toBe(demoSpec.tolerances.alignmentTirMm);
  });
});
