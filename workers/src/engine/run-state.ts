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
  weighted: boolean;
  seeds: { node: number; weight: number }[] | null;
  start: Float64Array | null;
}

function sharedF64(length: number): Float64Array {
  return new Float64Array(new SharedArrayBuffer(Math.max(1, length) * 8), 0, length);
}

function shareU32(a: Uint32Array): Uint32Array {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const s = new Uint32Array(new SharedArrayBuffer(Math.max(1, a.length) * 4), 0, a.length);
  s.set(a);
  return s;
}

function shareF64(a: Float64Array): Float64Array {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const s = sharedF64(a.length);
  s.set(a);
  return s;
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
  const inOffsets = shareU32(graph.inOffsets);
  const sources = shareU32(graph.sources);
  const useWeights = inp.weighted && graph.weights !== null;
  const weights = useWeights && graph.weights ? shareF64(graph.weights) : null;
  // Unweighted run on a weighted graph: W_u is the out-edge count, not the stored out-weight.
  const outWeight = graph.weights !== null && !useWeights ? outDegree(sources, sharedF64(n)) : shareF64(graph.outWeight);
  const tel = inp.seeds ? shareF64(teleportVector(n, inp.seeds)) : null;
  const x: [Float64Array, Float64Array] = [sharedF64(n), sharedF64(n)];
  const c: [Float64Array, Float64Array] = [sharedF64(n), sharedF64(n)];
  const blockSums = sharedF64(blocks * BLOCK_SLOTS);
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
    inOffsets: sliceOf(inOffsets),
    sources: sliceOf(sources),
    weights: weights && sliceOf(weights),
    outWeight: sliceOf(outWeight),
    tel: tel && sliceOf(tel),
    x: [sliceOf(x[0]), sliceOf(x[1])],
    c: [sliceOf(c[0]), sliceOf(c[1])],
    blockSums: sliceOf(blockSums),
  };
  return { n, blocks, blockNodes, buffers, views, seeded: tel !== null, cur: 0, danglingMass: sums.dangling, mass: sums.sum };
}
