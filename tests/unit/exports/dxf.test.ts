import { describe, expect, it } from 'vitest';
import DxfParser from 'dxf-parser';
import { plateDxf } from '../../../src/domain/exports/dxf';
import { referencePlate, simplePlate } from '../../fixtures/profiles';

type V = { x: number; y: number; bulge?: number };

/**
 * Area of a closed LWPOLYLINE from its vertices and bulges, computed here from the DXF alone:
 * shoelace over the chords plus, per bulged segment, the circular segment between chord and arc
 * (bulge b = tan(θ/4); segment area = r²(θ − sin θ)/2, signed by the bulge) — hand formula.
 */
function polylineArea(vs: V[]): number {
  let a = 0;
  for (let i = 0; i < vs.length; i++) {
    const p = vs[i]!;
    const q = vs[(i + 1) % vs.length]!;
    a += (p.x * q.y - q.x * p.y) / 2;
    const b = p.bulge ?? 0;
    if (b !== 0) {
      const theta = 4 * Math.atan(Math.abs(b));
      const chord = Math.hypot(q.x - p.x, q.y - p.y);
      const r = chord / (2 * Math.sin(theta / 2));
      a += Math.sign(b) * ((r * r) / 2) * (theta - Math.sin(theta));
    }
  }
  return a;
}

const meta = { partNumber: 'PW-0042', revision: 3 };

describe('plate DXF', () => {
  const parsed = new DxfParser().parseSync(plateDxf(referencePlate, meta))!;
  const entities = parsed.entities as unknown as Array<Record<string, unknown> & { type: string; layer: string }>;

  it('is in millimetres ($INSUNITS 4, DXF reference HEADER)', () => {
    expect(parsed.header['$INSUNITS']).toBe(4);
  });

  it('holds only the outline, the pocket, one circle per round feature and the engraving', () => {
    const types = new Map<string, number>();
    for (const e of entities) types.set(e.type, (types.get(e.type) ?? 0) + 1);
    // 31 holes + 10 counterbores (hand count of the fixture); outline + 1 pocket
    expect(Object.fromEntries(types)).toEqual({ LWPOLYLINE: 2, CIRCLE: 41, TEXT: 1 });
  });

  it('puts each operation on its own layer', () => {
    const byLayer = new Map<string, number>();
    for (const e of entities) byLayer.set(e.layer, (byLayer.get(e.layer) ?? 0) + 1);
    expect(Object.fromEntries(byLayer)).toEqual({
      PW_CUT_THRU: 1 + 12 + 2, // outline, E1–E12, S1–S2
      PW_BORE_CENTRE_H8: 1,
      'PW_CBORE_TRN_10.5DP': 10,
      'PW_TAPDRILL_M10X1.5': 12,
      PW_REAM_H7: 2,
      PW_REAM_H7_TRN_8DP: 2,
      PW_POCKET_ENG_4DP: 1,
      PW_ENGRAVE: 1,
    });
    const text = entities.find((e) => e.type === 'TEXT')!;
    expect(text.text).toBe('PW-0042 REV 3');
  });

  it('has one closed outline whose bulge area equals the profile area', () => {
    const outline = entities.find((e) => e.type === 'LWPOLYLINE' && e.layer === 'PW_CUT_THRU')!;
    expect(outline.shape).toBe(true); // closed flag
    const vs = outline.vertices as V[];
    expect(vs).toHaveLength(referencePlate.outline.length);
    expect(vs.filter((v) => (v.bulge ?? 0) !== 0)).toHaveLength(10); // the ten fillets, as true arcs
    expect(Math.abs(polylineArea(vs) - referencePlate.outlineAreaMm2) / referencePlate.outlineAreaMm2).toBeLessThan(1e-9);
  });

  it('places every hole centre within 1e-6 mm of the profile', () => {
    const circles = entities.filter((e) => e.type === 'CIRCLE') as unknown as { center: { x: number; y: number }; radius: number }[];
    for (const h of referencePlate.holes) {
      const radii = [h.diameterMm / 2, ...(h.counterbore ? [h.counterbore.diameterMm / 2] : [])];
      for (const r of radii) {
        const c = circles.find((k) => Math.abs(k.radius - r) < 1e-9 && Math.hypot(k.center.x - h.center.x, k.center.y - h.center.y) < 1e-6);
        expect(c, `${h.id} Ø${2 * r}`).toBeDefined();
      }
    }
  });

  it('names the thread in the tap-drill layer and keeps layer names DXF-legal', () => {
    const p = { ...simplePlate, holes: simplePlate.holes.map((h) => (h.id === 'T1' ? { ...h, thread: '3/8-16 UNC' } : h)) };
    const names = Object.keys(new DxfParser().parseSync(plateDxf(p, meta))!.tables.layer.layers);
    expect(names).toContain('PW_TAPDRILL_3_8-16_UNC_TRN_6DP');
    for (const n of names) expect(n).not.toMatch(/[<>/\\":;?*|=`]/);
  });
});
