// The message a shard task receives and the views a worker rebuilds from it (cached per run).
import type { StepScalars } from "../core/pull-step-csr";
import { instantiateStep } from "./wasm-step";

export type FaultKind = "throw" | "exit-worker" | "hang";

/** A typed-array window into shared memory: the array is new Float64Array/Uint32Array(buffer, byteOffset, length). */
export interface SharedSlice {
  buffer: SharedArrayBuffer;
  byteOffset: number;
  length: number;
}

/** Shared state of one run: graph arrays, the two iterates and the two contribution vectors, block sums. */
export interface RunBuffers {
  /** Set when every slice lives in this memory and the wasm kernel runs the steps. */
  memory: WebAssembly.Memory | null;
  /** The compiled wasm kernel (with memory): worker threads instantiate it instead of reading and compiling the file. */
  module: WebAssembly.Module | null;
  inOffsets: SharedSlice;
  sources: SharedSlice;
  weights: SharedSlice | null;
  outWeight: SharedSlice;
  tel: SharedSlice | null;
  x: [SharedSlice, SharedSlice];
  c: [SharedSlice, SharedSlice];
  blockSums: SharedSlice;
}

/**
 * One step for one shard: reads x[cur], c[cur]; writes x[1 − cur], c[1 − cur] on [start, end) and its block sums.
 * A pure function of (shard, x_k, scalars): rerunning it writes the same bits.
 */
export interface ShardTask {
  runId: string;
  buffers: RunBuffers;
  /** started[shard] = attempt id once a worker begins the task: deadlines count running time, not queueing. */
  started: SharedArrayBuffer;
  shard: number;
  attempt: number;
  start: number;
  end: number;
  cur: 0 | 1;
  scalars: StepScalars;
  blockNodes: number;
  fault?: FaultKind;
}

export interface ShardDone {
  threadId: number;
  /** Time inside the kernel, for shard timings. */
  kernelMs: number;
}

export interface RunViews {
  inOffsets: Uint32Array;
  sources: Uint32Array;
  weights: Float64Array | null;
  outWeight: Float64Array;
  tel: Float64Array | null;
  x: [Float64Array, Float64Array];
  c: [Float64Array, Float64Array];
  blockSums: Float64Array;
}

export interface CachedRun {
  views: RunViews;
  wasm: ReturnType<typeof instantiateStep> | null;
}

const f64 = (s: SharedSlice) => new Float64Array(s.buffer, s.byteOffset, s.length);
const u32 = (s: SharedSlice) => new Uint32Array(s.buffer, s.byteOffset, s.length);

export function runViews(b: RunBuffers): RunViews {
  return {
    inOffsets: u32(b.inOffsets),
    sources: u32(b.sources),
    weights: b.weights && f64(b.weights),
    outWeight: f64(b.outWeight),
    tel: b.tel && f64(b.tel),
    x: [f64(b.x[0]), f64(b.x[1])],
    c: [f64(b.c[0]), f64(b.c[1])],
    blockSums: f64(b.blockSums),
  };
}

const cache = new Map<string, CachedRun>();
const CACHED_RUNS = 4;

/** Views (and the wasm instance) for a run, built once per worker and run: the buffers of a run never change. */
export function cachedRun(runId: string, b: RunBuffers): CachedRun {
  let v = cache.get(runId);
  if (v === undefined) {
    v = { views: runViews(b), wasm: b.memory && instantiateStep(b.memory, b.module ?? undefined) };
    cache.set(runId, v);
    if (cache.size > CACHED_RUNS) cache.delete(cache.keys().next().value as string);
  }
  return v;
}

export function sliceOf(a: Float64Array | Uint32Array): SharedSlice {
  if (!(a.buffer instanceof SharedArrayBuffer)) throw new RangeError("array must live in a SharedArrayBuffer");
  return { buffer: a.buffer, byteOffset: a.byteOffset, length: a.length };
}
