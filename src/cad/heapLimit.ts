/**
 * Driving a kernel instance out of memory on purpose, for the recovery tests (Node and the
 * browser worker). The heap gets a ceiling (growing the wasm memory past it fails, as it does when
 * a browser or the machine refuses more memory) and is then filled with allocations until the
 * allocator gives up. The instance is unusable afterwards: the code under test must discard it.
 */
import type { OpenCascadeInstance } from 'replicad-opencascadejs';

type Raw = {
  wasmMemory: WebAssembly.Memory;
  ___libc_malloc?: (n: number) => number;
  _malloc?: (n: number) => number;
};

/** Growing the instance's memory past maxBytes fails from now on (the allocator then returns null). */
export function limitKernelHeap(oc: OpenCascadeInstance, maxBytes: number): void {
  const mem = (oc as unknown as Raw).wasmMemory;
  const grow = WebAssembly.Memory.prototype.grow;
  Object.defineProperty(mem, 'grow', {
    configurable: true,
    value(pages: number) {
      if (mem.buffer.byteLength + pages * 65536 > maxBytes) {
        throw new RangeError('WebAssembly.Memory.grow(): Maximum memory size exceeded');
      }
      return grow.call(mem, pages);
    },
  });
}

/**
 * Caps the heap at its present size plus `headroomBytes` and allocates until nothing is left.
 * Returns the heap size and how many bytes were taken.
 */
export function exhaustKernelHeap(oc: OpenCascadeInstance, headroomBytes = 0): { heapBytes: number; takenBytes: number } {
  const raw = oc as unknown as Raw;
  const malloc = raw._malloc ?? raw.___libc_malloc;
  if (!malloc) throw new Error('this kernel build exposes no allocator');
  limitKernelHeap(oc, raw.wasmMemory.buffer.byteLength + headroomBytes);
  let taken = 0;
  for (let size = 16 * 1024 * 1024; size >= 16; ) {
    if (malloc(size)) taken += size;
    else size >>>= 1;
  }
  return { heapBytes: raw.wasmMemory.buffer.byteLength, takenBytes: taken };
}
