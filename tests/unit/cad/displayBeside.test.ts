/**
 * The display mesh made beside the verified build (second worker): the first-choice construction
 * must be the solid buildPlate verifies — same strategy, same signature, the same mesh — and the
 * comparison must tell another solid apart. Hand values where noted.
 */
import { readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildPlate, completeVolume, constructForDisplay, measureBoundingBox, measureVolumeMm3, PlateCache, shapeSignature } from '../../../src/cad/buildPlate';
import type { OC } from '../../../src/cad/kernel.node.ts';
import { plateMeshFast } from '../../../src/cad/fastMesh';
import { plateMesh, sizeOfBox } from '../../../src/cad/mesh';
import { DISPLAY_VOLUME_TOLERANCE, meshMatchesVolume, meshVolumeMm3, sameSignature, type ShapeSignature } from '../../../src/cad/signature';
import { layoutIsDisjoint } from '../../../src/domain/layout';
import { plateProfile } from '../../../src/domain/profile';
import type { PlateProfile } from '../../../src/domain/profileTypes';
import { plateSpecSchema } from '../../../src/domain/spec';
import { referencePlate, simplePlate, twoHolePlate } from '../../fixtures/profiles';
import { startTestKernel } from './kernelForTests';

let oc: OC;
beforeAll(async () => {
  oc = await startTestKernel();
});

const demo = plateProfile(plateSpecSchema.parse(JSON.parse(readFileSync('templates/plates/demo.json', 'utf8'))));

/** two Ø10 holes 0.5 mm apart: buildable, but closer than the minimum wall (not disjoint) */
const closePair: PlateProfile = twoHolePlate(0.5);

function both(profile: PlateProfile) {
  const verified = buildPlate(oc, profile);
  const display = constructForDisplay(oc, profile);
  return { verified, display };
}

describe('display construction beside the verified build', () => {
  it.each([
    ['the reference plate', referencePlate],
    ['the simple plate', simplePlate],
    ['the demo template', demo],
    ['a layout that is not disjoint', closePair],
  ])('%s: same strategy, same signature, the same mesh as the verified solid', (_name, profile) => {
    const { verified, display } = both(profile);
    try {
      expect(display.strategy).toBe(verified.strategy);
      const vs = shapeSignature(oc, verified.shape, verified.verification.bbox);
      const bbox = measureBoundingBox(oc, display.shape);
      const ds = shapeSignature(oc, display.shape, bbox);
      expect(ds).toEqual(vs);
      expect(sameSignature(ds, vs)).toBe(true);
      // the meshes of the two solids are the same triangles (deterministic construction and mesher)
      // (the worker's mesher: plate faces from their boundary, see fastMesh.test.ts)
      const a = plateMeshFast(oc, verified.shape, { sizeMm: sizeOfBox(verified.verification.bbox), box: verified.verification.bbox });
      const b = plateMeshFast(oc, display.shape, { sizeMm: sizeOfBox(bbox), box: bbox });
      expect(b.indices.length).toBe(a.indices.length);
      expect(Buffer.from(b.positions.buffer).equals(Buffer.from(a.positions.buffer))).toBe(true);
      expect(Buffer.from(b.indices.buffer).equals(Buffer.from(a.indices.buffer))).toBe(true);
      // and the mesh encloses the verified volume, within the chords' loss
      expect(meshMatchesVolume(b, verified.verification.volumeMm3)).toBe(true);
      // the twin's volume (measured beside a build that defers its own) is the verified one
      expect(measureVolumeMm3(oc, display.shape)).toBe(verified.verification.volumeMm3);
      expect(Math.abs(measureVolumeMm3(oc, display.shape) - display.analyticVolumeMm3) / display.analyticVolumeMm3).toBeLessThan(1e-9);
    } finally {
      verified.dispose();
      display.shape.delete();
    }
  });

  it('chooses the one-face construction when the layout is not disjoint, as buildPlate does', () => {
    expect(layoutIsDisjoint(closePair)).toBe(false);
    const d = constructForDisplay(oc, closePair);
    try {
      expect(d.strategy).toBe('oneFace');
    } finally {
      d.shape.delete();
    }
  });

  it('tells another solid apart: a thicker plate has another box, an extra hole other counts', () => {
    const base = constructForDisplay(oc, simplePlate);
    const thicker = constructForDisplay(oc, { ...simplePlate, thicknessMm: simplePlate.thicknessMm + 0.01 });
    const fewer = constructForDisplay(oc, { ...simplePlate, holes: simplePlate.holes.slice(1) });
    try {
      const s = shapeSignature(oc, base.shape);
      expect(sameSignature(s, shapeSignature(oc, thicker.shape))).toBe(false);
      expect(sameSignature(s, shapeSignature(oc, fewer.shape))).toBe(false);
      // the volume test: a mesh matches its own solid's volume, not one 10 % smaller
      const m = plateMesh(oc, fewer.shape);
      const own = meshVolumeMm3(m.positions, m.indices);
      expect(meshMatchesVolume(m, own)).toBe(true);
      expect(meshMatchesVolume(m, own * 0.9)).toBe(false);
    } finally {
      base.shape.delete();
      thicker.shape.delete();
      fewer.shape.delete();
    }
  });

  it('throws the layout errors buildPlate throws', () => {
    const broken = { ...simplePlate, holes: [...simplePlate.holes, { ...simplePlate.holes[0]!, id: 'X9', center: { x: 500, y: 0 } }] };
    expect(() => buildPlate(oc, broken)).toThrow();
    expect(() => constructForDisplay(oc, broken)).toThrow();
  });
});

describe('a build that defers its volume', () => {
  it('is valid with its faces, volume pending; completing it gives the full build\'s volume', () => {
    const full = buildPlate(oc, referencePlate);
    const deferred = buildPlate(oc, referencePlate, { deferVolume: true });
    try {
      expect(deferred.volumePending).toBe(true);
      expect(full.volumePending).toBe(false);
      expect(deferred.verification.valid).toBe(true);
      expect(deferred.verification.cylindricalFaces).toBe(full.verification.cylindricalFaces);
      expect(Number.isNaN(deferred.verification.volumeMm3)).toBe(true);
      const done = completeVolume(oc, deferred)!;
      expect(done.volumePending).toBe(false);
      expect(done.verification.volumeMm3).toBe(full.verification.volumeMm3);
      expect(done.verification.volumeRelErr).toBeLessThan(1e-9);
      // a plate whose drawing says another volume is refused
      const wrong = { ...deferred, verification: { ...deferred.verification, analyticVolumeMm3: deferred.verification.analyticVolumeMm3 * 1.001 } };
      expect(completeVolume(oc, wrong)).toBeNull();
    } finally {
      full.dispose();
      deferred.dispose();
    }
  });

  it('the cache hands out a deferred plate for the 3D view and completes it for anything else', () => {
    const cache = new PlateCache();
    try {
      const a = cache.get(oc, simplePlate, { deferVolume: true });
      expect(a.hit).toBe(false);
      expect(a.plate.volumePending).toBe(true);
      expect(cache.get(oc, simplePlate, { deferVolume: true }).plate.volumePending).toBe(true);
      const b = cache.get(oc, simplePlate);
      expect(b.hit).toBe(true);
      expect(b.plate.volumePending).toBe(false);
      expect(b.plate.verification.volumeRelErr).toBeLessThan(1e-9);
      // once complete it stays complete, also for the 3D view
      expect(cache.get(oc, simplePlate, { deferVolume: true }).plate.volumePending).toBe(false);
    } finally {
      cache.clear();
    }
  });
});

describe('signature and mesh volume (hand values)', () => {
  const sig = (over: Partial<ShapeSignature> = {}, box: Partial<ShapeSignature['bbox']> = {}): ShapeSignature => ({
    faces: 10,
    edges: 24,
    vertices: 16,
    ...over,
    bbox: { minX: -50, minY: -40, minZ: 0, maxX: 50, maxY: 40, maxZ: 10, ...box },
  });

  it('equal counts and a box within 1e-6 mm match; anything else does not', () => {
    expect(sameSignature(sig(), sig({}, { maxX: 50 + 5e-7 }))).toBe(true);
    expect(sameSignature(sig(), sig({}, { maxX: 50 + 2e-6 }))).toBe(false);
    expect(sameSignature(sig(), sig({ faces: 11 }))).toBe(false);
    expect(sameSignature(sig(), sig({ edges: 23 }))).toBe(false);
    expect(sameSignature(sig(), sig({ vertices: 17 }))).toBe(false);
  });

  it('a unit cube of 12 outward triangles encloses 1; reversed winding gives −1', () => {
    // corners 0..7 as (x, y, z) bits
    const positions = new Float32Array([0, 0, 0, 1, 0, 0, 0, 1, 0, 1, 1, 0, 0, 0, 1, 1, 0, 1, 0, 1, 1, 1, 1, 1]);
    const quads = [
      [0, 2, 3, 1], // z = 0, normal −z
      [4, 5, 7, 6], // z = 1, +z
      [0, 1, 5, 4], // y = 0, −y
      [2, 6, 7, 3], // y = 1, +y
      [0, 4, 6, 2], // x = 0, −x
      [1, 3, 7, 5], // x = 1, +x
    ];
    const idx = quads.flatMap(([a, b, c, d]) => [a!, b!, c!, a!, c!, d!]);
    expect(meshVolumeMm3(positions, new Uint32Array(idx))).toBeCloseTo(1, 12);
    const reversed = quads.flatMap(([a, b, c, d]) => [a!, c!, b!, a!, d!, c!]);
    expect(meshVolumeMm3(positions, new Uint32Array(reversed))).toBeCloseTo(-1, 12);
    expect(meshMatchesVolume({ positions, indices: new Uint32Array(idx) }, 1 + DISPLAY_VOLUME_TOLERANCE / 2)).toBe(true);
    expect(meshMatchesVolume({ positions, indices: new Uint32Array(idx) }, 1.1)).toBe(false);
    expect(meshMatchesVolume({ positions, indices: new Uint32Array(idx) }, 0)).toBe(false);
  });
});
