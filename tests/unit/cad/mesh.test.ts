import { beforeAll, describe, expect, it } from 'vitest';
import { buildPlate } from '../../../src/cad/buildPlate';
import { displayToleranceMm, meshTransferables, plateMesh, plateSizeMm } from '../../../src/cad/mesh';
import type { OC } from '../../../src/cad/kernel.node.ts';
import { referencePlate, simplePlate } from '../../fixtures/profiles';
import { startTestKernel } from './kernelForTests';

let oc: OC;
beforeAll(async () => {
  oc = await startTestKernel();
});

describe('display mesh', () => {
  it('is typed arrays spanning the plate, with unit normals and valid indices', () => {
    const plate = buildPlate(oc, referencePlate);
    try {
      const m = plateMesh(oc, plate.shape);
      expect(m.positions).toBeInstanceOf(Float32Array);
      expect(m.indices).toBeInstanceOf(Uint32Array);
      expect(m.positions.length % 3).toBe(0);
      expect(m.normals.length).toBe(m.positions.length);
      expect(m.indices.length % 3).toBe(0);
      const nv = m.positions.length / 3;
      let maxIndex = 0;
      for (const i of m.indices) maxIndex = Math.max(maxIndex, i);
      expect(maxIndex).toBeLessThan(nv);
      for (let i = 0; i < m.normals.length; i += 3) {
        expect(Math.hypot(m.normals[i]!, m.normals[i + 1]!, m.normals[i + 2]!)).toBeCloseTo(1, 4);
      }
      let minX = Infinity, maxX = -Infinity, minZ = Infinity, maxZ = -Infinity;
      for (let i = 0; i < m.positions.length; i += 3) {
        minX = Math.min(minX, m.positions[i]!);
        maxX = Math.max(maxX, m.positions[i]!);
        minZ = Math.min(minZ, m.positions[i + 2]!);
        maxZ = Math.max(maxZ, m.positions[i + 2]!);
      }
      expect(minX).toBeCloseTo(-160, 3);
      expect(maxX).toBeCloseTo(160, 3);
      expect(minZ).toBeCloseTo(0, 4);
      expect(maxZ).toBeCloseTo(12.7, 4);
      // edges are segment pairs; one face group per B-rep face
      expect(m.edges.length % 6).toBe(0);
      expect(m.edges.length).toBeGreaterThan(0);
      expect(m.faceGroups.length % 3).toBe(0);
      expect(meshTransferables(m)).toHaveLength(5);
    } finally {
      plate.dispose();
    }
  });

  it('display deflection follows the plate size: larger side / 1600, within 0.05 … 0.5 mm (hand values)', () => {
    expect(displayToleranceMm(320)).toBeCloseTo(0.2, 12);
    expect(displayToleranceMm(200)).toBeCloseTo(0.125, 12);
    expect(displayToleranceMm(40)).toBe(0.05);
    expect(displayToleranceMm(2000)).toBe(0.5);
    expect(displayToleranceMm(Number.NaN)).toBe(0.05);
  });

  it('holes stay round: every rim has at least the sides the angular and chordal deflections ask for', () => {
    const plate = buildPlate(oc, simplePlate);
    try {
      const size = plateSizeMm(oc, plate.shape);
      expect(size).toBeGreaterThanOrEqual(200 - 1e-6); // a box from the geometry, perhaps padded a little
      expect(size).toBeLessThan(200.5);
      const tol = displayToleranceMm(size);
      const m = plateMesh(oc, plate.shape);
      // rim vertices on the transmission face (z = 10) of a hole: distinct angles around its centre
      const rimSides = (cx: number, cy: number, r: number) => {
        const angles = new Set<number>();
        for (let i = 0; i < m.positions.length; i += 3) {
          const x = m.positions[i]! - cx, y = m.positions[i + 1]! - cy, z = m.positions[i + 2]!;
          if (Math.abs(z - 10) < 1e-4 && Math.abs(Math.hypot(x, y) - r) < 1e-3) angles.add(Math.round(Math.atan2(y, x) * 1e4));
        }
        return angles.size;
      };
      // sides needed: the angular limit 2π / 0.3 → 21, and the sagitta rule: a chord of angle θ on
      // radius r is off the arc by r(1 − cos(θ/2)) ≤ tol (plane geometry)
      const needed = (r: number) => Math.max(Math.ceil((2 * Math.PI) / 0.3), Math.ceil((2 * Math.PI) / (2 * Math.acos(1 - tol / r))));
      expect(needed(5)).toBe(21);
      expect(rimSides(-80, 55, 5)).toBeGreaterThanOrEqual(needed(5)); // E2, Ø10 through
      expect(rimSides(0, 0, 30)).toBeGreaterThanOrEqual(needed(30)); // C1, Ø60 centre bore
      expect(needed(30)).toBeGreaterThan(21); // the chordal limit governs the large bore
    } finally {
      plate.dispose();
    }
  });
});
