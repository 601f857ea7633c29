// One shared WebAssembly.Memory that holds a graph's arrays and, lent out, one run's arrays at a time. The WebAssembly
// step kernel, the JS kernel and every worker thread then address the same bytes: nothing is copied between build,
// load and iteration. Memory is reserved for the whole capacity up front; pages cost RAM only once touched.

import { BLOCK_NODES } from "./graph";
import { BLOCK_SLOTS } from "./pull-step-csr";

export const WASM_PAGE = 65_536;
/** 32-bit addressing: a linear memory holds at most 2^16 pages. */
export const WASM_MAX_PAGES = 65_536;
/** The first page stays unused so that no array sits at byte offset 0 (the kernel's "absent" marker). */
const BASE = WASM_PAGE;
/** Arrays start on cache lines. */
const ALIGN = 64;

/** Bytes one run needs beside the graph: x_k, x_{k+1}, c_k, c_{k+1}, teleport, unit out-weights, block sums. */
export function runBytes(n: number): number {
  const blocks = Math.ceil(n / BLOCK_NODES);
  return 6 * (n * 8 + ALIGN) + blocks * BLOCK_SLOTS * 8 + ALIGN;
}

/** Bytes of a graph's arrays: inOffsets, sources, optional weights, outWeight (aligned as the heap lays them out). */
export function graphBytes(n: number, m: number, weighted: boolean): number {
  return (n + 1) * 4 + m * 4 + (weighted ? m * 8 : 0) + n * 8 + 4 * ALIGN;
}

export class SharedHeap {
  readonly memory: WebAssembly.Memory;
  readonly capacity: number;
  #top = BASE;
  #lent: number | null = null;
  /** End of the space earlier loans wrote to: only that much needs zeroing for the next one. */
  #dirtyEnd = 0;

  private constructor(capacity: number) {
    const pages = Math.ceil((BASE + capacity) / WASM_PAGE);
    this.memory = new WebAssembly.Memory({ initial: pages, maximum: pages, shared: true });
    this.capacity = pages * WASM_PAGE;
  }

  /** A heap of `bytes` usable bytes, or null when that does not fit one 32-bit linear memory. */
  static create(bytes: number): SharedHeap | null {
    if (!(bytes >= 0) || BASE + bytes > WASM_MAX_PAGES * WASM_PAGE) return null;
    try {
      return new SharedHeap(bytes);
    } catch {
      // The address space for linear memories ran out (many live heaps): the caller falls back to plain buffers.
      return null;
    }
  }

  get buffer(): SharedArrayBuffer {
    return this.memory.buffer as unknown as SharedArrayBuffer;
  }

  /** End of the space written so far (the graph's arrays and every loan's): pages below it are in memory. */
  get writtenEnd(): number {
    return Math.max(this.#dirtyEnd, this.#top);
  }

  /** Bytes still free. */
  get free(): number {
    return this.capacity - this.#top;
  }

  u32(length: number): Uint32Array {
    return new Uint32Array(this.buffer, this.#take(length * 4), length);
  }

  f64(length: number): Float64Array {
    return new Float64Array(this.buffer, this.#take(length * 8), length);
  }

  /**
   * Lend the free space to one run: its arrays are carved after the graph's and given back by release(), zeroed on
   * the next loan. Null while another run holds the loan (that run's caller copies into memory of its own instead).
   */
  lend(): HeapLoan | null {
    if (this.#lent !== null) return null;
    const mark = this.#top;
    this.#lent = mark;
    // Zero what earlier loans wrote, not the whole reserve: untouched pages are zero and cost no memory.
    if (this.#dirtyEnd > mark) new Uint8Array(this.buffer, mark, this.#dirtyEnd - mark).fill(0);
    return {
      heap: this,
      release: () => {
        if (this.#lent !== mark) return;
        this.#dirtyEnd = Math.max(this.#dirtyEnd, this.#top);
        this.#top = mark;
        this.#lent = null;
      },
    };
  }

  #take(bytes: number): number {
    const at = this.#top;
    const next = at + Math.ceil(bytes / ALIGN) * ALIGN;
    if (next > this.capacity) throw new RangeError(`shared heap exhausted: ${bytes} bytes asked, ${this.free} free`);
    this.#top = next;
    return at;
  }
}

export interface HeapLoan {
  heap: SharedHeap;
  release(): void;
}
