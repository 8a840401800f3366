import { beforeAll, describe, expect, it } from 'vitest';
import { buildPlate } from '../../../src/cad/buildPlate';
import { meshTransferables, plateMesh } from '../../../src/cad/mesh';
import type { OC } from '../../../src/cad/kernel.node.ts';
import { referencePlate } from '../../fixtures/profiles';
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
});
