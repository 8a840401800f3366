import { describe, expect, it } from 'vitest';
import { distanceToOutline, outlineArea, outlineBBox, pointInOutline } from '../../../src/domain/outline';
import { featureDisc, plateProfile, resolvePlate } from '../../../src/domain/profile';
import type { ProfileHole } from '../../../src/domain/profileTypes';
import { plate, starterInput } from './plateFixture';

const IN = 25.4;
const byId = (holes: readonly ProfileHole[], id: string): ProfileHole => {
  const h = holes.find((x) => x.id === id);
  if (!h) throw new Error(`no feature ${id}`);
  return h;
};

/** An asymmetric three-hole pattern: angles 10°, 100°, 200° on Ø180, centre offset (4, −3). */
function asymmetric(viewedFrom: 'rear' | 'front') {
  return plate((s) => {
    s.transmissionFace = {
      viewedFrom,
      patterns: [{ id: 'A', diameterMm: 180, anglesDeg: [10, 100, 200], centerX: 4, centerY: -3 }],
      holes: [
        { id: 'T1', patternId: 'A', index: 0, role: 'tapped', fastener: 'M8x1.25' },
        { id: 'T2', patternId: 'A', index: 1, role: 'tapped', fastener: 'M8x1.25' },
        { id: 'T3', patternId: 'A', index: 2, role: 'tapped', fastener: 'M8x1.25' },
        { id: 'T4', x: 60, y: 20, role: 'tapped', fastener: 'M8x1.25' },
      ],
    };
  });
}

describe('mirroring of a face onto the plate', () => {
  // where the measured holes are, computed here by hand: centre + r·(cos θ, sin θ)
  const measured = [10, 100, 200].map((a) => ({
    x: 4 + 90 * Math.cos((a * Math.PI) / 180),
    y: -3 + 90 * Math.sin((a * Math.PI) / 180),
  }));

  it('a pattern measured on the bell housing (viewed from the front) lands mirrored: x → −x', () => {
    const holes = plateProfile(asymmetric('front')).holes;
    measured.forEach((m, i) => {
      const h = byId(holes, `T${i + 1}`);
      expect(h.center.x).toBeCloseTo(-m.x, 12);
      expect(h.center.y).toBeCloseTo(m.y, 12);
    });
    const t4 = byId(holes, 'T4');
    expect(t4.center).toEqual({ x: -60, y: 20 });
  });

  it('a pattern given in plate coordinates (viewed from the rear) is not mirrored', () => {
    const holes = plateProfile(asymmetric('rear')).holes;
    measured.forEach((m, i) => {
      const h = byId(holes, `T${i + 1}`);
      expect(h.center.x).toBeCloseTo(m.x, 12);
      expect(h.center.y).toBeCloseTo(m.y, 12);
    });
    expect(byId(holes, 'T4').center).toEqual({ x: 60, y: 20 });
  });

  it('the engine face measured at its rear face stays as entered', () => {
    const e1 = byId(plateProfile(plate()).holes, 'E1');
    // Ø200 bolt circle, first hole at 45°: (100·cos 45°, 100·sin 45°)
    expect(e1.center.x).toBeCloseTo(100 * Math.SQRT1_2, 12);
    expect(e1.center.y).toBeCloseTo(100 * Math.SQRT1_2, 12);
  });
});

describe('hole sizes, sides and ids', () => {
  it('clearance holes from ISO 273 / ASME B18.2.8, by class (medium / normal by default)', () => {
    const holes = plateProfile(
      plate((s) => {
        s.engineFace.holes[1].clearanceClass = 'fine';
        s.engineFace.holes[2].fastener = '3/8';
        s.engineFace.holes[3].diameterMm = 11.5;
      }),
    ).holes;
    expect(byId(holes, 'E1').diameterMm).toBe(11.0); // ISO 273 medium (H13): M10 → 11.0 mm
    expect(byId(holes, 'E2').diameterMm).toBe(10.5); // ISO 273 fine (H12): M10 → 10.5 mm
    expect(byId(holes, 'E3').diameterMm).toBeCloseTo(0.406 * IN, 9); // ASME B18.2.8 normal: 3/8 → 0.406 in
    expect(byId(holes, 'E4').diameterMm).toBe(11.5); // explicit override
    expect(byId(holes, 'E1').operation).toBe('through');
    expect(byId(holes, 'E1').depthMm).toBeNull();
  });

  it('tapped holes: tap drill from the table, tapped from their own face, thread through the plate', () => {
    const holes = plateProfile(
      plate((s) => {
        s.transmissionFace.holes[1].fastener = '3/8-16 UNC';
        Object.assign(s.transmissionFace.holes[2], { depthMm: 16 });
        s.engineFace.holes[0] = { id: 'E1', patternId: 'EB', index: 0, role: 'tapped', fastener: 'M10' };
      }),
    ).holes;
    const t1 = byId(holes, 'T1');
    expect(t1.operation).toBe('tapDrill');
    expect(t1.diameterMm).toBe(6.8); // metric coarse tap drill: M8x1.25 → 6.8 mm
    expect(t1.thread).toBe('M8x1.25');
    expect(t1.fromSide).toBe('transmission');
    expect(t1.threadDepthMm).toBe(20);
    expect(byId(holes, 'T2').diameterMm).toBeCloseTo(0.3125 * IN, 9); // unified: 3/8-16 → 5/16 drill (.3125 in)
    // blind 16 mm: thread stops 3 pitches short of the bottom (16 − 3 × 1.25), common practice
    expect(byId(holes, 'T3').depthMm).toBe(16);
    expect(byId(holes, 'T3').threadDepthMm).toBeCloseTo(16 - 3 * 1.25, 12);
    const e1 = byId(holes, 'E1');
    expect(e1.fromSide).toBe('engine');
    expect(e1.diameterMm).toBe(8.5); // M10x1.5 → 8.5 mm
  });

  it('counterbores default to the cap screw counterbore, cut from the side the head sits on', () => {
    const holes = plateProfile(
      plate((s) => {
        s.engineFace.holes[0].counterbore = {};
        s.engineFace.holes[1].counterbore = { diameterMm: 19, depthMm: 11 };
        s.transmissionFace.holes[0] = { id: 'T1', patternId: 'TB', index: 0, role: 'clearance', fastener: 'M8', counterbore: {} };
      }),
    ).holes;
    const e1 = byId(holes, 'E1');
    // DIN 974-1 counterbore for M10 ISO 4762: Ø18 (from memory); head height k = 10 (from memory) + 0.5
    expect(e1.counterbore).toEqual({ diameterMm: 18, depthMm: 10.5, fromSide: 'transmission' });
    expect(e1.fromSide).toBe('transmission');
    expect(byId(holes, 'E2').counterbore).toEqual({ diameterMm: 19, depthMm: 11, fromSide: 'transmission' });
    // a transmission-face bolt comes from the engine side: DIN 974-1 M8 → Ø15 (from memory), k = 8 + 0.5
    expect(byId(holes, 'T1').counterbore).toEqual({ diameterMm: 15, depthMm: 8.5, fromSide: 'engine' });
  });

  it('dowel holes carry their ISO 286 limits', () => {
    const ed1 = byId(plateProfile(plate()).holes, 'ED1');
    expect(ed1.operation).toBe('dowelReam');
    // ISO 286: Ø8 is in 6–10 mm, IT7 = 15 µm, H: EI = 0 → 8.000 … 8.015
    expect(ed1.fit?.designation).toBe('H7');
    expect(ed1.fit?.lowerMm).toBeCloseTo(8.0, 12);
    expect(ed1.fit?.upperMm).toBeCloseTo(8.015, 12);
    expect(ed1.fromSide).toBe('engine');
  });

  it('a register centre bore with a fit: Ø100 H7 → 100.000 … 100.035 (ISO 286, 80–120 mm IT7 = 35 µm)', () => {
    const c1 = byId(plateProfile(plate((s) => (s.centreBore = { kind: 'register', diameterMm: 100, fit: 'H7' }))).holes, 'C1');
    expect(c1.operation).toBe('centreBore');
    expect(c1.center).toEqual({ x: 0, y: 0 });
    expect(c1.fit?.upperMm).toBeCloseTo(100.035, 12);
  });

  it('feature ids are the spec’s, unique, plus C1, S1 and P1', () => {
    const p = plateProfile(
      plate((s) => {
        s.starter = { ...starterInput(), recess: { depthMm: 3, shape: { kind: 'circle', diameterMm: 70 } } };
      }),
    );
    const ids = p.holes.map((h) => h.id);
    expect(new Set(ids).size).toBe(ids.length);
    expect(ids).toEqual(['E1', 'E2', 'E3', 'E4', 'ED1', 'ED2', 'T1', 'T2', 'T3', 'T4', 'TD1', 'TD2', 'C1', 'S1', 'SM1', 'SM2']);
    expect(p.pockets.map((k) => k.id)).toEqual(['P1']);
  });
});

describe('starter', () => {
  it('nose bore on angleDeg at the gear centre distance a = m(z1 + z2)/2 (ISO 21771)', () => {
    const p = plateProfile(plate((s) => (s.starter = starterInput())));
    const s1 = byId(p.holes, 'S1');
    // m = 2.5, 100 + 10 teeth: a = 2.5 × 110 / 2 = 137.5 mm, straight down (270°)
    expect(s1.center.x).toBeCloseTo(0, 12);
    expect(s1.center.y).toBeCloseTo(-137.5, 12);
    expect(s1.operation).toBe('starterBore');
    expect(s1.diameterMm).toBe(50);
    // mounting holes: tangential is 90° CCW from the radial direction (−y), i.e. +x
    expect(byId(p.holes, 'SM1').center.x).toBeCloseTo(45, 12);
    expect(byId(p.holes, 'SM1').center.y).toBeCloseTo(-137.5, 12);
    expect(byId(p.holes, 'SM1').fromSide).toBe('engine');
  });

  it('diametral pitch: 105 + 10 teeth at 12 DP → a = 115 / 24 in (ISO 21771 / AGMA)', () => {
    const p = plateProfile(
      plate((s) => {
        s.starter = { ...starterInput(), ringGear: { teeth: 105, diametralPitch: 12 }, angleDeg: 0, mountingHoles: [] };
      }),
    );
    expect(byId(p.holes, 'S1').center.x).toBeCloseTo((115 / 24) * IN, 9);
  });

  it('an explicit centre distance places the nose bore there', () => {
    const s1 = byId(plateProfile(plate((s) => (s.starter = { ...starterInput(), centreDistanceMm: 140 }))).holes, 'S1');
    expect(s1.center.y).toBeCloseTo(-140, 12);
  });

  it('the recess is a pocket with a true-arc outline: a circle, or a tangential slot (stadium)', () => {
    const circle = plateProfile(
      plate((s) => (s.starter = { ...starterInput(), recess: { depthMm: 3, shape: { kind: 'circle', diameterMm: 70 } } })),
    ).pockets[0]!;
    expect(circle.areaMm2).toBeCloseTo(Math.PI * 35 * 35, 9);
    expect(circle.outline.every((s) => s.kind === 'arc')).toBe(true);
    expect(circle.fromSide).toBe('engine');
    expect(circle.depthMm).toBe(3);

    const slot = plateProfile(
      plate((s) => {
        s.starter = { ...starterInput(), angleDeg: 0, mountingHoles: [], recess: { depthMm: 4, side: 'transmission', shape: { kind: 'slot', widthMm: 60, lengthMm: 100 } } };
      }),
    ).pockets[0]!;
    // stadium: W·(L − W) + π(W/2)² = 60·40 + π·900
    expect(slot.areaMm2).toBeCloseTo(60 * 40 + Math.PI * 900, 9);
    const box = outlineBBox(slot.outline);
    // at 0° the tangential direction is +y: the slot runs along y
    expect(box.maxX - box.minX).toBeCloseTo(60, 9);
    expect(box.maxY - box.minY).toBeCloseTo(100, 9);
    expect(slot.fromSide).toBe('transmission');
  });
});

describe('outline of the plate', () => {
  it('the automatic outline keeps every feature (and pocket) inside by the edge margin', () => {
    const r = resolvePlate(
      plate((s) => {
        s.starter = { ...starterInput(), recess: { depthMm: 3, shape: { kind: 'circle', diameterMm: 70 } } };
        s.engineFace.holes[0].counterbore = {};
      }),
    );
    for (const f of r.features) {
      const d = featureDisc(f.hole);
      expect(pointInOutline(r.profile.outline, f.hole.center)).toBe(true);
      expect(distanceToOutline(r.profile.outline, f.hole.center)).toBeGreaterThanOrEqual(d.radiusMm + 12 - 1e-9);
    }
    // the pocket (Ø70) around S1 at (0, −137.5): lowest point of the plate is 35 + 12 below it
    expect(r.profile.bbox.minY).toBeCloseTo(-137.5 - 35 - 12, 9);
    expect(r.profile.outlineAreaMm2).toBeCloseTo(outlineArea(r.profile.outline), 12);
  });

  it('a polygon outline is used as given, with its fillets', () => {
    const p = plateProfile(
      plate((s) => {
        s.outline = { kind: 'polygon', points: [{ x: -150, y: -130 }, { x: 150, y: -130 }, { x: 150, y: 130 }, { x: -150, y: 130 }], cornerRadiusMm: 20 };
      }),
    );
    // 300 × 260 with four 20 mm fillets: 78 000 − (4 − π)·400
    expect(p.outlineAreaMm2).toBeCloseTo(300 * 260 - (4 - Math.PI) * 400, 9);
    expect(p.bbox).toEqual({ minX: -150, minY: -130, maxX: 150, maxY: 130 });
  });

  it('a bad polygon is reported on its spec field', () => {
    expect(() =>
      plateProfile(
        plate((s) => {
          s.outline = { kind: 'polygon', points: [{ x: 0, y: 0 }, { x: 10, y: 0 }, { x: 10, y: 10 }, { x: 0, y: 10 }], cornerRadiusMm: 6 };
        }),
      ),
    ).toThrowError(/outline\.cornerRadiusMm 6 mm is too large/);
  });
});
