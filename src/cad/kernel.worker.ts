/**
 * The kernel in the browser: a module Web Worker reached through comlink. It downloads the wasm
 * itself (streamed, so the page can show bytes / total), starts the kernel once, builds plates
 * (verified, see buildPlate) into display meshes sent back as transferable typed arrays, keeps
 * the last solid by profile so a STEP download does not rebuild, and restarts the kernel from
 * the downloaded bytes when the wasm heap passes a threshold. A build or STEP export that breaks
 * the instance (out of memory, a trap or abort inside the wasm) answers a clear failure
 * (kernel-out-of-memory / kernel-crashed); the instance and its cached solid are dropped at once
 * and the next call starts a fresh kernel from the bytes already downloaded.
 *
 * A page may run a second worker of this script beside the first (see kernelClient): it starts
 * from the first one's compiled module (no second download or compile) and only makes display
 * meshes of unverified constructions (`displayMesh`), which the page shows only when the first
 * worker's verified solid of the same profile has the same strategy and signature and the mesh
 * encloses its volume.
 */
import * as Comlink from 'comlink';
import opencascade, { type OpenCascadeInstance } from 'replicad-opencascadejs';
import wasmUrl from 'replicad-opencascadejs/wasm?url';
import type { PlateProfile } from '../domain/profileTypes';
import { constructForDisplay, measureBoundingBox, measureVolumeMm3, PlateCache, profileKey, shapeSignature, type PlateVerification, type BuildStrategy } from './buildPlate';
import { fatalKernelError, isPlateBuildError } from './errors';
import { exhaustKernelHeap } from './heapLimit';
import { plateMeshFast } from './fastMesh';
import { cloneMesh, meshTransferables, sizeOfBox, type PlateMesh } from './mesh';
import type { ShapeSignature } from './signature';
import { plateStep, type StepMeta } from './step';
import { KERNEL_VERSION } from './version';

export type KernelProgress =
  | { readonly phase: 'download'; readonly loadedBytes: number; readonly totalBytes: number | null }
  | { readonly phase: 'starting' }
  | { readonly phase: 'ready'; readonly ms: number }
  | { readonly phase: 'restarting' };

export interface KernelBuildResult {
  readonly ok: true;
  readonly mesh: PlateMesh;
  readonly strategy: BuildStrategy;
  readonly verification: PlateVerification;
  readonly cached: boolean;
  readonly buildMs: number;
  readonly meshMs: number;
  readonly heapBytes: number;
}

/** The verified solid without a mesh (`verify`): what the page compares a display mesh with. */
export interface KernelVerifyResult {
  readonly ok: true;
  readonly strategy: BuildStrategy;
  readonly verification: PlateVerification;
  readonly signature: ShapeSignature;
  readonly cached: boolean;
  readonly buildMs: number;
  readonly heapBytes: number;
}

/** A display mesh of the first-choice construction, NOT verified (`displayMesh`). */
export interface KernelDisplayMesh {
  readonly ok: true;
  readonly mesh: PlateMesh;
  readonly strategy: BuildStrategy;
  readonly signature: ShapeSignature;
  /** this solid's measured volume and its relative difference from the drawing's */
  readonly volumeMm3: number;
  readonly volumeRelErr: number;
  readonly cached: boolean;
  readonly buildMs: number;
  readonly meshMs: number;
}

export interface KernelBuildFailure {
  readonly ok: false;
  readonly code: string;
  readonly message: string;
  readonly featureIds: readonly string[];
}

/** Restart the kernel past this much wasm heap (the build keeps ≈ 0.3 MB per plate). */
const RECYCLE_ABOVE_BYTES = 768 * 1024 * 1024;

let wasmBytes: Uint8Array | null = null;
let wasmModule: WebAssembly.Module | null = null;
let oc: OpenCascadeInstance | null = null;
let starting: Promise<OpenCascadeInstance> | null = null;
let restarts = 0;
let fatalFailures = 0;
let lastFatal: string | null = null;
const cache = new PlateCache();
/** the display mesh of the cached solid: the same profile is meshed once */
let lastMesh: { oc: OpenCascadeInstance; key: string; mesh: PlateMesh } | null = null;
/** the last display mesh of an unverified construction (`displayMesh`), by profile */
let lastDisplay: { oc: OpenCascadeInstance; key: string; result: KernelDisplayMesh } | null = null;

async function download(onProgress?: (p: KernelProgress) => void): Promise<Uint8Array> {
  if (wasmBytes) return wasmBytes;
  const res = await fetch(wasmUrl);
  if (!res.ok || !res.body) throw new Error(`The CAD kernel could not be downloaded (HTTP ${res.status}).`);
  // a compressed response reports its compressed length: then the total is unknown
  const length = Number(res.headers.get('content-length'));
  const total = res.headers.get('content-encoding') || !Number.isFinite(length) || length <= 0 ? null : length;
  const reader = res.body.getReader();
  const parts: Uint8Array[] = [];
  let loaded = 0;
  onProgress?.({ phase: 'download', loadedBytes: 0, totalBytes: total });
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    parts.push(value);
    loaded += value.byteLength;
    onProgress?.({ phase: 'download', loadedBytes: loaded, totalBytes: total });
  }
  const bytes = new Uint8Array(loaded);
  let at = 0;
  for (const p of parts) {
    bytes.set(p, at);
    at += p.byteLength;
  }
  wasmBytes = bytes;
  return bytes;
}

async function startKernel(onProgress?: (p: KernelProgress) => void): Promise<OpenCascadeInstance> {
  if (oc) return oc;
  starting ??= (async () => {
    const t0 = performance.now();
    if (!wasmModule) {
      const bytes = await download(onProgress);
      onProgress?.({ phase: 'starting' });
      wasmModule = await WebAssembly.compile(bytes as Uint8Array<ArrayBuffer>);
    } else onProgress?.({ phase: 'starting' });
    const module = wasmModule;
    const instance = await opencascade({
      // every (re)start instantiates the module compiled once; a second worker gets it posted
      instantiateWasm: (imports: WebAssembly.Imports, done: (i: WebAssembly.Instance, m: WebAssembly.Module) => void) => {
        void WebAssembly.instantiate(module, imports).then((i) => done(i, module));
        return {};
      },
      locateFile: () => wasmUrl,
      print: () => {},
      printErr: () => {},
    } as Parameters<typeof opencascade>[0]);
    oc = instance;
    starting = null;
    onProgress?.({ phase: 'ready', ms: performance.now() - t0 });
    return instance;
  })().catch((e) => {
    starting = null;
    throw e;
  });
  return starting;
}

function heapBytes(k: OpenCascadeInstance): number {
  return k.wasmMemory.buffer.byteLength;
}

/** After a job: past the threshold, drop the instance and its cached solid; the next job restarts it. */
function maybeRecycle(onProgress?: (p: KernelProgress) => void) {
  if (oc && heapBytes(oc) > RECYCLE_ABOVE_BYTES) discard(onProgress);
}

/** Drops the instance and everything made with it; the next job starts a fresh one. */
function discard(onProgress?: (p: KernelProgress) => void) {
  cache.clear();
  lastMesh = null;
  lastDisplay = null;
  oc = null;
  restarts++;
  onProgress?.({ phase: 'restarting' });
}

/** When `e` broke the instance `k`: discard it and give the user-facing error, else null. */
function fatal(k: OpenCascadeInstance, e: unknown, during: string) {
  const f = fatalKernelError(k, e, during);
  if (!f) return null;
  fatalFailures++;
  lastFatal = f.message;
  if (oc === k) discard();
  return f;
}

function failure(e: unknown): KernelBuildFailure {
  if (isPlateBuildError(e)) return { ok: false, code: e.code, message: e.message, featureIds: [...e.featureIds] };
  return { ok: false, code: 'kernel', message: e instanceof Error ? e.message : String(e), featureIds: [] };
}

const api = {
  /** Starts the kernel (downloading it first); resolves when it is ready. */
  async init(onProgress?: (p: KernelProgress) => void): Promise<{ kernelVersion: string; heapBytes: number }> {
    const k = await startKernel(onProgress);
    return { kernelVersion: KERNEL_VERSION, heapBytes: heapBytes(k) };
  },

  /** Builds (or reuses) the plate and returns its display mesh; a failed build returns the user-facing reason. */
  async build(profile: PlateProfile): Promise<KernelBuildResult | KernelBuildFailure> {
    const k = await startKernel();
    try {
      const t0 = performance.now();
      const { plate, hit } = cache.get(k, profile);
      const t1 = performance.now();
      const key = profileKey(profile);
      let mesh: PlateMesh;
      if (hit && lastMesh && lastMesh.oc === k && lastMesh.key === key) {
        mesh = cloneMesh(lastMesh.mesh);
      } else {
        const made = plateMeshFast(k, plate.shape, { sizeMm: sizeOfBox(plate.verification.bbox), box: plate.verification.bbox });
        lastMesh = { oc: k, key, mesh: made };
        mesh = cloneMesh(made);
      }
      const t2 = performance.now();
      const result: KernelBuildResult = {
        ok: true,
        mesh,
        strategy: plate.strategy,
        verification: plate.verification,
        cached: hit,
        buildMs: t1 - t0,
        meshMs: t2 - t1,
        heapBytes: heapBytes(k),
      };
      return Comlink.transfer(result, meshTransferables(mesh));
    } catch (e) {
      return failure(fatal(k, e, 'building the plate') ?? e);
    } finally {
      maybeRecycle();
    }
  },

  /** The compiled kernel module, for a second worker on the same page (starts the kernel first). */
  async compiledModule(): Promise<WebAssembly.Module> {
    await startKernel();
    return wasmModule!;
  },

  /** Starts this worker's kernel from a module compiled by another worker of the page. */
  async initFromModule(module: WebAssembly.Module): Promise<{ kernelVersion: string; heapBytes: number }> {
    wasmModule ??= module;
    const k = await startKernel();
    return { kernelVersion: KERNEL_VERSION, heapBytes: heapBytes(k) };
  },

  /**
   * Builds (or reuses) the solid and verifies it without meshing it, all but its volume: the twin
   * made beside it by `displayMesh` has its volume measured, and the page joins the two by their
   * signature. The kept solid has its volume measured before anything else uses it (PlateCache).
   */
  async verify(profile: PlateProfile): Promise<KernelVerifyResult | KernelBuildFailure> {
    const k = await startKernel();
    try {
      const t0 = performance.now();
      const { plate, hit } = cache.get(k, profile, { deferVolume: true });
      const signature = shapeSignature(k, plate.shape, plate.verification.bbox);
      return {
        ok: true,
        strategy: plate.strategy,
        verification: plate.verification,
        signature,
        cached: hit,
        buildMs: performance.now() - t0,
        heapBytes: heapBytes(k),
      };
    } catch (e) {
      return failure(fatal(k, e, 'building the plate') ?? e);
    } finally {
      maybeRecycle();
    }
  },

  /**
   * The display mesh of the construction buildPlate tries first, made WITHOUT verifying the solid
   * (the page runs `verify` on the same profile in the other worker at the same time, and shows
   * this mesh only when strategy and signature agree). The solid is not kept.
   */
  async displayMesh(profile: PlateProfile): Promise<KernelDisplayMesh | KernelBuildFailure> {
    const k = await startKernel();
    const key = profileKey(profile);
    try {
      if (lastDisplay && lastDisplay.oc === k && lastDisplay.key === key) {
        const r = { ...lastDisplay.result, mesh: cloneMesh(lastDisplay.result.mesh), cached: true };
        return Comlink.transfer(r, meshTransferables(r.mesh));
      }
      const t0 = performance.now();
      const { shape, strategy, analyticVolumeMm3 } = constructForDisplay(k, profile);
      try {
        const bbox = measureBoundingBox(k, shape);
        const signature = shapeSignature(k, shape, bbox);
        const volumeMm3 = measureVolumeMm3(k, shape);
        const volumeRelErr = Math.abs(volumeMm3 - analyticVolumeMm3) / analyticVolumeMm3;
        const t1 = performance.now();
        const made = plateMeshFast(k, shape, { sizeMm: sizeOfBox(bbox), box: bbox });
        const t2 = performance.now();
        const result: KernelDisplayMesh = { ok: true, mesh: made, strategy, signature, volumeMm3, volumeRelErr, cached: false, buildMs: t1 - t0, meshMs: t2 - t1 };
        lastDisplay = { oc: k, key, result };
        const sent = { ...result, mesh: cloneMesh(made) };
        return Comlink.transfer(sent, meshTransferables(sent.mesh));
      } finally {
        shape.delete();
      }
    } catch (e) {
      return failure(fatal(k, e, 'meshing the plate') ?? e);
    } finally {
      maybeRecycle();
    }
  },

  /** STEP bytes of the plate (built once per profile, reused from the cache). */
  async step(profile: PlateProfile, meta: StepMeta): Promise<Uint8Array> {
    const k = await startKernel();
    try {
      const { plate } = cache.get(k, profile);
      const bytes = plateStep(k, plate.shape, meta);
      return Comlink.transfer(bytes, [bytes.buffer as ArrayBuffer]);
    } catch (e) {
      const f = fatal(k, e, 'making the STEP file');
      if (f) throw new Error(f.message);
      throw e;
    } finally {
      maybeRecycle();
    }
  },

  async status(): Promise<{
    started: boolean;
    heapBytes: number | null;
    restarts: number;
    kernelVersion: string;
    fatalFailures: number;
    lastFatal: string | null;
  }> {
    return { started: oc !== null, heapBytes: oc ? heapBytes(oc) : null, restarts, kernelVersion: KERNEL_VERSION, fatalFailures, lastFatal };
  },

  /**
   * Test hook: caps the running kernel's heap where it is and fills it, so the next build runs
   * out of memory the way a long-lived page's kernel would. The failure then recovers as any other.
   */
  async exhaustHeapForTest(): Promise<{ heapBytes: number; takenBytes: number }> {
    const k = await startKernel();
    return exhaustKernelHeap(k);
  },
};

export type KernelWorkerApi = typeof api;

Comlink.expose(api);
