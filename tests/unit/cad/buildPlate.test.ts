import { beforeAll, describe, expect, it } from 'vitest';
import type { PlateProfile } from '../../../src/domain/profileTypes';
import { buildPlate, checkSolidValidity, measureVolumeMm3 } from '../../../src/cad/buildPlate';
import { analyticVolumeMm3 } from '../../../src/cad/analyticVolume';
import { describeKernelFailure, PlateBuildError } from '../../../src/cad/errors';
import type { OC } from '../../../src/cad/kernel.node.ts';
import {
  chamferBlock,
  counterboreThroughOutline,
  makeProfile,
  referencePlate,
  roundedRectangle,
  simplePlate,
  slot,
} from '../../fixtures/profiles';
import { startTestKernel } from './kernelForTests';
import { readFileSync } from 'node:fs';
import { plateSpecSchema } from '../../../src/domain/spec';
import { plateProfile } from '../../../src/domain/profile';
import { layoutIsDisjoint } from '../../../src/domain/checks';
import { profileVolume } from '../../../src/domain/mass';

let oc: OC;
beforeAll(async () => {
  oc = await startTestKernel();
});

const PI = Math.PI;

/** rounded rectangle w × h, corner radius r: area and perimeter (hand formulas) */
const rrArea = (w: number, h: number, r: number) => w * h - (4 - PI) * r * r;
const rrPerimeter = (w: number, h: number, r: number) => 2 * (w + h) - 8 * r + 2 * PI * r;

/**
 * Blank with a 45° chamfer c on both outer edges, hand formula: each chamfer band holds
 * ∫₀ᶜ A(d) dd with A(d) = A − P·d + K·d² (parallel-curve area; K = π for a tangent outline that
 * turns once, K = 4·tan 45° = 4 for a sharp rectangle with mitred corners).
 */
const chamferedBlank = (a: number, p: number, k: number, t: number, c: number) => a * t - p * c * c + (2 / 3) * k * c ** 3;

const mixedStacks: PlateProfile = makeProfile({
  thicknessMm: 12,
  outline: roundedRectangle(160, 120, 12),
  edgeChamferMm: 1.5,
  holes: [
    { id: 'A1', face: 'engine', operation: 'through', center: { x: -55, y: 35 }, diameterMm: 10, depthMm: null, fromSide: 'engine',
      counterbore: { diameterMm: 16, depthMm: 4, fromSide: 'engine' } },
    { id: 'A2', face: 'transmission', operation: 'through', center: { x: -25, y: 35 }, diameterMm: 10, depthMm: null, fromSide: 'engine',
      counterbore: { diameterMm: 16, depthMm: 4, fromSide: 'transmission' } },
    { id: 'B1', face: 'engine', operation: 'tapDrill', center: { x: 5, y: 35 }, diameterMm: 8, depthMm: 6, fromSide: 'engine',
      thread: 'M10x1.5', counterbore: { diameterMm: 14, depthMm: 2, fromSide: 'engine' } },
    { id: 'B2', face: 'transmission', operation: 'tapDrill', center: { x: 35, y: 35 }, diameterMm: 8, depthMm: 6, fromSide: 'transmission',
      thread: 'M10x1.5', counterbore: { diameterMm: 14, depthMm: 2, fromSide: 'transmission' } },
    { id: 'B3', face: 'engine', operation: 'dowelReam', center: { x: 60, y: 35 }, diameterMm: 6, depthMm: 5, fromSide: 'engine',
      fit: { designation: 'H7', lowerMm: 6, upperMm: 6.012 } },
    { id: 'S1', face: 'plate', operation: 'starterBore', center: { x: -40, y: -20 }, diameterMm: 30, depthMm: null, fromSide: 'engine' },
  ],
  pockets: [
    { id: 'P1', outline: roundedRectangle(40, 20, 5, 40, -30), depthMm: 3, fromSide: 'transmission', areaMm2: rrArea(40, 20, 5) },
    { id: 'P2', outline: slot({ x: 30, y: 5 }, 50, 12, 0), depthMm: 2, fromSide: 'engine', areaMm2: 38 * 12 + PI * 36 },
  ],
});

describe('buildPlate — volume, bounding box and faces against hand computation', () => {
  it('simple plate: the volume computed by hand', () => {
    // 200 × 150 × 10, R15 corners; Ø60 bore, 4 × Ø10 through, E1 counterbore Ø16 × 5,
    // T1 blind Ø8.5 × 6 (hand computation)
    const hand =
      rrArea(200, 150, 15) * 10 -
      PI * 30 ** 2 * 10 -
      4 * PI * 5 ** 2 * 10 -
      PI * (8 ** 2 - 5 ** 2) * 5 -
      PI * 4.25 ** 2 * 6;
    expect(analyticVolumeMm3(simplePlate)).toBeCloseTo(hand, 6);
    const plate = buildPlate(oc, simplePlate);
    try {
      expect(plate.strategy).toBe('direct');
      expect(plate.verification.valid).toBe(true);
      expect(Math.abs(plate.verification.volumeMm3 - hand) / hand).toBeLessThan(1e-9);
      // 6 round features + 1 counterbore + 4 corner arcs (hand count)
      expect(plate.verification.cylindricalFaces).toBe(11);
      const b = plate.verification.bbox;
      // BRepBndLib pads by the shape tolerance (1e-7 mm)
      expect(b.minX).toBeCloseTo(-100, 5);
      expect(b.maxX).toBeCloseTo(100, 5);
      expect(b.minY).toBeCloseTo(-75, 5);
      expect(b.maxY).toBeCloseTo(75, 5);
      expect(b.minZ).toBeCloseTo(0, 5);
      expect(b.maxZ).toBeCloseTo(10, 5);
    } finally {
      plate.dispose();
    }
  });

  it('chamfered sharp block: both strategies give the hand volume', () => {
    const hand = chamferedBlank(120 * 80, 2 * (120 + 80), 4, 12, 2) - PI * 10 ** 2 * 12;
    for (const strategy of ['direct', 'oneFace'] as const) {
      const plate = buildPlate(oc, chamferBlock, { strategy });
      try {
        expect(plate.verification.valid).toBe(true);
        expect(Math.abs(plate.verification.volumeMm3 - hand) / hand).toBeLessThan(1e-9);
      } finally {
        plate.dispose();
      }
    }
  });

  it('every kind of stacked feature (both sides, blind, counterbored, pockets): hand volume', () => {
    const t = 12;
    const c = 1.5;
    const hand =
      chamferedBlank(rrArea(160, 120, 12), rrPerimeter(160, 120, 12), PI, t, c) -
      2 * (PI * 8 ** 2 * 4 + PI * 5 ** 2 * (t - 4)) - // A1, A2: counterbore + rest of the hole
      2 * (PI * 7 ** 2 * 2 + PI * 4 ** 2 * (6 - 2)) - // B1, B2: counterbore + blind hole below it
      PI * 3 ** 2 * 5 - // B3 blind dowel hole
      PI * 15 ** 2 * t - // S1 starter bore
      rrArea(40, 20, 5) * 3 - // P1
      (38 * 12 + PI * 6 ** 2) * 2; // P2 slot 50 × 12
    for (const strategy of ['direct', 'oneFace'] as const) {
      const plate = buildPlate(oc, mixedStacks, { strategy });
      try {
        expect(plate.verification.valid).toBe(true);
        expect(Math.abs(plate.verification.volumeMm3 - hand) / hand).toBeLessThan(1e-9);
        // 6 holes + 4 counterbores + 4 outline corners + 4 + 2 pocket arcs (hand count)
        expect(plate.verification.cylindricalFaces).toBe(20);
      } finally {
        plate.dispose();
      }
    }
  });

  it('reference plate: direct B-rep, valid, analytic volume, bbox of the outline, one cylindrical face per round feature', () => {
    const plate = buildPlate(oc, referencePlate);
    try {
      expect(plate.strategy).toBe('direct');
      const v = plate.verification;
      expect(v.valid).toBe(true);
      expect(v.volumeRelErr).toBeLessThan(1e-9);
      // 31 round features + 10 counterbores + 10 outline fillets + 2 slot ends (hand count)
      expect(v.cylindricalFaces).toBe(53);
      expect(v.bbox.minX).toBeCloseTo(referencePlate.bbox.minX, 5);
      expect(v.bbox.maxX).toBeCloseTo(referencePlate.bbox.maxX, 5);
      expect(v.bbox.minY).toBeCloseTo(referencePlate.bbox.minY, 5);
      expect(v.bbox.maxY).toBeCloseTo(referencePlate.bbox.maxY, 5);
      expect(v.bbox.maxZ - v.bbox.minZ).toBeCloseTo(12.7, 5);
      // 320 × 280 outline (the fixture's extremes are straight edges)
      expect(referencePlate.bbox.maxX - referencePlate.bbox.minX).toBeCloseTo(320, 9);
      expect(referencePlate.bbox.maxY - referencePlate.bbox.minY).toBeCloseTo(280, 9);
    } finally {
      plate.dispose();
    }
  });

  it('reference plate: the one-face fallback gives the same solid volume as the direct B-rep', () => {
    const a = buildPlate(oc, referencePlate, { strategy: 'direct' });
    const b = buildPlate(oc, referencePlate, { strategy: 'oneFace' });
    try {
      expect(Math.abs(a.verification.volumeMm3 - b.verification.volumeMm3) / a.verification.volumeMm3).toBeLessThan(1e-9);
      expect(b.verification.cylindricalFaces).toBe(a.verification.cylindricalFaces);
    } finally {
      a.dispose();
      b.dispose();
    }
  });

  it('falls back to the one-face build when the domain says the layout is not disjoint', () => {
    const plate = buildPlate(oc, simplePlate, { layoutIsDisjoint: false });
    try {
      expect(plate.strategy).toBe('oneFace');
      expect(plate.rejected.join(' ')).toMatch(/direct: layout not disjoint/);
      expect(plate.verification.volumeRelErr).toBeLessThan(1e-9);
    } finally {
      plate.dispose();
    }
  });

  it('a through hole standing in a pocket floor: both strategies keep the hand volume', () => {
    const p: PlateProfile = {
      ...simplePlate,
      holes: [...simplePlate.holes, { id: 'S1', face: 'plate', operation: 'through', center: { x: 0, y: -60 }, diameterMm: 6, depthMm: null, fromSide: 'engine' }],
      pockets: [{ id: 'P1', outline: roundedRectangle(40, 16, 4, 0, -60), depthMm: 3, fromSide: 'engine', areaMm2: rrArea(40, 16, 4) }],
    };
    const hand = analyticVolumeMm3(simplePlate) - rrArea(40, 16, 4) * 3 - PI * 9 * (10 - 3); // hand: pocket, then the hole below its floor
    expect(buildPlate(oc, p).strategy).toBe('direct');
    for (const strategy of ['direct', 'oneFace'] as const) {
      const plate = buildPlate(oc, p, { strategy });
      try {
        expect(plate.verification.valid).toBe(true);
        expect(Math.abs(plate.verification.volumeMm3 - hand) / hand).toBeLessThan(1e-9);
      } finally {
        plate.dispose();
      }
    }
    // a blind hole in the pocket floor is left to the boolean build
    const blind: PlateProfile = { ...p, holes: p.holes.map((h) => (h.id === 'S1' ? { ...h, depthMm: 6 } : h)) };
    const handBlind = analyticVolumeMm3(simplePlate) - rrArea(40, 16, 4) * 3 - PI * 9 * (6 - 3);
    const plate = buildPlate(oc, blind);
    try {
      expect(plate.strategy).toBe('oneFace');
      expect(Math.abs(plate.verification.volumeMm3 - handBlind) / handBlind).toBeLessThan(1e-9);
    } finally {
      plate.dispose();
    }
  });
});

describe('buildPlate — more outlines and pocket sides', () => {
  it('through holes standing in a transmission-side pocket floor, one counterbored from the engine side', () => {
    const p: PlateProfile = makeProfile({
      thicknessMm: 12,
      edgeChamferMm: 0,
      outline: roundedRectangle(160, 120, 10),
      holes: [
        { id: 'H1', face: 'plate', operation: 'through', center: { x: 20, y: 0 }, diameterMm: 8, depthMm: null, fromSide: 'engine' },
        { id: 'H2', face: 'plate', operation: 'through', center: { x: -20, y: 0 }, diameterMm: 8, depthMm: null, fromSide: 'engine',
          counterbore: { diameterMm: 14, depthMm: 4, fromSide: 'engine' } },
      ],
      pockets: [{ id: 'P1', outline: slot({ x: 0, y: 0 }, 80, 30, 0), depthMm: 3, fromSide: 'transmission', areaMm2: 50 * 30 + PI * 225 }],
    });
    // hand: blank − pocket − H1 below the pocket floor − H2 counterbore and hole between its floor and the pocket's
    const hand = rrArea(160, 120, 10) * 12 - (50 * 30 + PI * 15 ** 2) * 3 - PI * 4 ** 2 * (12 - 3) - PI * 7 ** 2 * 4 - PI * 4 ** 2 * (12 - 4 - 3);
    for (const strategy of ['direct', 'oneFace'] as const) {
      const plate = buildPlate(oc, p, { strategy });
      try {
        expect(plate.verification.valid).toBe(true);
        expect(Math.abs(plate.verification.volumeMm3 - hand) / hand).toBeLessThan(1e-9);
      } finally {
        plate.dispose();
      }
    }
  });

  it('a round plate (the outline one full circle) with a chamfer', () => {
    const p: PlateProfile = makeProfile({
      thicknessMm: 10,
      edgeChamferMm: 1,
      outline: [{ kind: 'arc', start: { x: 100, y: 0 }, end: { x: 100, y: 0 }, center: { x: 0, y: 0 }, radiusMm: 100, ccw: true }],
      holes: [{ id: 'C1', face: 'plate', operation: 'centreBore', center: { x: 0, y: 0 }, diameterMm: 40, depthMm: null, fromSide: 'engine' }],
      pockets: [],
    });
    // hand: A·t − P·c² + ⅔·π·c³ with A = π·100², P = 2π·100, minus the bore
    const hand = PI * 1e4 * 10 - 2 * PI * 100 + (2 / 3) * PI - PI * 20 ** 2 * 10;
    for (const strategy of ['direct', 'oneFace'] as const) {
      const plate = buildPlate(oc, p, { strategy });
      try {
        expect(plate.verification.valid).toBe(true);
        expect(Math.abs(plate.verification.volumeMm3 - hand) / hand).toBeLessThan(1e-9);
        expect(plate.verification.cylindricalFaces).toBe(2);
      } finally {
        plate.dispose();
      }
    }
  });
});

describe('buildPlate — actionable errors', () => {
  it('a counterbore breaking through the outline names the hole', () => {
    let err: unknown;
    try {
      buildPlate(oc, counterboreThroughOutline());
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(PlateBuildError);
    expect((err as PlateBuildError).message).toMatch(/counterbore of hole E7 breaks through the plate outline/);
    expect((err as PlateBuildError).featureIds).toEqual(['E7']);
    expect((err as PlateBuildError).message).not.toMatch(/^\d+$/);
  });

  it('overlapping holes name both features', () => {
    const p: PlateProfile = {
      ...simplePlate,
      holes: simplePlate.holes.map((h) => (h.id === 'E2' ? { ...h, center: { x: 76, y: 52 } } : h)),
    };
    expect(() => buildPlate(oc, p)).toThrow(/Hole E1 overlaps hole E2|Hole E2 overlaps hole E1/);
  });

  it('a counterbore as deep as the plate is refused with the depth', () => {
    const p: PlateProfile = {
      ...simplePlate,
      holes: simplePlate.holes.map((h) => (h.id === 'E1' ? { ...h, counterbore: { diameterMm: 16, depthMm: 10, fromSide: 'engine' as const } } : h)),
    };
    expect(() => buildPlate(oc, p)).toThrow(/counterbore of hole E1 is 10 mm deep: it must be shallower than the plate/);
  });

  it('an edge chamfer larger than a corner radius names the corner', () => {
    const p: PlateProfile = { ...simplePlate, edgeChamferMm: 4, outline: roundedRectangle(200, 150, 3), bbox: simplePlate.bbox };
    expect(() => buildPlate(oc, { ...p, outlineAreaMm2: rrArea(200, 150, 3) })).toThrow(/not smaller than the outline corner radius of 3 mm/);
  });

  it('kernel exceptions are decoded into the kernel message, not a number', () => {
    let caught: unknown;
    try {
      new oc.gp_Dir(0, 0, 0);
    } catch (e) {
      caught = e;
    }
    expect(describeKernelFailure(oc, caught)).toMatch(/Standard_ConstructionError: gp_Dir\(\) - input vector has zero norm/);
  });

  it('a kernel failure inside a feature names the feature and the kernel message', () => {
    // a kernel whose cylinder constructor fails the way OCCT does (a real kernel exception)
    const failing = new Proxy(oc, {
      get(target, key, recv) {
        if (key === 'gp_Cylinder') {
          return function () {
            return new target.gp_Dir(0, 0, 0);
          };
        }
        return Reflect.get(target, key, recv);
      },
    });
    let err: unknown;
    try {
      buildPlate(failing, simplePlate, { strategy: 'direct' });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(PlateBuildError);
    const e = err as PlateBuildError;
    expect(e.featureIds).toEqual(['C1']);
    expect(e.message).toMatch(/The kernel failed on C1/);
    expect(e.message).toMatch(/while making C1: Standard_ConstructionError: gp_Dir\(\) - input vector has zero norm/);
  });

  it('the validity check rejects a solid with a face missing (so it can fail)', () => {
    const box = new oc.BRepPrimAPI_MakeBox(10, 10, 10).Shape();
    const ex = new oc.TopExp_Explorer(box, oc.TopAbs_ShapeEnum.TopAbs_FACE, oc.TopAbs_ShapeEnum.TopAbs_SHAPE);
    const b = new oc.TopoDS_Builder();
    const shell = new oc.TopoDS_Shell();
    b.MakeShell(shell);
    let i = 0;
    for (; ex.More(); ex.Next()) if (i++ > 0) b.Add(shell, ex.Current());
    const solid = new oc.TopoDS_Solid();
    b.MakeSolid(solid);
    b.Add(solid, shell);
    expect(checkSolidValidity(oc, box)).toBe(true);
    expect(checkSolidValidity(oc, solid)).toBe(false);
    expect(measureVolumeMm3(oc, box)).toBeCloseTo(1000, 9);
  });
});

describe('buildPlate — through the domain: plateProfile(spec) of the shipped templates', () => {
  it.each(['demo.json', 'sae-j617-3.json', 'blank.json'])('%s builds directly, valid, and matches the domain mass computation', (file) => {
    const spec = plateSpecSchema.parse(JSON.parse(readFileSync(`templates/plates/${file}`, 'utf8')));
    const profile = plateProfile(spec);
    expect(layoutIsDisjoint(profile)).toBe(true);
    const plate = buildPlate(oc, profile);
    try {
      expect(plate.strategy).toBe('direct');
      expect(plate.verification.valid).toBe(true);
      // two independent closed forms (ours in src/cad, the domain's profileVolume) and the kernel agree
      const domain = profileVolume(profile).volumeMm3;
      expect(Math.abs(plate.verification.volumeMm3 - domain) / domain).toBeLessThan(1e-9);
      expect(plate.verification.cylindricalFaces).toBe(plate.verification.expectedCylindricalFaces);
    } finally {
      plate.dispose();
    }
  });
});
