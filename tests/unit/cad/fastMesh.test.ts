/**
 * Plate faces triangulated from the kernel's own edge discretisation (src/cad/fastMesh.ts),
 * against the kernel's mesher on the same solids: the same boundary points, so the same triangle
 * count (a polygon of V corners and H holes always gives V + 2H − 2 triangles without inner points,
 * a property of planar triangulations) and the same enclosed volume. Hand values where noted.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildPlate } from '../../../src/cad/buildPlate';
import { chainLoops, plateMeshFast, triangulateLoops, type FastMeshReport } from '../../../src/cad/fastMesh';
import type { OC } from '../../../src/cad/kernel.node.ts';
import { plateMesh, sizeOfBox, type PlateMesh } from '../../../src/cad/mesh';
import { meshVolumeMm3 } from '../../../src/cad/signature';
import { plateProfile } from '../../../src/domain/profile';
import type { PlateProfile } from '../../../src/domain/profileTypes';
import { plateSpecSchema } from '../../../src/domain/spec';
import { referencePlate, simplePlate, twoHolePlate } from '../../fixtures/profiles';
import { startTestKernel } from './kernelForTests';

let oc: OC;
beforeAll(async () => {
  oc = await startTestKernel();
});

const allTemplates = readdirSync('templates/plates')
  .filter((f) => f.endsWith('.json'))
  .map((f) => [f, plateProfile(plateSpecSchema.parse(JSON.parse(readFileSync(`templates/plates/${f}`, 'utf8'))))] as const);
/** the blank template has fewer than four openings per face: the kernel meshes it all */
const templates = allTemplates.filter(([f]) => f !== 'blank.json');
const blank = allTemplates.find(([f]) => f === 'blank.json')![1];

const segmentLength = (e: Float32Array) => {
  let s = 0;
  for (let i = 0; i < e.length; i += 6) s += Math.hypot(e[i + 3]! - e[i]!, e[i + 4]! - e[i + 1]!, e[i + 5]! - e[i + 2]!);
  return s;
};

function bothMeshes(profile: PlateProfile): { usual: PlateMesh; fast: PlateMesh; report: FastMeshReport; volume: number } {
  const plate = buildPlate(oc, profile);
  try {
    const b = plate.verification.bbox;
    const usual = plateMesh(oc, plate.shape, { sizeMm: sizeOfBox(b) });
    let report: FastMeshReport | null = null;
    const fast = plateMeshFast(oc, plate.shape, { sizeMm: sizeOfBox(b), box: b, report: (r) => (report = r) });
    return { usual, fast, report: report!, volume: plate.verification.volumeMm3 };
  } finally {
    plate.dispose();
  }
}

describe('plate faces triangulated from their boundary', () => {
  it.each([['the reference plate', referencePlate] as const, ['the simple plate', simplePlate] as const, ...templates])(
    '%s: both plate faces done here; same triangle count, volume and edges as the kernel mesher',
    (_name, profile) => {
      const { usual, fast, report, volume } = bothMeshes(profile);
      expect(report).toEqual({ facesTriangulatedHere: 2, fallback: null });
      expect(fast.indices.length).toBe(usual.indices.length);
      const vu = meshVolumeMm3(usual.positions, usual.indices);
      const vf = meshVolumeMm3(fast.positions, fast.indices);
      expect(Math.abs(vf - vu) / vu).toBeLessThan(1e-6);
      // the chords lose a little of every hole: within 3 % of the solid's volume
      expect(Math.abs(vf - volume) / volume).toBeLessThan(0.03);
      expect(fast.edges.length).toBe(usual.edges.length);
      expect(segmentLength(fast.edges)).toBeCloseTo(segmentLength(usual.edges), 3);
      // every index names a vertex; the two appended faces face down (z = 0) and up (z = thickness)
      const nv = fast.positions.length / 3;
      expect(Math.max(...fast.indices)).toBeLessThan(nv);
      const groups = fast.faceGroups;
      const last2 = [groups.length - 6, groups.length - 3];
      const ups = last2.map((g) => {
        const first = groups[g]!;
        const n = groups[g + 1]!;
        let sign = 0;
        for (let t = first; t < first + n; t += 3) {
          const [a, b, c] = [fast.indices[t]!, fast.indices[t + 1]!, fast.indices[t + 2]!];
          const p = fast.positions;
          const cross = (p[3 * b]! - p[3 * a]!) * (p[3 * c + 1]! - p[3 * a + 1]!) - (p[3 * b + 1]! - p[3 * a + 1]!) * (p[3 * c]! - p[3 * a]!);
          const s = Math.sign(cross);
          if (s !== 0 && sign !== 0) expect(s).toBe(sign);
          if (s !== 0) sign = s;
          expect(fast.normals[3 * a + 2]).toBe(sign);
        }
        return sign;
      });
      expect(ups.sort()).toEqual([-1, 1]);
    },
  );

  it('the blank template (few openings) is meshed by the kernel alone', () => {
    const { usual, fast, report } = bothMeshes(blank);
    expect(report.facesTriangulatedHere).toBe(0);
    expect(Buffer.from(fast.indices.buffer).equals(Buffer.from(usual.indices.buffer))).toBe(true);
  });

  it('a plate with few holes per face is meshed by the kernel alone, exactly as before', () => {
    // two holes 30 mm apart: three wires per plate face
    const fewHoles = twoHolePlate(30);
    const { usual, fast, report } = bothMeshes(fewHoles);
    expect(report.facesTriangulatedHere).toBe(0);
    expect(report.fallback).toMatch(/no many-hole plate face/);
    expect(Buffer.from(fast.positions.buffer).equals(Buffer.from(usual.positions.buffer))).toBe(true);
    expect(Buffer.from(fast.indices.buffer).equals(Buffer.from(usual.indices.buffer))).toBe(true);
  });
});

describe('loops and triangles (hand values)', () => {
  // a 4 × 4 square with a 2 × 2 square hole in the middle: area 16 − 4 = 12
  const outer = [0, 0, 4, 0, 4, 4, 0, 4];
  const hole = [1, 1, 3, 1, 3, 3, 1, 3];

  it('chains pieces given in any order and either direction into closed loops', () => {
    const xy = [...outer, ...hole];
    const pieces: [number, number][] = [[1, 0], [6, 7], [2, 3], [4, 5], [3, 0], [7, 4], [1, 2], [5, 6]];
    const loops = chainLoops(xy, pieces)!;
    expect(loops).toHaveLength(2);
    expect(loops.map((l) => l.length / 2).sort()).toEqual([4, 4]);
  });

  it('merges points by their coordinates (the same corner from two faces)', () => {
    // corner (4, 0) appears twice, as points 1 and 4
    const xy = [0, 0, 4, 0, 4, 4, 0, 4, 4, 0];
    const loops = chainLoops(xy, [[0, 1], [4, 2], [2, 3], [3, 0]])!;
    expect(loops).toHaveLength(1);
    expect(loops[0]!.length / 2).toBe(4);
  });

  it('refuses pieces that do not close', () => {
    expect(chainLoops(outer, [[0, 1], [1, 2], [2, 3]])).toBeNull();
    // a point with three pieces
    expect(chainLoops([...outer, 2, 2], [[0, 1], [1, 2], [2, 3], [3, 0], [0, 4]])).toBeNull();
  });

  it('triangulates the square with a hole: 8 triangles (V + 2H − 2 = 8 + 2 − 2), area 12, wound for the side', () => {
    for (const up of [1, -1] as const) {
      const t = triangulateLoops([hole, outer], up)!;
      expect(t.triangles.length / 3).toBe(8);
      let area = 0;
      for (let i = 0; i < t.triangles.length; i += 3) {
        const [a, b, c] = [t.triangles[i]!, t.triangles[i + 1]!, t.triangles[i + 2]!];
        const cross = (t.xy[2 * b]! - t.xy[2 * a]!) * (t.xy[2 * c + 1]! - t.xy[2 * a + 1]!) - (t.xy[2 * b + 1]! - t.xy[2 * a + 1]!) * (t.xy[2 * c]! - t.xy[2 * a]!);
        expect(Math.sign(cross)).toBe(up);
        area += Math.abs(cross) / 2;
      }
      expect(area).toBeCloseTo(12, 12);
    }
  });

  it('refuses loops that cross (earcut cannot cover the area)', () => {
    // a hole poking out of the outer loop
    expect(triangulateLoops([outer, [3, 1, 6, 1, 6, 3, 3, 3]], 1)).toBeNull();
  });
});
