// Shared memory for one run: graph arrays (reused when already shared), iterates, contributions and block sums.
import type { Graph } from "../core/graph";
import { BLOCK_NODES } from "../core/graph";
import { BLOCK_SLOTS, combineBlocks } from "../core/pull-step-csr";
import { checkGraph, contributions } from "../core/pull-step";
import { outDegree, teleportVector } from "../core/teleport";
import { sharedF64, sharedU32 } from "../graph-store/shared";
import { graphBytes, runBytes, SharedHeap, type HeapLoan } from "../core/shared-heap";
import { assemblyModule } from "../tasks/assembly";
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
  /** The in-lists keep merged duplicates as repeated sources (Graph.mergedEdges). */
  repeats: boolean;
  /** Prefix sums of distinct in-list sources, when the graph has them (see Graph.distinctInOffsets). */
  distinctInOffsets: Uint32Array | null;
  /** Gives borrowed heap space back; the views must not be used after. */
  release(): void;
}

export interface StateInputs {
  kernel: "js" | "wasm" | "auto";
  weighted: boolean;
  seeds: { node: number; weight: number }[] | null;
  start: Float64Array | null;
}

/** Hands out typed arrays in shared memory: separate SharedArrayBuffers, or one shared heap the wasm kernel reads. */
class Arena {
  constructor(readonly heap: SharedHeap | null) {}

  f64(length: number): Float64Array {
    return this.heap ? this.heap.f64(length) : sharedF64(length);
  }

  u32(length: number): Uint32Array {
    return this.heap ? this.heap.u32(length) : sharedU32(length);
  }

  /** `a` itself when it already lives where this arena's arrays live, else a copy. */
  shareU32(a: Uint32Array): Uint32Array {
    if (this.#holds(a)) return a;
    const s = this.u32(a.length);
    s.set(a);
    return s;
  }

  shareF64(a: Float64Array): Float64Array {
    if (this.#holds(a)) return a;
    const s = this.f64(a.length);
    s.set(a);
    return s;
  }

  #holds(a: Float64Array | Uint32Array): boolean {
    return this.heap ? a.buffer === this.heap.buffer : a.buffer instanceof SharedArrayBuffer;
  }
}

/**
 * Where the run's arrays go: the graph's own heap when it has one and no other run holds it (no copy), else a new heap
 * sized for graph and run (the graph is copied in), else (js kernel, or too big for 32-bit addressing) plain buffers.
 */
function runMemory(
  graph: Graph,
  kernel: StateInputs["kernel"],
  useWeights: boolean,
  distinct: boolean,
): { heap: SharedHeap | null; loan: HeapLoan | null } {
  if (kernel === "js") return { heap: null, loan: null };
  const n = graph.n;
  const loan = !distinct && graph.heap && graph.heap.free >= runBytes(n) ? graph.heap.lend() : null;
  if (loan) return { heap: loan.heap, loan };
  const m = distinct ? (graph.mergedEdges as number) : graph.m;
  const heap = SharedHeap.create(graphBytes(n, m, useWeights) + runBytes(n));
  if (kernel === "wasm" && heap === null) throw new RangeError(`graph is too large for the wasm kernel. Value: n = ${n}, m = ${graph.m}`);
  return { heap, loan: null };
}

/** In-lists with each repeated source listed once. */
function distinctArcs(graph: Graph, arena: Arena): { inOffsets: Uint32Array; sources: Uint32Array } {
  const { n, inOffsets: from, sources: src } = graph;
  const inOffsets = arena.u32(n + 1);
  const sources = arena.u32(graph.mergedEdges as number);
  let wr = 0;
  for (let v = 0; v < n; v++) {
    inOffsets[v] = wr;
    for (let e = from[v], end = from[v + 1]; e < end; e++) if (e === from[v] || src[e] !== src[e - 1]) sources[wr++] = src[e];
  }
  if (wr !== sources.length) throw new RangeError(`graph.mergedEdges must be the distinct edge count ${wr}. Value: ${sources.length}`);
  inOffsets[n] = wr;
  return { inOffsets, sources };
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
  // Unweighted run on a graph keeping merged duplicates as repeated sources: each edge once, from a copy.
  const distinct = !inp.weighted && graph.mergedEdges !== undefined;
  // Everything that can refuse the inputs runs before a loan is taken, so a refusal never keeps the heap lent.
  if (inp.start && inp.start.length !== n) throw new RangeError(`resumeFrom.x.length must be n = ${n}. Value: ${inp.start.length}`);
  const teleport = inp.seeds ? teleportVector(n, inp.seeds) : null;
  const { heap, loan } = runMemory(graph, inp.kernel, useWeights, distinct);
  try {
    return buildState(graph, inp, n, blocks, blockNodes, useWeights, distinct, teleport, heap, loan);
  } catch (error) {
    loan?.release();
    throw error;
  }
}

function buildState(
  graph: Graph,
  inp: StateInputs,
  n: number,
  blocks: number,
  blockNodes: number,
  useWeights: boolean,
  distinct: boolean,
  teleport: Float64Array | null,
  heap: SharedHeap | null,
  loan: HeapLoan | null,
): RunState {
  const arena = new Arena(heap);
  const { inOffsets, sources } = distinct
    ? distinctArcs(graph, arena)
    : { inOffsets: arena.shareU32(graph.inOffsets), sources: arena.shareU32(graph.sources) };
  const weights = useWeights && graph.weights ? arena.shareF64(graph.weights) : null;
  // Unweighted run on a weighted graph: W_u is the out-edge count, not the stored out-weight.
  const outWeight = (graph.weights !== null && !useWeights) || distinct ? outDegree(sources, arena.f64(n)) : arena.shareF64(graph.outWeight);
  const tel = teleport ? arena.shareF64(teleport) : null;
  const x: [Float64Array, Float64Array] = [arena.f64(n), arena.f64(n)];
  const c: [Float64Array, Float64Array] = [arena.f64(n), arena.f64(n)];
  const blockSums = arena.f64(blocks * BLOCK_SLOTS);
  if (inp.start) {
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
    memory: heap ? heap.memory : null,
    // Compiled here, once; worker threads get it from the task (see RunBuffers).
    module: heap ? assemblyModule("pull-step") : null,
    inOffsets: sliceOf(inOffsets),
    sources: sliceOf(sources),
    weights: weights && sliceOf(weights),
    outWeight: sliceOf(outWeight),
    tel: tel && sliceOf(tel),
    x: [sliceOf(x[0]), sliceOf(x[1])],
    c: [sliceOf(c[0]), sliceOf(c[1])],
    blockSums: sliceOf(blockSums),
  };
  const kernel = heap ? "wasm" : "js";
  return {
    n,
    blocks,
    blockNodes,
    kernel,
    buffers,
    views,
    seeded: tel !== null,
    cur: 0,
    danglingMass: sums.dangling,
    mass: sums.sum,
    repeats: graph.mergedEdges !== undefined && !distinct,
    distinctInOffsets: graph.distinctInOffsets ?? null,
    release: () => loan?.release(),
  };
}
