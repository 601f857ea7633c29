// Shared memory for one run: graph arrays (reused when already shared), iterates, contributions and block sums.
import type { Graph } from "../core/graph";
import { BLOCK_NODES } from "../core/graph";
import { BLOCK_SLOTS, combineBlocks } from "../core/pull-step-csr";
import { checkGraph, contributions } from "../core/pull-step";
import { outDegree, teleportVector } from "../core/teleport";
import { sliceOf, type RunBuffers, type RunViews } from "../tasks/rank-shard-task";

export interface RunState {
  n: number;
  blocks: number;
  blockNodes: number;
  kernel: "js" | "wasm";
  buffers: RunBuffers;
  views: RunViews;
  seeded: boolean;
  /** Which of x[0]/x[1] holds the current iterate x_k. */
  cur: 0 | 1;
  /** D_k and Σx_k of the current iterate, from block sums. */
  danglingMass: number;
  mass: number;
}

export interface StateInputs {
  kernel: "js" | "wasm" | "auto";
  weighted: boolean;
  seeds: { node: number; weight: number }[] | null;
  start: Float64Array | null;
}

const WASM_PAGE = 65_536;
const WASM_MAX_PAGES = 65_536;
/** The first page stays unused so that no array sits at byte offset 0 (the kernel's "absent" marker). */
const WASM_BASE = WASM_PAGE;

/** Hands out typed arrays in shared memory: separate SharedArrayBuffers, or one shared WebAssembly.Memory. */
class Arena {
  readonly memory: WebAssembly.Memory | null;
  #at = WASM_BASE;

  constructor(wasmBytes: number | null) {
    this.memory = null;
    if (wasmBytes !== null) {
      const pages = Math.ceil((WASM_BASE + wasmBytes) / WASM_PAGE);
      this.memory = new WebAssembly.Memory({ initial: pages, maximum: pages, shared: true });
    }
  }

  #take(bytes: number): [SharedArrayBuffer, number] {
    if (this.memory === null) return [new SharedArrayBuffer(Math.max(8, bytes)), 0];
    const at = this.#at;
    this.#at += Math.ceil(bytes / 8) * 8;
    return [this.memory.buffer as unknown as SharedArrayBuffer, at];
  }

  f64(length: number): Float64Array {
    const [buf, at] = this.#take(length * 8);
    return new Float64Array(buf, at, length);
  }

  u32(length: number): Uint32Array {
    const [buf, at] = this.#take(length * 4);
    return new Uint32Array(buf, at, length);
  }

  /** `a` itself when it already lives in shared memory this arena can use, else a copy. */
  shareU32(a: Uint32Array): Uint32Array {
    if (this.memory === null && a.buffer instanceof SharedArrayBuffer) return a;
    const s = this.u32(a.length);
    s.set(a);
    return s;
  }

  shareF64(a: Float64Array): Float64Array {
    if (this.memory === null && a.buffer instanceof SharedArrayBuffer) return a;
    const s = this.f64(a.length);
    s.set(a);
    return s;
  }
}

/** Bytes the run needs in one linear memory, or null when it does not fit 32-bit addressing. */
function wasmBytes(n: number, m: number, weighted: boolean, seeded: boolean, blocks: number): number | null {
  const f64s = n * (seeded ? 6 : 5) + (weighted ? m : 0) + blocks * BLOCK_SLOTS;
  const bytes = f64s * 8 + (n + 1 + m) * 4 + 16 * 8;
  return WASM_BASE + bytes <= WASM_MAX_PAGES * WASM_PAGE ? bytes : null;
}

/**
 * Builds the run's shared state with x_0 = start ?? t and c_0, D_0 from the same kernel the steps use, so a run
 * resumed from x_k continues with the bits an uninterrupted run would have had.
 */
export function prepareRunState(graph: Graph, inp: StateInputs): RunState {
  checkGraph(graph);
  const n = graph.n;
  const blockNodes = BLOCK_NODES;
  const blocks = Math.ceil(n / blockNodes);
  const useWeights = inp.weighted && graph.weights !== null;
  const need = inp.kernel === "js" ? null : wasmBytes(n, graph.m, useWeights, inp.seeds !== null, blocks);
  if (inp.kernel === "wasm" && need === null) throw new RangeError(`graph is too large for the wasm kernel. Value: n = ${n}, m = ${graph.m}`);
  const arena = new Arena(need);
  const inOffsets = arena.shareU32(graph.inOffsets);
  const sources = arena.shareU32(graph.sources);
  const weights = useWeights && graph.weights ? arena.shareF64(graph.weights) : null;
  // Unweighted run on a weighted graph: W_u is the out-edge count, not the stored out-weight.
  const outWeight = graph.weights !== null && !useWeights ? outDegree(sources, arena.f64(n)) : arena.shareF64(graph.outWeight);
  const tel = inp.seeds ? arena.shareF64(teleportVector(n, inp.seeds)) : null;
  const x: [Float64Array, Float64Array] = [arena.f64(n), arena.f64(n)];
  const c: [Float64Array, Float64Array] = [arena.f64(n), arena.f64(n)];
  const blockSums = arena.f64(blocks * BLOCK_SLOTS);
  if (inp.start) {
    if (inp.start.length !== n) throw new RangeError(`resumeFrom.x.length must be n = ${n}. Value: ${inp.start.length}`);
    x[0].set(inp.start);
  } else if (tel) {
    x[0].set(tel);
  } else {
    x[0].fill(1 / n);
  }
  contributions({ start: 0, end: n, x: x[0], outWeight, c: c[0], blockSums, blockNodes });
  const sums = combineBlocks(blockSums, blocks);
  const views: RunViews = { inOffsets, sources, weights, outWeight, tel, x, c, blockSums };
  const buffers: RunBuffers = {
    memory: arena.memory,
    inOffsets: sliceOf(inOffsets),
    sources: sliceOf(sources),
    weights: weights && sliceOf(weights),
    outWeight: sliceOf(outWeight),
    tel: tel && sliceOf(tel),
    x: [sliceOf(x[0]), sliceOf(x[1])],
    c: [sliceOf(c[0]), sliceOf(c[1])],
    blockSums: sliceOf(blockSums),
  };
  const kernel = arena.memory ? "wasm" : "js";
  return { n, blocks, blockNodes, kernel, buffers, views, seeded: tel !== null, cur: 0, danglingMass: sums.dangling, mass: sums.sum };
}
