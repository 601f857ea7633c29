// The iteration driver: power iteration over a piscina pool, shared memory, layout-independent global sums.
import { availableParallelism } from "node:os";
import type { Graph } from "../core/graph";
import { combineBlocks } from "../core/pull-step-csr";
import { countMergedEdges, mergedEdgesFromPrefix, planShards, rebalanceShards, type ShardRange } from "../core/shard-plan";
import { stepScalars } from "../core/teleport";
import { RankPool, type ShardPool } from "./rank-pool";
import { prepareRunState, type RunState } from "./run-state";
import { DEFAULT_RETRY, runShard, type FaultPlan, type RetryPolicy, type ShardState } from "./shard-attempts";

export { RankPool, type ShardPool } from "./rank-pool";
export type { FaultPlan, RetryPolicy, ShardState } from "./shard-attempts";

export interface RankParams {
  damping: number;
  tolerance: number;
  maxIterations: number;
  dangling: "teleport" | "uniform";
  teleport: { kind: "uniform" } | { kind: "seeds"; seeds: { node: number; weight: number }[] };
  weighted: boolean;
  /** Threads of the pool rank() creates when none is passed (default: available cores); ignored with opts.pool. */
  threads?: number;
  /** Target ranges per step (default: the pool's threads); any count gives the same bits. */
  shards?: number;
}

/** Progress after the step that produced x_k: residual = ‖x_k − x_{k−1}‖₁, danglingMass = D_k. */
export interface IterationProgress {
  k: number;
  residual: number;
  danglingMass: number;
  elapsedMs: number;
  shards: ShardState[];
}

export interface RankHooks {
  signal?: AbortSignal;
  onIteration?(p: IterationProgress): void | Promise<void>;
  checkpointEvery?: number;
  onCheckpoint?(k: number, x: Float64Array): void | Promise<void>;
  /** Continue from a saved iterate x_k; iteration numbers (and maxIterations) continue from k. */
  resumeFrom?: { k: number; x: Float64Array };
  retry?: RetryPolicy;
  faults?: FaultPlan[];
  /** Step kernel; "auto" (default) takes WebAssembly when the run fits one 32-bit memory. Same bits either way. */
  kernel?: KernelKind;
}

export type KernelKind = "js" | "wasm" | "auto";

export interface RankResult {
  scores: Float64Array;
  iterations: number;
  residual: number;
  errorBound: number;
  converged: boolean;
  stopReason: "converged" | "iteration-cap" | "canceled" | "failed" | "needs-attention";
  /** residuals[i] and danglingMass[i] belong to iteration (first k of this call) + i. */
  residuals: number[];
  danglingMass: number[];
  /** perIterationMs is the mean over this call's steps, medianIterationMs their median (the first step also faults in
   *  the new iterate's pages). */
  timings: { setupMs: number; iterateMs: number; perIterationMs: number; medianIterationMs: number };
  /** The step kernel that ran. */
  kernel?: "js" | "wasm";
  failure?: { shard: number; attempts: number; lastError: string };
}

/** Largest |Σx − 1| tolerated: rounding stays orders of magnitude below; a leak of mass does not. */
export const MASS_DRIFT_LIMIT = 1e-8;

/** The step (of one call) after which the shard plan may move towards equal kernel times (measured over steps 2-4). */
const REBALANCE_AFTER = 4;

let runCounter = 0;

function checkParams(p: RankParams, hooks: RankHooks): void {
  const bad = (name: string, v: unknown, why: string) => new RangeError(`${name} ${why}. Value: ${String(v)}`);
  if (!(p.damping >= 0 && p.damping < 1)) throw bad("damping", p.damping, "must be in [0, 1)");
  if (!(p.tolerance >= 0 && p.tolerance < Infinity)) throw bad("tolerance", p.tolerance, "must be finite and ≥ 0");
  if (!Number.isInteger(p.maxIterations) || p.maxIterations < 0) {
    throw bad("maxIterations", p.maxIterations, "must be an integer ≥ 0");
  }
  if (p.dangling !== "teleport" && p.dangling !== "uniform") throw bad("dangling", p.dangling, "must be teleport or uniform");
  for (const key of ["threads", "shards"] as const) {
    const v = p[key];
    if (v !== undefined && (!Number.isInteger(v) || v < 1)) throw bad(key, v, "must be a positive integer");
  }
  const r = hooks.retry;
  if (r && (!Number.isInteger(r.attempts) || r.attempts < 1)) throw bad("retry.attempts", r.attempts, "must be ≥ 1");
  const every = hooks.checkpointEvery;
  if (every !== undefined && (!Number.isInteger(every) || every < 1)) throw bad("checkpointEvery", every, "must be ≥ 1");
  const from = hooks.resumeFrom;
  if (from && (!Number.isInteger(from.k) || from.k < 0)) throw bad("resumeFrom.k", from.k, "must be an integer ≥ 0");
}

/**
 * Power iteration x_{k+1} = α(P^T x_k + D_k·d) + (1−α)t from x_0 = t (or resumeFrom.x), until ‖x_{k+1} − x_k‖₁ <
 * tolerance or k = maxIterations. Bit-identical for any thread count, shard count and scheduling.
 * @example const r = await rank(graph, { damping: 0.85, tolerance: 1e-9, maxIterations: 200, dangling: "teleport", teleport: { kind: "uniform" }, weighted: false })
 */
export async function rank(graph: Graph, params: RankParams, opts: { pool?: ShardPool } & RankHooks = {}): Promise<RankResult> {
  const t0 = performance.now();
  checkParams(params, opts);
  if (graph.n === 0) throw new RangeError("graph.n must be ≥ 1. Value: 0");
  const ownPool = opts.pool ? null : new RankPool({ threads: params.threads ?? availableParallelism() });
  const pool: ShardPool = opts.pool ?? (ownPool as RankPool);
  try {
    return await iterate(graph, params, opts, pool, t0);
  } finally {
    await ownPool?.close();
  }
}

async function iterate(graph: Graph, params: RankParams, hooks: RankHooks, pool: ShardPool, t0: number): Promise<RankResult> {
  const seeds = params.teleport.kind === "seeds" ? params.teleport.seeds : null;
  const s = prepareRunState(graph, {
    kernel: hooks.kernel ?? "auto",
    weighted: params.weighted,
    seeds,
    start: hooks.resumeFrom?.x ?? null,
  });
  // The borrowed memory goes back only when every step ended normally: after a cancel or a failure, a terminated
  // thread may still be writing, so the graph's heap stays lent and later runs copy the graph instead.
  const result = await steps(s, params, hooks, pool, t0);
  if (result.stopReason === "converged" || result.stopReason === "iteration-cap") s.release();
  return result;
}

async function steps(s: RunState, params: RankParams, hooks: RankHooks, pool: ShardPool, t0: number): Promise<RankResult> {
  const runId = `${process.pid}-${++runCounter}`;
  // Balanced on the arcs the kernel reads; reported as the graph's edges.
  const reported = (ranges: ShardRange[]) =>
    !s.repeats
      ? ranges
      : s.distinctInOffsets
        ? mergedEdgesFromPrefix(ranges, s.distinctInOffsets)
        : countMergedEdges(ranges, s.views.inOffsets, s.views.sources);
  const plan = reported(planShards(s.views.inOffsets, s.n, params.shards ?? pool.threads, s.blockNodes));
  const shards: ShardState[] = plan.map((r) => ({ ...r, state: "queued", attempts: 0 }));
  const bestKernelMs = shards.map(() => Infinity);
  const started = new SharedArrayBuffer(4 * Math.max(1, shards.length));
  const retry = hooks.retry ?? DEFAULT_RETRY;
  const faults = hooks.faults ?? [];
  const alpha = params.damping;
  const residuals: number[] = [];
  const danglingMass: number[] = [];
  const stepMs: number[] = [];
  let stepStarted = 0;
  let k = hooks.resumeFrom?.k ?? 0;
  let residual = Infinity;
  let stopReason: RankResult["stopReason"] = "iteration-cap";
  let failure: RankResult["failure"];
  const driftMessage = (mass: number, at: number) =>
    `probability mass drifted: |Σx − 1| = ${Math.abs(mass - 1)} at iteration ${at} (limit ${MASS_DRIFT_LIMIT})`;
  if (!(Math.abs(s.mass - 1) <= MASS_DRIFT_LIMIT)) {
    stopReason = "failed";
    failure = { shard: -1, attempts: 0, lastError: driftMessage(s.mass, k) };
  }
  const t1 = performance.now();
  while (!failure && k < params.maxIterations) {
    if (hooks.signal?.aborted) {
      stopReason = "canceled";
      break;
    }
    const tIter = performance.now();
    stepStarted = tIter;
    const scalars = stepScalars(alpha, s.danglingMass, s.n, s.seeded, params.dangling);
    for (const st of shards) {
      st.state = "queued";
      st.attempts = 0;
      delete st.lastError;
    }
    const task = { runId, buffers: s.buffers, started, cur: s.cur, scalars, blockNodes: s.blockNodes };
    const outcomes = await Promise.all(
      shards.map((st) => runShard(pool, { ...task, start: st.start, end: st.end }, st, k + 1, retry, faults, hooks.signal)),
    );
    if (outcomes.includes("canceled")) {
      stopReason = "canceled";
      break;
    }
    const failed = shards.find((st) => st.state === "failed");
    if (failed) {
      stopReason = "needs-attention";
      failure = { shard: failed.index, attempts: failed.attempts, lastError: failed.lastError ?? "unknown error" };
      break;
    }
    const sums = combineBlocks(s.views.blockSums, s.blocks);
    if (!(Math.abs(sums.sum - 1) <= MASS_DRIFT_LIMIT)) {
      stopReason = "failed";
      failure = { shard: -1, attempts: 0, lastError: driftMessage(sums.sum, k + 1) };
      break;
    }
    s.cur = s.cur === 0 ? 1 : 0;
    s.danglingMass = sums.dangling;
    residual = sums.residual;
    k++;
    residuals.push(residual);
    danglingMass.push(sums.dangling);
    stepMs.push(performance.now() - stepStarted);
    await hooks.onIteration?.({
      k,
      residual,
      danglingMass: sums.dangling,
      elapsedMs: performance.now() - tIter,
      shards: shards.map((st) => ({ ...st })),
    });
    if (hooks.onCheckpoint && hooks.checkpointEvery && k % hooks.checkpointEvery === 0) {
      await hooks.onCheckpoint(k, s.views.x[s.cur].slice());
    }
    if (residual < params.tolerance) {
      stopReason = "converged";
      break;
    }
    // Kernel times of steps 2 to 4 correct the plan's cost model once (the first step is left out: it faults pages
    // in and runs code not yet optimised). Each shard's fastest of the three stands for it: one slow step (another
    // process, a page fault) must not move the boundaries.
    // Counted in this call's steps: a resumed run starts cold too.
    const step = residuals.length;
    if (step >= 2 && step <= REBALANCE_AFTER) {
      shards.forEach((st, i) => (bestKernelMs[i] = Math.min(bestKernelMs[i], st.attempts === 1 ? (st.kernelMs ?? Infinity) : Infinity)));
      if (step === REBALANCE_AFTER && bestKernelMs.every(Number.isFinite)) {
        const ranges = shards.map(({ index, start, end }) => ({ index, start, end, edges: s.views.inOffsets[end] - s.views.inOffsets[start] }));
        const moved = rebalanceShards(s.views.inOffsets, s.n, ranges, bestKernelMs, s.blockNodes);
        if (moved) for (const r of reported(moved)) Object.assign(shards[r.index], { start: r.start, end: r.end, edges: r.edges });
      }
    }
  }
  const t2 = performance.now();
  const steps = residuals.length;
  return {
    // On shared memory, so that score files can be formatted on the pool's threads without another copy.
    scores: sharedSlice(s.views.x[s.cur]),
    iterations: k,
    residual,
    errorBound: (alpha / (1 - alpha)) * residual,
    converged: stopReason === "converged",
    stopReason,
    residuals,
    danglingMass,
    timings: { setupMs: t1 - t0, iterateMs: t2 - t1, perIterationMs: steps ? (t2 - t1) / steps : 0, medianIterationMs: median(stepMs) },
    kernel: s.kernel,
    ...(failure ? { failure } : {}),
  };
}

function median(xs: number[]): number {
  if (xs.length === 0) return 0;
  const s = [...xs].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

function sharedSlice(a: Float64Array): Float64Array {
  const out = new Float64Array(new SharedArrayBuffer(a.byteLength));
  out.set(a);
  return out;
}
