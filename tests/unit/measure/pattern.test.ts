import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { applyPatternToSpec, type AppliedHole } from '../../../src/domain/measure/applyPattern';
import { axisOnFace, fromView, likelyPatternHoles, measuredPattern, toView } from '../../../src/domain/measure/pattern';
import { snapHoleSize } from '../../../src/domain/measure/snap';
import { MeasureSession } from '../../../src/domain/measure/session';
import { parseMeasureFile } from '../../../src/domain/measure/formats';
import { checkUnits, guessUnits } from '../../../src/domain/measure/unitsHint';
import { parsePlateSpec } from '../../../src/domain/spec';
import { faceAxes } from '../../../src/domain/fit/plane';
import { DomainError } from '../../../src/domain/errors';

const blank = parsePlateSpec(JSON.parse(readFileSync(new URL('../../../templates/plates/blank.json', import.meta.url), 'utf8')));

/** n hole centres on a circle of diameter d about (cx, cy), from start°, in face coordinates. */
function ring(n: number, d: number, cx: number, cy: number, startDeg: number) {
  return Array.from({ length: n }, (_, k) => {
    const a = ((startDeg + (360 * k) / n) * Math.PI) / 180;
    return { id: `H${k + 1}`, centerU: cx + (d / 2) * Math.cos(a), centerV: cy + (d / 2) * Math.sin(a), diameterMm: 11.02 };
  });
}

describe('snapping to standard sizes', () => {
  it('a measured 11.02 mm hole is an ISO 273 medium M10 clearance hole, +0.02 mm', () => {
    // ISO 273 medium series (H13): M10 -> 11.0 mm
    const [best] = snapHoleSize(11.02);
    expect(best).toMatchObject({ kind: 'clearance', fastener: 'M10', fitClass: 'medium' });
    expect(best!.differenceMm).toBeCloseTo(0.02, 12);
  });
  it('a measured 8.47 mm hole is tapped M10x1.5 (tap drill 8.5 mm), −0.03 mm', () => {
    // metric coarse tap drill (ISO 261 / ISO 965 basis): M10x1.5 -> 8.5 mm
    const [best] = snapHoleSize(8.47, { kind: 'tapped' });
    expect(best).toMatchObject({ kind: 'tapped', fastener: 'M10x1.5' });
    expect(best!.differenceMm).toBeCloseTo(-0.03, 12);
  });
  it('inch holes snap to ASME B18.2.8 in mm', () => {
    // ASME B18.2.8 normal fit: 3/8 -> 0.406 in = 10.3124 mm
    const [best] = snapHoleSize(10.33, { system: 'inch', kind: 'clearance' });
    expect(best).toMatchObject({ fastener: '3/8', fitClass: 'normal' });
    expect(best!.diameterMm).toBeCloseTo(0.406 * 25.4, 12);
  });
});

describe('view, bolt circle and bore offset', () => {
  it('toView and fromView undo each other for every flip and turn', () => {
    for (const flip of [false, true]) {
      for (const rotateDeg of [0, 90, 37, 270]) {
        const p = toView({ flip, rotateDeg }, 3.5, -8.25);
        const q = fromView({ flip, rotateDeg }, p.x, p.y);
        expect(q.u).toBeCloseTo(3.5, 12);
        expect(q.v).toBeCloseTo(-8.25, 12);
      }
    }
    // seen from the other side, +u points left: a hole at 30° appears at 150°
    const flipped = toView({ flip: true, rotateDeg: 0 }, Math.cos(Math.PI / 6), Math.sin(Math.PI / 6));
    expect((Math.atan2(flipped.y, flipped.x) * 180) / Math.PI).toBeCloseTo(150, 10);
  });

  it('fits the bolt circle in the view and measures its centre from the bore axis', () => {
    const holes = ring(8, 240, 0.35, -0.2, 22.5);
    const p = measuredPattern(holes, { axis: { u: 0, v: 0 } });
    expect(p.boltCircle.diameterMm).toBeCloseTo(240, 9);
    expect(p.boltCircle.startAngleDeg).toBeCloseTo(22.5, 9);
    expect(p.offset!.distanceMm).toBeCloseTo(Math.hypot(0.35, 0.2), 9);
    // TIR = 2 × offset
    expect(p.offset!.tirMm).toBeCloseTo(2 * Math.hypot(0.35, 0.2), 9);
    expect(p.holes[0]!.sizes[0]!.fastener).toBe('M10');
    const turned = measuredPattern(holes, { view: { flip: false, rotateDeg: 90 } });
    expect(turned.boltCircle.startAngleDeg).toBeCloseTo(22.5, 9); // 112.5 is slot 2 of a 45° pitch
    expect(turned.holes[0]!.angleDeg).toBeCloseTo(112.5, 9);
    expect(turned.offset).toBeNull();
  });

  it('where a bore axis crosses the face, and how far it leans', () => {
    const plane = { normal: { x: 0, y: 0, z: 1 }, centroid: { x: 10, y: 20, z: 5 } };
    const axes = faceAxes(plane);
    const tilt = (2 * Math.PI) / 180;
    const hit = axisOnFace({ axisPoint: { x: 13, y: 18, z: 5 + 50 }, axisDirection: { x: Math.sin(tilt), y: 0, z: Math.cos(tilt) } }, axes);
    // back 50 mm along the axis: x drops by 50·tan 2°
    expect(hit.u).toBeCloseTo(3 - 50 * Math.tan(tilt), 9);
    expect(hit.v).toBeCloseTo(-2, 9);
    expect(hit.tiltDeg).toBeCloseTo(2, 9);
  });

  it('suggests the largest group of like-sized holes', () => {
    const holes = [...ring(6, 100, 0, 0, 0), { id: 'B', centerU: 0, centerV: 0, diameterMm: 60 }, { id: 'D1', centerU: 0, centerV: 30, diameterMm: 8 }];
    expect(likelyPatternHoles(holes)).toEqual(['H1', 'H2', 'H3', 'H4', 'H5', 'H6']);
    expect(likelyPatternHoles(holes.slice(6))).toEqual([]);
  });
});

describe('applying a measured pattern to the plate spec', () => {
  const holes = ring(6, 200, 0.3, 0.1, 30);
  const measured = measuredPattern(holes, { axis: { u: 0, v: 0 } });
  const applied = (ids: string[], flags: AppliedHole['quality']['flags'][] = []): AppliedHole[] =>
    ids.map((id, i) => ({
      id,
      role: 'clearance',
      fastener: 'M10',
      clearanceClass: 'medium',
      quality: { centerU: holes[i]!.centerU, centerV: holes[i]!.centerV, diameterMm: 11.02, rmsMm: 0.012, roundnessMm: 0.05, n: 120, arcCoverageDeg: 352, flags: flags[i] ?? [], nearest: { label: 'ISO 273 medium M10', differenceMm: 0.02 } },
    }));
  const ids = ['T1', 'T2', 'T3', 'T4', 'T5', 'T6'];

  it('adds a fitted pattern and its holes; the spec stays valid and the input untouched', () => {
    const before = structuredClone(blank);
    const next = applyPatternToSpec(blank, 'transmission', { patternId: 'TB', viewedFrom: 'front', measured, holes: applied(ids, [[], ['oval', 'out-of-round']]), fromUploadId: '42', source: 'bell.ply' });
    expect(blank).toEqual(before);
    const f = next.transmissionFace;
    expect(f.viewedFrom).toBe('front');
    expect(f.patterns).toHaveLength(1);
    const p = f.patterns[0]!;
    expect(p.diameterMm).toBeCloseTo(200, 3);
    expect(p.anglesDeg!.map((a) => Math.round(a))).toEqual([30, 90, 150, 210, 270, 330]);
    // the circle sits 0.3, 0.1 from the bore axis, and the axis lands on the plate's origin
    // six exact centres: no scatter, angles exactly 60° apart; offset √(0.3² + 0.1²) = 0.3162 mm
    expect(p.fitted).toEqual({ centerX: 0.3, centerY: 0.1, rmsMm: 0, fromUploadId: '42', angularRmsDeg: 0, holeCount: 6, bore: { offsetMm: 0.3162, tirMm: 0.6325, tiltDeg: 0 } });
    expect(p.centerX - p.fitted!.centerX).toBe(0);
    expect(p.note).toMatch(/^fitted from upload 42 \(bell\.ply\): Ø200\.000 mm bolt circle over 6 holes.*0\.316 mm from the bore axis \(TIR 0\.632 mm\)/);
    expect(f.holes.map((h) => [h.id, h.patternId, h.index])).toEqual(ids.map((id, i) => [id, 'TB', i]));
    expect(f.holes[0]!.note).toBe('fitted from upload 42 (bell.ply): Ø11.020 mm, rms 0.012 mm, roundness 0.050 mm, 120 rim points over 352°; nearest standard ISO 273 medium M10 (+0.020 mm); no flags');
    expect(f.holes[1]!.note).toMatch(/flagged: oval, out of round$/);
    expect(f.holes[0]!.clearanceClass).toBe('medium');
    // each hole keeps its own fit record: centre where it was measured on the face (ring about 0.3, 0.1, from 30°)
    const h0 = f.holes[0]!.fitted!;
    expect(h0).toEqual({
      fromUploadId: '42',
      centerU: Math.round((0.3 + 100 * Math.cos(Math.PI / 6)) * 1e4) / 1e4,
      centerV: Math.round((0.1 + 100 * Math.sin(Math.PI / 6)) * 1e4) / 1e4,
      diameterMm: 11.02,
      rmsMm: 0.012,
      roundnessMm: 0.05,
      points: 120,
      arcCoverageDeg: 352,
      flags: [],
      nearest: { label: 'ISO 273 medium M10', differenceMm: 0.02 },
      radialDeviationMm: 0,
      angleDeviationDeg: 0,
    });
    expect(f.holes[1]!.fitted!.flags).toEqual(['oval', 'out-of-round']);
    expect(f.holes.every((h) => h.fitted?.fromUploadId === '42')).toBe(true);
  });

  it('without a bore the pattern records no bore offset, and its figures stay in the JSON round trip', () => {
    const noBore = measuredPattern(holes);
    const next = applyPatternToSpec(blank, 'engine', { patternId: 'EB', viewedFrom: 'rear', measured: noBore, holes: applied(ids.map((i) => i.replace('T', 'E'))), fromUploadId: '7' });
    const p = next.engineFace.patterns[0]!;
    expect(p.fitted).toEqual({ centerX: 0, centerY: 0, rmsMm: 0, fromUploadId: '7', angularRmsDeg: 0, holeCount: 6 });
    expect(p.note).toMatch(/no bore fitted/);
    expect(parsePlateSpec(JSON.parse(JSON.stringify(next)))).toEqual(next);
  });

  it('applies a bore with its diameter and cylindricity to the pattern record', () => {
    const next = applyPatternToSpec(blank, 'transmission', { patternId: 'TB', viewedFrom: 'front', measured, holes: applied(ids), fromUploadId: '9', bore: { diameterMm: 110.00012, cylindricityMm: 0.01234 } });
    expect(next.transmissionFace.patterns[0]!.fitted!.bore).toEqual({ offsetMm: 0.3162, tirMm: 0.6325, diameterMm: 110.0001, cylindricityMm: 0.0123, tiltDeg: 0 });
  });

  it('replaces an earlier pattern of the same id, with its holes', () => {
    const once = applyPatternToSpec(blank, 'engine', { patternId: 'EB', viewedFrom: 'rear', measured, holes: applied(ids.map((i) => i.replace('T', 'E'))), fromUploadId: '1' });
    const twice = applyPatternToSpec(once, 'engine', { patternId: 'EB', viewedFrom: 'rear', measured, holes: applied(ids.map((i) => i.replace('T', 'E'))), fromUploadId: '2' });
    expect(twice.engineFace.patterns).toHaveLength(1);
    expect(twice.engineFace.patterns[0]!.fitted!.fromUploadId).toBe('2');
    expect(twice.engineFace.holes).toHaveLength(6);
  });

  it('refuses a hole id used elsewhere on the plate, and a face measured from the other side', () => {
    const once = applyPatternToSpec(blank, 'engine', { patternId: 'EB', viewedFrom: 'rear', measured, holes: applied(ids.map((i) => i.replace('T', 'E'))), fromUploadId: '1' });
    expect(() => applyPatternToSpec(once, 'transmission', { patternId: 'TB', viewedFrom: 'front', measured, holes: applied(ids.map((i) => i.replace('T', 'E'))), fromUploadId: '3' })).toThrow(/Hole id "E1" is already used on the plate \(engineFace\)/);
    expect(() => applyPatternToSpec(once, 'engine', { patternId: 'EX', viewedFrom: 'front', measured, holes: applied(ids.map((i) => i.replace('T', 'X'))), fromUploadId: '3' })).toThrow(DomainError);
    expect(() => applyPatternToSpec(blank, 'engine', { patternId: 'EB', viewedFrom: 'rear', measured, holes: applied(['E1', 'E2', 'E3', 'E4', 'E5', 'E6']).map((h) => ({ ...h, fastener: 'M99' })), fromUploadId: '1' })).toThrow(/plate spec has/);
  });
});

describe('probed points with labels', () => {
  it('fits each labelled hole from its few probed points, on the face the probed face points give', () => {
    const lines = ['x,y,z,label'];
    const holes = ring(4, 100, 5, -3, 45);
    for (let k = 0; k < 200; k++) lines.push(`${(k % 20) * 6 - 60},${Math.floor(k / 20) * 12 - 60},${0.001 * (k % 3)},FACE`);
    holes.forEach((h) => {
      for (let j = 0; j < 8; j++) {
        const t = (j * Math.PI) / 4 + 0.1;
        lines.push(`${h.centerU + 5.51 * Math.cos(t)},${h.centerV + 5.51 * Math.sin(t)},0,${h.id}`);
      }
    });
    const parsed = parseMeasureFile(new TextEncoder().encode(lines.join('\n')), { fileName: 'probe.csv' });
    const s = new MeasureSession(parsed.points!, { names: parsed.labels, index: parsed.labelIndex });
    const r = s.run({ kind: 'circle', label: 'H2' });
    if (r.kind !== 'circle') throw new Error('expected a circle');
    expect(r.hole.n).toBe(8);
    expect(r.hole.diameterMm).toBeCloseTo(11.02, 6);
    // face coordinates start at the face points' centroid: compare the distance between two holes
    const r3 = s.run({ kind: 'circle', label: 'H3' });
    if (r3.kind !== 'circle') throw new Error('expected a circle');
    expect(Math.hypot(r.hole.centerU - r3.hole.centerU, r.hole.centerV - r3.hole.centerV)).toBeCloseTo(100 * Math.SQRT1_2, 6);
    expect(() => s.run({ kind: 'circle', label: 'H9' })).toThrow(/No points are labelled "H9" \(labels: FACE, H1, H2, H3, H4\)/);
  });
});

describe('units of a file', () => {
  const box = (e: number) => ({ min: { x: 0, y: 0, z: 0 }, max: { x: e, y: e / 2, z: e / 10 } });
  it('guesses inches for a flange-sized cloud in small numbers and mm for large ones', () => {
    expect(guessUnits(box(15)).guess).toBe('in');
    expect(guessUnits(box(380)).guess).toBe('mm');
    expect(guessUnits(box(15), 'mm').guess).toBe('mm');
  });
  it('says when the chosen unit makes the part implausibly large or small', () => {
    expect(checkUnits(box(380), 'in')).toMatchObject({ plausible: false });
    expect(checkUnits(box(380), 'mm')).toMatchObject({ plausible: true, extentMm: 380 });
    expect(checkUnits(box(0.05), 'mm').message).toMatch(/only 0\.05 mm.*inches/);
  });
});
