import { describe, expect, it } from 'vitest';
import { checkLayout, evaluateDoc, layoutDoc } from '../../../src/components/editor/evaluate';
import { checkPlate, plateSpecSchema, resolvePlate } from '../../../src/domain';
import { baseInput } from '../domain/plateFixture';

describe('the editor evaluation in two steps', () => {
  it('finds exactly what checkPlate finds, reusing the layout', () => {
    const doc = baseInput();
    // two holes on top of each other: an error with figures
    (doc.engineFace.holes![4] as { x: number }).x = 70;
    const layout = layoutDoc(doc);
    expect(layout.profile).not.toBeNull();
    const spec = plateSpecSchema.parse(doc);
    const direct = checkPlate(spec);
    expect(direct.length).toBeGreaterThan(0);
    expect(checkLayout(layout).findings).toEqual(direct);
    expect(checkPlate(spec, resolvePlate(spec))).toEqual(direct);
    expect(evaluateDoc(doc).findings).toEqual(direct);
  });
  it('a document the schema refuses: issues by path, no profile, no findings', () => {
    const layout = layoutDoc({ ...baseInput(), thicknessMm: 0 });
    expect(layout.profile).toBeNull();
    expect(layout.issues.map((i) => i.path)).toContain('thicknessMm');
    expect(checkLayout(layout).findings).toEqual([]);
  });
  it('a polygon that crosses itself: an issue at the outline, never a throw', () => {
    const doc = { ...baseInput(), outline: { kind: 'polygon' as const, points: [{ x: -150, y: -150 }, { x: 150, y: 150 }, { x: 150, y: -150 }, { x: -150, y: 150 }] } };
    const e = evaluateDoc(doc);
    expect(e.profile).toBeNull();
    expect(e.issues[0]!.path).toBe('outline.points');
    expect(e.issues[0]!.message).toMatch(/crosses itself/);
  });
});
