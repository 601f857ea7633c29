// Typed arrays on SharedArrayBuffers: the iteration hands them to worker threads without copying.

/** Below this, copying a graph into a run's memory costs less than reserving a heap for it. */
export const HEAP_MIN_BYTES = 8 << 20;

export function sharedU32(length: number): Uint32Array {
  return new Uint32Array(new SharedArrayBuffer(Math.max(1, length) * 4), 0, length);
}

export function sharedF64(length: number): Float64Array {
  return new Float64Array(new SharedArrayBuffer(Math.max(1, length) * 8), 0, length);
}

export function isShared(a: ArrayBufferView): boolean {
  return a.buffer instanceof SharedArrayBuffer;
}
