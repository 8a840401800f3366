import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildPlate, PlateCache } from '../../../src/cad/buildPlate';
import {
  configureKernel,
  heapBytesOf,
  kernelStatus,
  recycleKernel,
  withKernel,
  type OC,
} from '../../../src/cad/kernel.node.ts';
import { KERNEL_PACKAGES } from '../../../src/cad/version';
import { referencePlate, simplePlate } from '../../fixtures/profiles';
import { startTestKernel } from './kernelForTests';
import { readFileSync } from 'node:fs';

let oc: OC;
beforeAll(async () => {
  oc = await startTestKernel();
});
afterAll(() => {
  configureKernel({ recycleAboveBytes: 1024 * 1024 * 1024 });
});

describe('kernel memory', () => {
  it('200 builds in one kernel instance: the heap grows only by the known small per-build leak', () => {
    for (let i = 0; i < 5; i++) buildPlate(oc, referencePlate).dispose();
    const before = heapBytesOf(oc);
    for (let i = 0; i < 200; i++) buildPlate(oc, referencePlate).dispose();
    const perBuildMb = (heapBytesOf(oc) - before) / (1024 * 1024) / 200;
    // this wasm build keeps ≈ 0.3 MB per build even with every object deleted (measured, see
    // STACK.md); a forgotten delete of a solid or a fresh BRepCheck analyser per build costs
    // 1–2 MB per build, which this limit catches
    expect(perBuildMb).toBeLessThan(0.6);
    expect(heapBytesOf(oc)).toBeLessThan(512 * 1024 * 1024);
  });

  it('withKernel serialises jobs and recycles the instance past the threshold', async () => {
    const order: number[] = [];
    const jobs = [1, 2, 3].map((n) =>
      withKernel(async (k) => {
        order.push(n);
        await new Promise((r) => setTimeout(r, 5 * (4 - n)));
        buildPlate(k, simplePlate).dispose();
        order.push(n);
        return n;
      }),
    );
    expect(await Promise.all(jobs)).toEqual([1, 2, 3]);
    expect(order).toEqual([1, 1, 2, 2, 3, 3]);

    const gen = kernelStatus().generation;
    configureKernel({ recycleAboveBytes: 1 }); // any heap is past it
    await withKernel((k) => buildPlate(k, simplePlate).dispose());
    expect(kernelStatus().generation).toBe(gen);
    expect(kernelStatus().started).toBe(false); // dropped after the job
    configureKernel({ recycleAboveBytes: 1024 * 1024 * 1024 });
    const v = await withKernel((k) => {
      const p = buildPlate(k, simplePlate);
      const vol = p.verification.volumeMm3;
      p.dispose();
      return vol;
    });
    expect(kernelStatus().generation).toBe(gen + 1);
    expect(kernelStatus().recycles).toBeGreaterThanOrEqual(1);
    expect(v).toBeGreaterThan(0);
    recycleKernel();
  });

  it('the plate cache rebuilds only when the profile changes', () => {
    const cache = new PlateCache();
    const a = cache.get(oc, simplePlate);
    const b = cache.get(oc, { ...simplePlate });
    expect(a.hit).toBe(false);
    expect(b.hit).toBe(true);
    const c = cache.get(oc, { ...simplePlate, thicknessMm: 12 });
    expect(c.hit).toBe(false);
    expect(c.plate.verification.volumeMm3).toBeGreaterThan(a.plate.verification.volumeMm3);
    cache.clear();
  });

  it('the kernel version names the installed packages', () => {
    const version = (pkg: string) => JSON.parse(readFileSync(`node_modules/${pkg}/package.json`, 'utf8')).version;
    expect(KERNEL_PACKAGES.replicad).toBe(version('replicad'));
    expect(KERNEL_PACKAGES['replicad-opencascadejs']).toBe(version('replicad-opencascadejs'));
  });
});
