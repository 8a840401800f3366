/**
 * The kernel in the browser: a module Web Worker reached through comlink. It downloads the wasm
 * itself (streamed, so the page can show bytes / total), starts the kernel once, builds plates
 * (verified, see buildPlate) into display meshes sent back as transferable typed arrays, keeps
 * the last solid by profile so a STEP download does not rebuild, and restarts the kernel from
 * the downloaded bytes when the wasm heap passes a threshold.
 */
import * as Comlink from 'comlink';
import opencascade, { type OpenCascadeInstance } from 'replicad-opencascadejs';
import wasmUrl from 'replicad-opencascadejs/wasm?url';
import type { PlateProfile } from '../domain/profileTypes';
import { PlateCache, type PlateVerification, type BuildStrategy } from './buildPlate';
import { isPlateBuildError } from './errors';
import { meshTransferables, plateMesh, type PlateMesh } from './mesh';
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
const cache = new PlateCache();

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
  if (oc && heapBytes(oc) > RECYCLE_ABOVE_BYTES) {
    cache.clear();
    oc = null;
    restarts++;
    onProgress?.({ phase: 'restarting' });
  }
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
      const mesh = plateMesh(k, plate.shape);
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
      return failure(e);
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
    } finally {
      maybeRecycle();
    }
  },

  async status(): Promise<{ started: boolean; heapBytes: number | null; restarts: number; kernelVersion: string }> {
    return { started: oc !== null, heapBytes: oc ? heapBytes(oc) : null, restarts, kernelVersion: KERNEL_VERSION };
  },
};

export type KernelWorkerApi = typeof api;

Comlink.expose(api);
