/**
 * The kernel on the server: one lazily started instance per Node process, reached only through
 * `withKernel`, which runs one job at a time (the wasm kernel is single-threaded and its objects
 * must never be touched by two jobs at once). The wasm heap only grows and this build leaks a
 * little on every build, so after each job the heap is measured and, past a threshold, the
 * instance is dropped and a fresh one starts on the next job. A job that breaks the instance (out
 * of memory, a trap or abort inside the wasm) answers a PlateBuildError saying so
 * (kernel-out-of-memory / kernel-crashed) and the instance is dropped at once, so the next job
 * runs on a fresh one.
 */
import { createRequire } from 'node:module';
import opencascade, { type OpenCascadeInstance } from 'replicad-opencascadejs';
import { fatalKernelError } from './errors';
import { KERNEL_VERSION } from './version';

export { KERNEL_VERSION as kernelVersion };

export type OC = OpenCascadeInstance;

export interface KernelStatus {
  readonly started: boolean;
  /** 1 for the first instance, +1 for every recycle */
  readonly generation: number;
  readonly heapBytes: number | null;
  readonly jobs: number;
  readonly recycles: number;
  readonly recycleAboveBytes: number;
  /** jobs that broke their instance (out of memory, crash); each one dropped it */
  readonly fatalFailures: number;
  /** the last such failure's message */
  readonly lastFatal: string | null;
}

const DEFAULT_RECYCLE_ABOVE = 1024 * 1024 * 1024; // 1 GiB of wasm heap

let instance: OC | null = null;
let starting: Promise<OC> | null = null;
let generation = 0;
let jobs = 0;
let recycles = 0;
let fatalFailures = 0;
let lastFatal: string | null = null;
let recycleAboveBytes = Number(process.env.PLATEWRIGHT_KERNEL_RECYCLE_MB ?? 0) * 1024 * 1024 || DEFAULT_RECYCLE_ABOVE;
let queue: Promise<unknown> = Promise.resolve();
const recycleListeners = new Set<(old: OC) => void>();

function wasmPath(): string {
  return createRequire(import.meta.url).resolve('replicad-opencascadejs/wasm');
}

/** Starts a fresh kernel instance (about a second). */
export async function startKernelInstance(): Promise<OC> {
  const path = wasmPath();
  return opencascade({ locateFile: () => path, print: () => {}, printErr: () => {} });
}

async function ensureKernel(): Promise<OC> {
  if (instance) return instance;
  if (!starting) {
    starting = startKernelInstance().then(
      (oc) => {
        instance = oc;
        generation++;
        starting = null;
        return oc;
      },
      (e) => {
        starting = null;
        throw new Error(`The CAD kernel could not start: ${e instanceof Error ? e.message : String(e)}`);
      },
    );
  }
  return starting;
}

export function heapBytesOf(oc: OC): number {
  return oc.wasmMemory?.buffer.byteLength ?? (oc as unknown as { HEAPU8?: Uint8Array }).HEAPU8?.buffer.byteLength ?? 0;
}

/** Drops the current instance now; the next job starts a fresh one. */
export function recycleKernel(): void {
  const old = instance;
  if (!old) return;
  instance = null;
  recycles++;
  for (const l of recycleListeners) {
    try {
      l(old);
    } catch {
      /* a listener must not keep the old heap alive */
    }
  }
}

/** Called with the old instance when it is dropped: forget every kernel object made with it. */
export function onKernelRecycle(listener: (old: OC) => void): () => void {
  recycleListeners.add(listener);
  return () => recycleListeners.delete(listener);
}

export function configureKernel(opts: { recycleAboveBytes?: number }): void {
  if (opts.recycleAboveBytes !== undefined) recycleAboveBytes = opts.recycleAboveBytes;
}

/**
 * Runs `job` with the kernel, after every job queued before it. The job must not keep kernel
 * objects beyond its return unless it registers for recycling (see onKernelRecycle).
 */
export function withKernel<T>(job: (oc: OC) => T | Promise<T>): Promise<T> {
  const run = queue.then(async () => {
    const oc = await ensureKernel();
    try {
      return await job(oc);
    } catch (e) {
      const fatal = fatalKernelError(oc, e, 'making the plate files');
      if (!fatal) throw e;
      fatalFailures++;
      lastFatal = fatal.message;
      if (instance === oc) recycleKernel();
      throw fatal;
    } finally {
      jobs++;
      if (instance === oc && heapBytesOf(oc) > recycleAboveBytes) recycleKernel();
    }
  });
  queue = run.catch(() => undefined);
  return run;
}

export function kernelStatus(): KernelStatus {
  return {
    started: instance !== null,
    generation,
    heapBytes: instance ? heapBytesOf(instance) : null,
    jobs,
    recycles,
    recycleAboveBytes,
    fatalFailures,
    lastFatal,
  };
}
