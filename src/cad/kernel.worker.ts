/**
 * The kernel in the browser: a module Web Worker reached through comlink. It downloads the wasm
 * itself (streamed, so the page can show bytes / total), starts the kernel once, builds plates
 * (verified, see buildPlate) into display meshes sent back as transferable typed arrays, keeps
 * the last solid by profile so a STEP download does not rebuild, and restarts the kernel from
 * the downloaded bytes when the wasm heap passes a threshold. A build or STEP export that breaks
 * the instance (out of memory, a trap or abort inside the wasm) answers a clear failure
 * (kernel-out-of-memory / kernel-crashed); the instance and its cached solid are dropped at once
 * and the next call starts a fresh kernel from the bytes already downloaded.
 */
import * as Comlink from 'comlink';
import opencascade, { type OpenCascadeInstance } from 'replicad-opencascadejs';
import wasmUrl from 'replicad-opencascadejs/wasm?url';
import type { PlateProfile } from '../domain/profileTypes';
import { PlateCache, profileKey, type PlateVerification, type BuildStrategy } from './buildPlate';
import { fatalKernelError, isPlateBuildError } from './errors';
import { exhaustKernelHeap } from './heapLimit';
import { cloneMesh, meshTransferables, plateMesh, sizeOfBox, type PlateMesh } from './mesh';
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

export interface KernelBuildFailure {
  readonly ok: false;
  readonly code: string;
  readonly message: string;
  readonly featureIds: readonly string[];
}

/** Restart the kernel past this much wasm heap (the build keeps ≈ 0.3 MB per plate). */
const RECYCLE_ABOVE_BYTES = 768 * 1024 * 1024;

let wasmBytes: Uint8Array | null = null;
let oc: OpenCascadeInstance | null = null;
let starting: Promise<OpenCascadeInstance> | null = null;
let restarts = 0;
let fatalFailures = 0;
let lastFatal: string | null = null;
const cache = new PlateCache();
/** the display mesh of the cached solid: the same profile is meshed once */
let lastMesh: { oc: OpenCascadeInstance; key: string; mesh: PlateMesh } | null = null;

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
    const bytes = await download(onProgress);
    onProgress?.({ phase: 'starting' });
    const instance = await opencascade({
      wasmBinary: bytes,
      locateFile: () => wasmUrl,
      print: () => {},
      printErr: () => {},
    });
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
        const made = plateMesh(k, plate.shape, { sizeMm: sizeOfBox(plate.verification.bbox) });
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
