import { describe, expect, it } from 'vitest';
import { chamferVolumeMm3, cutLength, plateMass, stockSize } from '../../../src/domain/mass';
import { hullOfDiscs, polygonOutline } from '../../../src/domain/outline';
import { parsePlateSpec, type PlateSpecInput } from '../../../src/domain/spec';

const IN = 25.4;

/**
 * A plain plate for hand arithmetic: rectangle 200 × 100 mm (sharp corners), 10 mm thick, 6061-T6,
 * a Ø50 centre bore and four M10 clearance holes (ISO 273 medium: Ø11) at (±70, ±30).
 */
function rectanglePlate(change: (s: any) => void = () => {}) {
  const input: PlateSpecInput & Record<string, any> = {
    schemaVersion: 1,
    engineFace: {
      viewedFrom: 'rear',
      holes: [
        { id: 'E1', x: 70, y: 30, role: 'clearance', fastener: 'M10' },
        { id: 'E2', x: -70, y: 30, role: 'clearance', fastener: 'M10' },
        { id: 'E3', x: -70, y: -30, role: 'clearance', fastener: 'M10' },
        { id: 'E4', x: 70, y: -30, role: 'clearance', fastener: 'M10' },
      ],
    },
    transmissionFace: { viewedFrom: 'front', holes: [] },
    centreBore: { kind: 'bore', diameterMm: 50 },
    thicknessMm: 10,
    thicknessStock: 'metric',
    outline: { kind: 'polygon', points: [{ x: -100, y: -50 }, { x: 100, y: -50 }, { x: 100, y: 50 }, { x: -100, y: 50 }] },
    material: { name: '6061-T6', densityGPerCm3: 2.7, kind: 'aluminium' },
  };
  change(input);
  return parsePlateSpec(input);
}

describe('plate mass', () => {
  it('rectangle with a bore and four holes, against hand arithmetic', () => {
    // blank   200 × 100 × 10                      = 200 000.000 mm³
    // bore    π · 25² · 10       = 6 250π          =  19 634.954 mm³
    // holes   4 · π · 5.5² · 10  = 1 210π          =   3 801.327 mm³
    // volume  200 000 − 7 460π                     = 176 563.719 mm³ = 176.5637 cm³
    // mass    176.5637 cm³ × 2.70 g/cm³ (6061, Aluminum Association) = 476.72 g
    const m = plateMass(rectanglePlate());
    expect(m.volumeMm3).toBeCloseTo(200000 - 7460 * Math.PI, 6);
    expect(m.volumeMm3).toBeCloseTo(176563.719, 3);
    expect(m.massKg).toBeCloseTo(0.47672, 5);
    expect(m.exact).toBe(true);
  });

  it('counterbores take out their annulus over their depth', () => {
    // 20 mm plate; four DIN 974-1 counterbores Ø18 × 10.5 (head k = 10 + 0.5, from memory) over Ø11 holes
    // blank 400 000; bore 12 500π; holes 4·30.25·20π = 2 420π; annuli 4·(81 − 30.25)·10.5π = 2 131.5π
    const m = plateMass(
      rectanglePlate((s) => {
        s.thicknessMm = 20;
        for (const h of s.engineFace.holes) h.counterbore = {};
      }),
    );
    expect(m.volumeMm3).toBeCloseTo(400000 - (12500 + 2420 + 2131.5) * Math.PI, 6);
  });

  it('blind holes and a pocket with a through hole inside it are counted once', () => {
    // + a Ø40 × 3 pocket around a Ø20 nose bore at (0, …): pocket adds (π·20² − π·10²)·3 = 900π;
    //   the nose bore itself π·10²·10 = 1 000π. A blind Ø8 H7 dowel 6 deep: π·16·6 = 96π.
    const m = plateMass(
      rectanglePlate((s) => {
        s.outline.points = [{ x: -100, y: -50 }, { x: 100, y: -50 }, { x: 100, y: 50 }, { x: -100, y: 50 }];
        s.centreBore.diameterMm = 20;
        s.engineFace.holes.push({ id: 'ED1', x: 40, y: 0, role: 'dowel', dowel: { diameterMm: 8 }, depthMm: 6 });
        s.starter = {
          ringGear: { teeth: 20, moduleMm: 1 },
          pinion: { teeth: 10 },
          angleDeg: 180,
          centreDistanceMm: 45,
          noseBoreDiameterMm: 20,
          recess: { depthMm: 3, shape: { kind: 'circle', diameterMm: 40 } },
        };
      }),
    );
    // blank 200 000; centre bore π·100·10 = 1 000π; 4 holes 1 210π; dowel 96π; nose 1 000π; pocket 900π
    expect(m.volumeMm3).toBeCloseTo(200000 - (1000 + 1210 + 96 + 1000 + 900) * Math.PI, 6);
    expect(m.exact).toBe(true);
  });

  it('edge chamfer on a rectangle: (L + W)·c² − 4c³/3 per edge (inset rectangle, by hand)', () => {
    // 45° chamfer c = 1 on both edges: each removes ∫₀¹ [LW − (L − 2s)(W − 2s)] ds = 300 − 4/3
    const m = plateMass(rectanglePlate((s) => (s.edgeChamferMm = 1)));
    expect(m.breakdown.chamfersMm3).toBeCloseTo(2 * (300 - 4 / 3), 9);
    expect(m.volumeMm3).toBeCloseTo(200000 - 7460 * Math.PI - 2 * (300 - 4 / 3), 6);
  });

  it('edge chamfer on a round plate: π(R·c² − c³/3) per edge (inset circle, by hand)', () => {
    const circle = hullOfDiscs([{ center: { x: 0, y: 0 }, radiusMm: 80 }]);
    expect(chamferVolumeMm3(circle, 2)).toBeCloseTo(Math.PI * (80 * 4 - 8 / 3), 9);
    // a filleted rectangle (smooth all round): K = π, P = 2(L + W) − 8r + 2πr
    const rounded = polygonOutline([{ x: 0, y: 0 }, { x: 100, y: 0 }, { x: 100, y: 60 }, { x: 0, y: 60 }], 10);
    const p = 320 - 80 + 20 * Math.PI;
    // by hand: the inset by s is a 10 − s filleted rectangle of (100 − 2s) × (60 − 2s)
    const insetArea = (s: number) => (100 - 2 * s) * (60 - 2 * s) - (4 - Math.PI) * (10 - s) ** 2;
    const A = insetArea(0);
    // Simpson's rule on the quadratic integrand is exact: ∫₀¹ (A − A(s)) ds
    const simpson = ((A - insetArea(0)) + 4 * (A - insetArea(0.5)) + (A - insetArea(1))) / 6;
    expect(chamferVolumeMm3(rounded, 1)).toBeCloseTo(simpson, 9);
    expect(chamferVolumeMm3(rounded, 1)).toBeCloseTo(p / 2 - Math.PI / 3, 9);
  });

  it('overlapping features are flagged as not exact', () => {
    const m = plateMass(rectanglePlate((s) => (s.engineFace.holes[1] = { id: 'E2', x: 66, y: 30, role: 'clearance', fastener: 'M10' })));
    expect(m.exact).toBe(false);
  });
});

describe('stock size and cut length', () => {
  it('stock blank = exact bbox + saw allowance on every side, and a stock thickness', () => {
    const s = stockSize(rectanglePlate(), { sawAllowanceMm: 5 });
    expect(s.widthMm).toBeCloseTo(210, 9);
    expect(s.heightMm).toBeCloseTo(110, 9);
    // metric stock list 6, 8, 10, … mm (REFERENCES.md): 10 mm plate → 10 mm stock
    expect(s.stock?.label).toBe('10 mm');
    expect(s.facingMm).toBe(0);
    // leaving 1 mm to face: the next size up, 12 mm
    expect(stockSize(rectanglePlate(), { facingAllowanceMm: 1 }).stock?.label).toBe('12 mm');
    // inch stock 1/4, 3/8, 1/2 … in (from memory): 10 mm → 1/2 in, facing 2.7 mm
    const inch = stockSize(rectanglePlate((p) => (p.thicknessStock = 'inch')));
    expect(inch.stock?.label).toBe('1/2 in');
    expect(inch.facingMm).toBeCloseTo(0.5 * IN - 10, 9);
    // blank mass: 210 × 110 × 10 mm³ × 2.70 g/cm³
    expect(s.blankMassKg).toBeCloseTo((210 * 110 * 10 * 2.7) / 1e6, 9);
    expect(() => stockSize(rectanglePlate(), { sawAllowanceMm: -1 })).toThrowError(/sawAllowanceMm must be 0 mm or more/);
  });

  it('cut length: outline perimeter plus hole circumferences, per operation', () => {
    const c = cutLength(rectanglePlate((s) => (s.engineFace.holes[0].counterbore = { diameterMm: 18, depthMm: 5 })));
    expect(c.outlineMm).toBeCloseTo(600, 9);
    expect(c.holesMm.through).toBeCloseTo(4 * 11 * Math.PI, 9);
    expect(c.holesMm.centreBore).toBeCloseTo(50 * Math.PI, 9);
    expect(c.counterboresMm).toBeCloseTo(18 * Math.PI, 9);
    expect(c.totalMm).toBeCloseTo(600 + (44 + 50 + 18) * Math.PI, 9);
  });
});
