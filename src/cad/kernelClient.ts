/**
 * Browser side of the kernel worker: one worker per page, started on first use. `getKernel`
 * resolves once the kernel is ready and reports the download and start-up to every caller's
 * progress callback. Only pages that need the kernel import this module (the wasm is large).
 */
import * as Comlink from 'comlink';
import type { KernelProgress, KernelWorkerApi } from './kernel.worker';

export type { KernelProgress, KernelBuildResult, KernelBuildFailure } from './kernel.worker';
export type KernelApi = Comlink.Remote<KernelWorkerApi>;

/** Size of the wasm when the server compresses it and the total is not known, ≈ 23 MB. */
export const APPROX_WASM_BYTES = 22_980_267;

let worker: Worker | null = null;
let remote: KernelApi | null = null;
let ready: Promise<KernelApi> | null = null;
const listeners = new Set<(p: KernelProgress) => void>();
let last: KernelProgress | null = null;

function emit(p: KernelProgress) {
  last = p;
  for (const l of listeners) l(p);
}

export function getKernel(onProgress?: (p: KernelProgress) => void): Promise<KernelApi> {
  if (onProgress) {
    listeners.add(onProgress);
    if (last) onProgress(last);
  }
  if (!ready) {
    const w = new Worker(new URL('./kernel.worker.ts', import.meta.url), { type: 'module', name: 'platewright-kernel' });
    worker = w;
    remote = Comlink.wrap<KernelWorkerApi>(w);
    const r = remote;
    // a worker script that cannot load or run never answers: say so instead of waiting for ever
    let onError: (ev: ErrorEvent) => void = () => undefined;
    const failed = new Promise<never>((_, reject) => {
      onError = (ev) =>
        reject(
          new Error(
            `The CAD kernel could not start in this browser (${ev.message || 'its worker script did not load'}). ` +
              'Your plate is not affected: check the connection and reload the page to try again.',
          ),
        );
      w.addEventListener('error', onError);
    });
    failed.catch(() => undefined);
    ready = Promise.race([r.init(Comlink.proxy(emit)), failed]).then(
      () => {
        w.removeEventListener('error', onError);
        return r;
      },
      (e: unknown) => {
        w.removeEventListener('error', onError);
        ready = null;
        worker?.terminate();
        worker = null;
        throw e;
      },
    );
  }
  return ready;
}

/** Fraction 0…1 for a progress bar (download is most of the wait; starting shows as 95 %). */
export function progressFraction(p: KernelProgress | null): number {
  if (!p) return 0;
  if (p.phase === 'download') return Math.min(0.9, (p.loadedBytes / (p.totalBytes ?? APPROX_WASM_BYTES)) * 0.9);
  if (p.phase === 'starting' || p.phase === 'restarting') return 0.95;
  return 1;
}

export function stopKernel(): void {
  worker?.terminate();
  worker = null;
  remote = null;
  ready = null;
  last = null;
  listeners.clear();
}
