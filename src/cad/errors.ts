/**
 * The one error type the CAD side throws at a user: a stable code and a message that says what
 * to change, naming the feature id where there is one. Never a bare kernel number.
 */
export class PlateBuildError extends Error {
  readonly code: string;
  readonly featureIds: readonly string[];

  constructor(code: string, message: string, featureIds: readonly string[] = []) {
    super(message);
    this.name = 'PlateBuildError';
    this.code = code;
    this.featureIds = featureIds;
  }
}

export function isPlateBuildError(e: unknown): e is PlateBuildError {
  return e instanceof PlateBuildError;
}

/**
 * Turns whatever the kernel threw (a WebAssembly.Exception, a raw pointer number, an Error) into
 * readable text: the kernel's own exception type and message where it can be decoded.
 */
export function describeKernelFailure(oc: unknown, e: unknown): string {
  const k = oc as {
    getExceptionMessage?: (ex: unknown) => [string, string];
    OCJS?: { getStandard_FailureData?: (p: number) => { GetMessageString?: () => string } };
  };
  try {
    // decoding allocates: on an exhausted heap it would abort the whole instance
    if (isWasmException(e) && kernelHeapExhausted(oc)) return 'out of memory (the kernel heap is exhausted)';
    if (typeof WebAssembly !== 'undefined' && 'Exception' in WebAssembly && e instanceof (WebAssembly as unknown as { Exception: new (...a: never[]) => object }).Exception) {
      const [type, message] = k.getExceptionMessage?.(e) ?? ['kernel exception', ''];
      return message ? `${type}: ${message}` : type;
    }
    if (typeof e === 'number') {
      const data = k.OCJS?.getStandard_FailureData?.(e);
      const msg = data?.GetMessageString?.();
      return msg ? `kernel failure: ${msg}` : `kernel failure (code ${e})`;
    }
  } catch {
    /* decoding is best effort */
  }
  if (e instanceof Error) return e.message;
  return String(e);
}

/** PlateBuildError codes meaning the kernel instance itself failed: it must be discarded. */
export const KERNEL_OUT_OF_MEMORY = 'kernel-out-of-memory';
export const KERNEL_CRASHED = 'kernel-crashed';

export type KernelFailureKind = 'geometry' | 'out-of-memory' | 'crashed';

/** Bytes the heap probe asks for: a heap that cannot give this much cannot finish a build either. */
const PROBE_BYTES = 1024 * 1024;

type KernelRaw = {
  ___libc_malloc?: (n: number) => number;
  ___libc_free?: (p: number) => void;
  _malloc?: (n: number) => number;
  _free?: (p: number) => void;
  wasmMemory?: WebAssembly.Memory;
};

/** True when the kernel's heap cannot hand out PROBE_BYTES any more (best effort; false when it cannot tell). */
export function kernelHeapExhausted(oc: unknown): boolean {
  const k = oc as KernelRaw;
  const malloc = k._malloc ?? k.___libc_malloc;
  const free = k._free ?? k.___libc_free;
  if (!malloc || !free) return false;
  try {
    const p = malloc(PROBE_BYTES);
    if (!p) return true;
    free(p);
    return false;
  } catch {
    return true;
  }
}

function isWasmException(e: unknown): boolean {
  return (
    typeof WebAssembly !== 'undefined' &&
    'Exception' in WebAssembly &&
    e instanceof (WebAssembly as unknown as { Exception: new (...a: never[]) => object }).Exception
  );
}

/** The classification from the error alone; never decodes an exception on an exhausted heap
 * (decoding allocates, and an allocation failing there aborts the whole instance). */
function classifyRaw(oc: unknown, e: unknown): { kind: KernelFailureKind; detail: string } {
  if (e instanceof PlateBuildError) {
    const kind = e.code === KERNEL_OUT_OF_MEMORY ? 'out-of-memory' : e.code === KERNEL_CRASHED ? 'crashed' : 'geometry';
    return { kind, detail: e.message };
  }
  if (typeof WebAssembly !== 'undefined' && e instanceof WebAssembly.RuntimeError) {
    const detail = e.message;
    return { kind: /OOM|out of memory|Cannot enlarge memory/i.test(detail) ? 'out-of-memory' : 'crashed', detail };
  }
  if (e instanceof RangeError) {
    if (/Maximum call stack/i.test(e.message)) return { kind: 'crashed', detail: e.message };
    if (/allocation failed|out of memory|Memory\.grow|Invalid typed array length|Array buffer/i.test(e.message)) {
      return { kind: 'out-of-memory', detail: e.message };
    }
  }
  if (isWasmException(e)) {
    if (kernelHeapExhausted(oc)) return { kind: 'out-of-memory', detail: 'the kernel heap is exhausted' };
    const k = oc as { getExceptionMessage?: (ex: unknown) => [string, string] };
    let decoded: [string, string] | undefined;
    try {
      decoded = k.getExceptionMessage?.(e);
    } catch (d) {
      return { kind: 'crashed', detail: `the kernel could not decode its own exception (${d instanceof Error ? d.message : String(d)})` };
    }
    const [type, message] = decoded ?? ['kernel exception', ''];
    const detail = message ? `${type}: ${message}` : type;
    if (/bad_alloc|OutOfMemory|out of memory/i.test(detail)) return { kind: 'out-of-memory', detail };
    return { kind: 'geometry', detail };
  }
  return { kind: 'geometry', detail: describeKernelFailure(oc, e) };
}

/**
 * What kind of failure the kernel threw: 'geometry' (a kernel exception about the shape — the
 * instance is fine), 'out-of-memory' (the heap is exhausted or an allocation failed) or 'crashed'
 * (a trap or abort inside the wasm: memory access out of bounds, unreachable, stack overflow).
 * The last two leave the instance unusable. On an exhausted heap even throwing a kernel exception
 * fails (it overflows the stack or aborts), so a crash on an exhausted heap counts as out of memory.
 */
export function classifyKernelFailure(oc: unknown, e: unknown): { kind: KernelFailureKind; detail: string } {
  const c = classifyRaw(oc, e);
  if (c.kind === 'crashed' && !(e instanceof PlateBuildError) && kernelHeapExhausted(oc)) {
    return { kind: 'out-of-memory', detail: `${c.detail}; the kernel heap is exhausted` };
  }
  return c;
}

/**
 * The user-facing error for a failure that broke the kernel instance, or null when the failure
 * leaves the instance usable. `during` says what was being done ("building the plate").
 */
export function fatalKernelError(oc: unknown, e: unknown, during: string): PlateBuildError | null {
  if (e instanceof PlateBuildError) return e.code === KERNEL_OUT_OF_MEMORY || e.code === KERNEL_CRASHED ? e : null;
  const { kind, detail } = classifyKernelFailure(oc, e);
  if (kind === 'geometry') return null;
  const heap = (oc as KernelRaw)?.wasmMemory?.buffer.byteLength;
  const heapText = heap ? `; kernel memory ${Math.round(heap / 1048576)} MB` : '';
  const what =
    kind === 'out-of-memory'
      ? `The CAD kernel ran out of memory while ${during}`
      : `The CAD kernel failed internally while ${during}`;
  return new PlateBuildError(
    kind === 'out-of-memory' ? KERNEL_OUT_OF_MEMORY : KERNEL_CRASHED,
    `${what}, so nothing was shown or exported and nothing saved was changed. ` +
      `The kernel is restarted for the next build: try again. ` +
      `If it fails again on this plate, reload the page or retry the download later, and report the plate's part number. ` +
      `(Kernel detail: ${detail}${heapText}.)`,
  );
}

/** True for an error that means the kernel instance must be discarded (see fatalKernelError). */
export function isFatalKernelError(e: unknown): boolean {
  return e instanceof PlateBuildError && (e.code === KERNEL_OUT_OF_MEMORY || e.code === KERNEL_CRASHED);
}
