/**
 * Browser side of the kernel worker: one worker per page, started on first use. `getKernel`
 * resolves once the kernel is ready and reports the download and start-up to every caller's
 * progress callback. Only pages that need the kernel import this module (the wasm is large).
 *
 * `buildForDisplay` is what a 3D view calls after every edit. With two or more cores it runs a
 * second worker (started from the first one's compiled module after the first build) that
 * constructs, measures the volume of and meshes the same profile while the first builds it and
 * checks its validity and faces. The mesh is shown only when both have the same strategy and
 * signature, the twin's volume matches the drawing and the mesh encloses it; otherwise the first
 * worker's solid is verified in full and meshed itself. Nothing unverified is ever shown; the
 * update takes the longer of the two jobs instead of their sum.
 */
import * as Comlink from 'comlink';
import type { PlateProfile } from '../domain/profileTypes';
import { meshMatchesVolume, sameSignature, VOLUME_REL_TOL } from './signature';
import type { KernelBuildFailure, KernelBuildResult, KernelProgress, KernelWorkerApi } from './kernel.worker';

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

let meshWorker: Worker | null = null;
let mesher: KernelApi | null = null;
let mesherStarting: Promise<void> | null = null;
/** set when the second worker could not start (or the machine has one core): one worker only */
let mesherOff = false;

/** Starts the second worker in the background (once); `mesher` is set when it is ready. */
function startMesher(k: KernelApi): void {
  if (mesher || mesherStarting || mesherOff) return;
  if (typeof navigator !== 'undefined' && (navigator.hardwareConcurrency ?? 1) < 2) {
    mesherOff = true;
    return;
  }
  mesherStarting = (async () => {
    const w = new Worker(new URL('./kernel.worker.ts', import.meta.url), { type: 'module', name: 'platewright-kernel-mesh' });
    meshWorker = w;
    const r = Comlink.wrap<KernelWorkerApi>(w);
    const failed = new Promise<never>((_, reject) => w.addEventListener('error', (ev) => reject(new Error(ev.message || 'mesh worker did not load')), { once: true }));
    failed.catch(() => undefined);
    await Promise.race([k.compiledModule().then((m) => r.initFromModule(m)), failed]);
    if (meshWorker === w) mesher = r;
  })().catch(() => {
    // the view keeps working with the one verified worker (meshing after verifying)
    mesherOff = true;
    meshWorker?.terminate();
    meshWorker = null;
  }).finally(() => {
    mesherStarting = null;
  });
}

/** How one display update was made (the 3D view shows the times). */
export interface DisplayBuild {
  readonly result: KernelBuildResult | KernelBuildFailure;
  /** the mesh came from the second worker, made while the first verified */
  readonly meshedBeside: boolean;
  /** kernel time on the update's critical path: the longer of the two jobs, or their sum */
  readonly kernelCriticalMs: number;
}

/**
 * The verified plate's display mesh for `profile`: in parallel across two workers when the
 * second one is ready (see the module comment), else from the one worker.
 */
export async function buildForDisplay(profile: PlateProfile): Promise<DisplayBuild> {
  const k = await getKernel();
  const m = mesher;
  if (!m) {
    const result = await k.build(profile);
    if (result.ok) startMesher(k);
    return { result, meshedBeside: false, kernelCriticalMs: result.ok ? result.buildMs + result.meshMs : 0 };
  }
  const [v, d] = await Promise.all([
    k.verify(profile),
    m.displayMesh(profile).catch((e: unknown): KernelBuildFailure => ({ ok: false, code: 'kernel', message: String(e), featureIds: [] })),
  ]);
  if (!v.ok) return { result: v, meshedBeside: false, kernelCriticalMs: 0 };
  if (
    d.ok &&
    d.strategy === v.strategy &&
    sameSignature(d.signature, v.signature) &&
    d.volumeRelErr < VOLUME_REL_TOL &&
    meshMatchesVolume(d.mesh, d.volumeMm3)
  ) {
    return {
      result: {
        ok: true,
        mesh: d.mesh,
        strategy: v.strategy,
        // valid and with its faces (the first worker), its volume measured on the twin (the second)
        verification: { ...v.verification, volumeMm3: d.volumeMm3, volumeRelErr: d.volumeRelErr },
        cached: v.cached,
        buildMs: v.buildMs,
        meshMs: d.meshMs,
        heapBytes: v.heapBytes,
      },
      meshedBeside: true,
      kernelCriticalMs: Math.max(v.buildMs, d.buildMs + d.meshMs),
    };
  }
  // a different construction (the first choice failed its verification) or a broken mesh worker:
  // mesh the verified solid itself (the first worker has it cached)
  const result = await k.build(profile);
  return { result, meshedBeside: false, kernelCriticalMs: result.ok ? v.buildMs + result.meshMs : 0 };
}

export function stopKernel(): void {
  worker?.terminate();
  worker = null;
  meshWorker?.terminate();
  meshWorker = null;
  mesher = null;
  mesherOff = false;
  remote = null;
  ready = null;
  last = null;
  listeners.clear();
}
