/**
 * Kernel failures and recovery on the server kernel (withKernel): a plate that passes the schema
 * but cannot be built answers a message naming what to change and the instance carries on; a
 * heap driven to exhaustion and a trap inside the wasm answer a clear error, the instance is
 * dropped, and the next build on a fresh instance succeeds and verifies against a hand volume.
 */
import { readFileSync } from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { buildPlate } from '../../../src/cad/buildPlate';
import {
  classifyKernelFailure,
  isFatalKernelError,
  KERNEL_CRASHED,
  KERNEL_OUT_OF_MEMORY,
  PlateBuildError,
} from '../../../src/cad/errors';
import { exhaustKernelHeap } from '../../../src/cad/heapLimit';
import { kernelStatus, recycleKernel, withKernel, type OC } from '../../../src/cad/kernel.node.ts';
import { plateMesh } from '../../../src/cad/mesh';
import { plateProfile } from '../../../src/domain/profile';
import { plateSpecSchema } from '../../../src/domain/spec';
import { handle } from '../../../src/server/errors';
import { simplePlate } from '../../fixtures/profiles';

const PI = Math.PI;
// simplePlate by hand: 200 × 150 × 10 mm, R15 corners (rounded-rectangle area w·h − (4 − π)·r²);
// Ø60 bore, 4 × Ø10 through, E1 counterbore Ø16 × 5, T1 blind Ø8.5 × 6
const HAND_VOLUME =
  (200 * 150 - (4 - PI) * 15 ** 2) * 10 - PI * 30 ** 2 * 10 - 4 * PI * 5 ** 2 * 10 - PI * (8 ** 2 - 5 ** 2) * 5 - PI * 4.25 ** 2 * 6;

/** A good build on the server kernel, verified against the hand volume; returns the instance generation. */
async function goodBuild(): Promise<number> {
  const volume = await withKernel((oc) => {
    const p = buildPlate(oc, simplePlate);
    try {
      expect(p.verification.valid).toBe(true);
      expect(plateMesh(oc, p.shape).indices.length).toBeGreaterThan(0);
      return p.verification.volumeMm3;
    } finally {
      p.dispose();
    }
  });
  expect(Math.abs(volume - HAND_VOLUME) / HAND_VOLUME).toBeLessThan(1e-9);
  return kernelStatus().generation;
}

async function failure(job: (oc: OC) => unknown): Promise<PlateBuildError> {
  let err: unknown;
  try {
    await withKernel(job);
  } catch (e) {
    err = e;
  }
  expect(err).toBeInstanceOf(PlateBuildError);
  return err as PlateBuildError;
}

afterAll(() => recycleKernel());

describe('server kernel: failures answer clear errors and the kernel recovers', () => {
  it('a spec that passes the schema but cannot be built: the message names the pocket, the same instance builds on', async () => {
    const generation = await goodBuild();
    const demo = JSON.parse(readFileSync('templates/plates/demo.json', 'utf8'));
    // a 1 mm edge margin is a valid spec, but the starter pocket then reaches through the outline
    const spec = plateSpecSchema.parse({ ...demo, outline: { ...demo.outline, edgeMarginMm: 1 } });
    const profile = plateProfile(spec);
    const err = await failure((oc) => buildPlate(oc, profile));
    expect(err.code).toBe('pocket-outline-break');
    expect(err.message).toBe('Pocket P1 breaks through the plate outline (or its edge chamfer): move it inward.');
    expect(err.featureIds).toEqual(['P1']);
    expect(isFatalKernelError(err)).toBe(false);
    expect(kernelStatus().started).toBe(true); // a geometry error does not cost the instance
    expect(await goodBuild()).toBe(generation);
  });

  it('the heap driven to exhaustion: "ran out of memory", the instance is dropped, the next build succeeds on a fresh one', async () => {
    const generation = await goodBuild();
    const before = kernelStatus();
    let heap = 0;
    const err = await failure((oc) => {
      heap = exhaustKernelHeap(oc).heapBytes;
      return buildPlate(oc, simplePlate);
    });
    expect(heap).toBeGreaterThan(0);
    expect(err.code).toBe(KERNEL_OUT_OF_MEMORY);
    expect(err.message).toMatch(/^The CAD kernel ran out of memory while building the plate, so nothing was shown or exported/);
    expect(err.message).toMatch(/restarted for the next build: try again/);
    expect(err.message).toMatch(/kernel memory \d+ MB/);
    expect(err.message).not.toMatch(/\[object|^\d+$/);
    const after = kernelStatus();
    expect(after.started).toBe(false);
    expect(after.fatalFailures).toBe(before.fatalFailures + 1);
    expect(after.recycles).toBe(before.recycles + 1);
    expect(after.lastFatal).toBe(err.message);
    expect(await goodBuild()).toBe(generation + 1);
  });

  it('a trap inside the wasm (memory access out of bounds) during a job: "failed internally", recovered the same way', async () => {
    const generation = await goodBuild();
    const err = await failure((oc) => {
      // freeing a pointer far past the heap makes the allocator read outside the wasm memory
      (oc as unknown as { ___libc_free(p: number): void }).___libc_free(0x7ffffff0);
      return buildPlate(oc, simplePlate);
    });
    expect(err.code).toBe(KERNEL_CRASHED);
    expect(err.message).toMatch(/^The CAD kernel failed internally while making the plate files/);
    expect(err.message).toMatch(/Kernel detail: memory access out of bounds/);
    expect(kernelStatus().started).toBe(false);
    expect(await goodBuild()).toBe(generation + 1);
  });

  it('on an exhausted heap the kernel exception is classified without decoding it (decoding would abort the instance)', async () => {
    await withKernel((oc) => {
      // a geometry exception on a healthy heap is decoded and is not fatal
      let caught: unknown;
      try {
        new oc.gp_Dir(0, 0, 0);
      } catch (e) {
        caught = e;
      }
      expect(classifyKernelFailure(oc, caught)).toEqual({ kind: 'geometry', detail: 'Standard_ConstructionError: gp_Dir() - input vector has zero norm' });
      exhaustKernelHeap(oc);
      let oom: unknown;
      try {
        new oc.gp_Pnt(1, 2, 3);
      } catch (e) {
        oom = e;
      }
      // on an exhausted heap even raising the kernel's exception fails (here: the stack overflows)
      expect(oom).toBeDefined();
      const c = classifyKernelFailure(oc, oom);
      expect(c.kind).toBe('out-of-memory');
      expect(c.detail).toMatch(/the kernel heap is exhausted$/);
      throw oom;
    }).catch((e) => expect((e as PlateBuildError).code).toBe(KERNEL_OUT_OF_MEMORY));
    expect(kernelStatus().started).toBe(false);
    await goodBuild();
  });

  it('over HTTP (the download routes answer through handle): 422 naming the feature for bad geometry, 503 for a broken kernel, then 200', async () => {
    const demo = JSON.parse(readFileSync('templates/plates/demo.json', 'utf8'));
    const bad = plateProfile(plateSpecSchema.parse({ ...demo, outline: { ...demo.outline, edgeMarginMm: 1 } }));
    const r1 = await handle(() => withKernel((oc) => (buildPlate(oc, bad), new Response('built'))));
    expect(r1.status).toBe(422);
    expect(await r1.json()).toEqual({
      error: { code: 'plate_not_buildable', message: 'Pocket P1 breaks through the plate outline (or its edge chamfer): move it inward.', featureIds: ['P1'] },
    });
    const r2 = await handle(() =>
      withKernel((oc) => {
        exhaustKernelHeap(oc);
        buildPlate(oc, simplePlate).dispose();
        return new Response('built');
      }),
    );
    expect(r2.status).toBe(503);
    const body = (await r2.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe('kernel_unavailable');
    expect(body.error.message).toMatch(/^The CAD kernel ran out of memory while building the plate/);
    const r3 = await handle(() => withKernel((oc) => (buildPlate(oc, simplePlate).dispose(), new Response('built'))));
    expect(r3.status).toBe(200);
    expect(await r3.text()).toBe('built');
  });
});
