import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { checkPlate, parsePlateSpec, plateProfile, type PlateSpecInput } from '../../../src/domain';
import { addBoltCircle, addPastedRows, deleteHoles, duplicateHole, holePlatePosition, housingBoltCircle, nextId, setHoleCoordinate } from '../../../src/domain/editor/specOps';
import { reapplyChanges } from '../../../src/domain/editor/reapply';

const demo = (): PlateSpecInput => JSON.parse(readFileSync(new URL('../../../templates/plates/demo.json', import.meta.url), 'utf8'));
const blank = (): PlateSpecInput => JSON.parse(readFileSync(new URL('../../../templates/plates/blank.json', import.meta.url), 'utf8'));

describe('editor operations on the spec', () => {
  it('adds a bolt circle whose holes land where the domain puts them', () => {
    const { doc, ids, patternId } = addBoltCircle(blank(), 'engineFace', { diameterMm: 200, count: 4, startAngleDeg: 45 }, { role: 'clearance', fastener: 'M10x1.5' });
    expect(patternId).toBe('EP1');
    expect(ids).toEqual(['E1', 'E2', 'E3', 'E4']);
    const profile = plateProfile(parsePlateSpec(doc));
    const e1 = profile.holes.find((h) => h.id === 'E1')!;
    // r = 100 at 45°: (70.711, 70.711)
    expect(e1.center.x).toBeCloseTo(100 * Math.SQRT1_2, 9);
    expect(e1.center.y).toBeCloseTo(100 * Math.SQRT1_2, 9);
    expect(holePlatePosition(doc.engineFace, doc.engineFace.holes![0]!)!.x).toBeCloseTo(e1.center.x, 9);
  });

  it('mirrors a transmission pattern measured looking at the face', () => {
    const { doc } = addBoltCircle(blank(), 'transmissionFace', { diameterMm: 200, anglesDeg: [0] }, { role: 'tapped', fastener: 'M8' });
    const t1 = plateProfile(parsePlateSpec(doc)).holes.find((h) => h.id === 'T1')!;
    expect(t1.center.x).toBeCloseTo(-100, 9); // viewedFrom front: x → −x
    expect(holePlatePosition(doc.transmissionFace, doc.transmissionFace.holes![0]!)!.x).toBeCloseTo(-100, 9);
  });

  it('the published housing preset makes the J617 pattern', () => {
    const h = housingBoltCircle('3');
    // SAE J617 size 3: 12 holes on 16.875 in, 3/8-16
    expect(h.request.diameterMm).toBeCloseTo(16.875 * 25.4, 9);
    expect('count' in h.request && h.request.count).toBe(12);
    expect(h.defaults.fastener).toBe('3/8-16 UNC');
  });

  it('typing a coordinate takes a pattern hole off its pattern, keeping the other coordinate', () => {
    const d = demo();
    const before = plateProfile(parsePlateSpec(d)).holes.find((h) => h.id === 'E1')!;
    const moved = setHoleCoordinate(d, 'engineFace', 0, 'x', 50);
    const h = moved.engineFace.holes![0]!;
    expect(h.patternId).toBeUndefined();
    expect(h.index).toBeUndefined();
    expect(h.x).toBe(50);
    expect(h.y).toBeCloseTo(before.center.y, 5);
    expect(d.engineFace.holes![0]!.patternId).toBe('EB'); // the input is not changed
  });

  it('moving a hole onto another makes an overlap finding; moving it back clears it', () => {
    const d = demo();
    const e2 = plateProfile(parsePlateSpec(d)).holes.find((h) => h.id === 'E2')!;
    let doc = setHoleCoordinate(d, 'engineFace', 0, 'x', e2.center.x);
    doc = setHoleCoordinate(doc, 'engineFace', 0, 'y', e2.center.y + 3);
    const overlap = checkPlate(parsePlateSpec(doc)).filter((f) => f.code === 'layout.overlap');
    expect(overlap.map((f) => [...f.featureIds].sort())).toContainEqual(['E1', 'E2']);
    expect(checkPlate(parsePlateSpec(d)).some((f) => f.code === 'layout.overlap')).toBe(false);
  });

  it('duplicates with a fresh id, pastes rows with their own ids when free, deletes', () => {
    const d = demo();
    expect(nextId(d, 'E')).toBe('E9');
    const dup = duplicateHole(d, 'engineFace', 0);
    expect(dup.id).toBe('E9');
    expect(dup.doc.engineFace.holes![1]!.id).toBe('E9');
    const pasted = addPastedRows(dup.doc, 'engineFace', [{ id: 'E1', xMm: 1, yMm: 2 }, { id: 'X5', xMm: 3, yMm: 4, fastener: 'M8x1.25' }], { role: 'clearance', fastener: 'M10x1.5' });
    expect(pasted.ids).toEqual(['E10', 'X5']); // E1 is taken
    expect(() => parsePlateSpec(pasted.doc)).not.toThrow(); // ids stay unique over the plate
    const del = deleteHoles(pasted.doc, 'engineFace', [0]);
    expect(del.engineFace.holes!.some((h) => h.id === 'E1')).toBe(false);
    expect(del.engineFace.holes!.length).toBe(pasted.doc.engineFace.holes!.length - 1);
  });
});

describe('re-applying my changes on a newer revision', () => {
  it('keeps the other side’s changes where I changed nothing, and mine where I did', () => {
    const base = demo();
    const mine = { ...setHoleCoordinate(base, 'engineFace', 0, 'x', 50), thicknessMm: 14 };
    const latest = { ...base, notes: 'theirs', centreBore: { ...base.centreBore, diameterMm: 95 } };
    const r = reapplyChanges(base, mine, latest);
    expect(r.spec.notes).toBe('theirs');
    expect(r.spec.centreBore.diameterMm).toBe(95);
    expect(r.spec.thicknessMm).toBe(14);
    expect(r.spec.engineFace.holes![0]!.x).toBe(50);
    expect(r.overwritten).toEqual([]);
    expect(r.applied).toEqual(expect.arrayContaining(['thicknessMm', 'engineFace.holes.E1']));
  });

  it('lists what both changed, keeping mine; merges holes by id', () => {
    const base = demo();
    const mine = { ...base, thicknessMm: 14 };
    const theirHoles = [...base.transmissionFace.holes!, { id: 'T99', x: 0, y: 200, role: 'tapped' as const, fastener: 'M8' }];
    const latest = { ...base, thicknessMm: 16, transmissionFace: { ...base.transmissionFace, holes: theirHoles } };
    const r = reapplyChanges(base, mine, latest);
    expect(r.spec.thicknessMm).toBe(14);
    expect(r.overwritten).toEqual(['thicknessMm']);
    expect(r.spec.transmissionFace.holes!.map((h) => h.id)).toContain('T99');
  });
});
