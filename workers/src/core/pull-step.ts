// Checked entry points of the step kernels: validate shapes and scalars, then run the unchecked loops.
import { BLOCK_SLOTS, contributionsCsr, pullStepCsr, type StepScalars } from "./pull-step-csr";

function fail(name: string, value: unknown, why: string): never {
  throw new RangeError(`${name} ${why}. Value: ${String(value)}`);
}

function checkLength(name: string, a: ArrayLike<number> | null, want: number): void {
  if (a === null) return;
  if (a.length !== want) fail(`${name}.length`, a.length, `must be ${want}`);
}

function checkRange(start: number, end: number, n: number, blockNodes: number): void {
  if (!Number.isInteger(blockNodes) || blockNodes <= 0) fail("blockNodes", blockNodes, "must be a positive integer");
  if (!Number.isInteger(start) || start < 0 || start > n) fail("start", start, `must be an integer in 0..${n}`);
  if (!Number.isInteger(end) || end < start || end > n) fail("end", end, `must be an integer in ${start}..${n}`);
  if (start % blockNodes !== 0) fail("start", start, `must be a multiple of ${blockNodes}`);
  if (end % blockNodes !== 0 && end !== n) fail("end", end, `must be a multiple of ${blockNodes} or n = ${n}`);
}

function checkBlockSums(blockSums: Float64Array, n: number, blockNodes: number): void {
  const blocks = Math.ceil(n / blockNodes);
  if (blockSums.length < blocks * BLOCK_SLOTS) fail("blockSums.length", blockSums.length, `must be ≥ ${blocks * BLOCK_SLOTS}`);
}

/** Arguments of one step over a target range (see pullStepCsr for the layout and the math). */
export interface StepArgs {
  start: number;
  end: number;
  inOffsets: Uint32Array;
  sources: Uint32Array;
  weights: Float64Array | null;
  outWeight: Float64Array;
  c0: Float64Array;
  x0: Float64Array;
  x1: Float64Array;
  c1: Float64Array;
  scalars: StepScalars;
  tel: Float64Array | null;
  blockSums: Float64Array;
  blockNodes: number;
}

/**
 * Validates the arguments of a step: O(1) shape checks only, since source indices are validated once per graph
 * (checkGraph), not per step. Every kernel implementation calls this first.
 */
export function checkStep(a: StepArgs): void {
  const n = a.outWeight.length;
  checkLength("inOffsets", a.inOffsets, n + 1);
  const m = a.inOffsets[n];
  if (a.sources.length < m) fail("sources.length", a.sources.length, `must be ≥ inOffsets[n] = ${m}`);
  if (a.weights !== null && a.weights.length < m) fail("weights.length", a.weights.length, `must be ≥ ${m}`);
  for (const [name, arr] of [["c0", a.c0], ["x0", a.x0], ["x1", a.x1], ["c1", a.c1], ["tel", a.tel]] as const) {
    checkLength(name, arr, n);
  }
  checkRange(a.start, a.end, n, a.blockNodes);
  checkBlockSums(a.blockSums, n, a.blockNodes);
  const { alpha, p, q } = a.scalars;
  if (!(alpha >= 0 && alpha < 1)) fail("scalars.alpha", alpha, "must be in [0, 1)");
  if (!Number.isFinite(p)) fail("scalars.p", p, "must be finite");
  if (!Number.isFinite(q)) fail("scalars.q", q, "must be finite");
}

/**
 * Checked pullStepCsr: x1[v] = alpha·Σ_{u→v} c0[u]·w_uv + (q + p·tel[v]) for v in [start, end), with block sums.
 * @example pullStep({ start: 0, end: n, inOffsets, sources, weights: null, outWeight, c0, x0, x1, c1, scalars, tel: null, blockSums, blockNodes })
 */
export function pullStep(a: StepArgs): Float64Array {
  checkStep(a);
  return pullStepCsr(
    a.start, a.end, a.inOffsets, a.sources, a.weights, a.outWeight,
    a.c0, a.x0, a.x1, a.c1, a.scalars, a.tel, a.blockSums, a.blockNodes,
  );
}

/**
 * Checked contributionsCsr: c[v] = x[v]/W[v] (0 when dangling) for v in [start, end), with block sums.
 * @example contributions({ start: 0, end: n, x, outWeight, c, blockSums, blockNodes: BLOCK_NODES })
 */
export function contributions(a: {
  start: number;
  end: number;
  x: Float64Array;
  outWeight: Float64Array;
  c: Float64Array;
  blockSums: Float64Array;
  blockNodes: number;
}): Float64Array {
  const n = a.outWeight.length;
  checkLength("x", a.x, n);
  checkLength("c", a.c, n);
  checkRange(a.start, a.end, n, a.blockNodes);
  checkBlockSums(a.blockSums, n, a.blockNodes);
  return contributionsCsr(a.start, a.end, a.x, a.outWeight, a.c, a.blockSums, a.blockNodes);
}

/** Source arrays already known to hold only indexes below the n given here: checked here, or built so. */
const checkedSources = new WeakMap<Uint32Array, number>();

/** Records that every entry of `sources` is below n (the build makes them so; see checkGraph). */
export function markSourcesChecked(sources: Uint32Array, n: number): void {
  checkedSources.set(sources, n);
}

/**
 * Validates a CSR-by-target graph once before iterating: offsets start at 0, never decrease and end at m; every
 * source index is < n; weights and out-weights are finite and ≥ 0. O(n + m), sequential reads only; the scan of the
 * sources is skipped for an array already checked against an n no larger (markSourcesChecked).
 */
export function checkGraph(g: {
  n: number;
  m: number;
  inOffsets: Uint32Array;
  sources: Uint32Array;
  weights: Float64Array | null;
  outWeight: Float64Array;
}): void {
  const { n, m } = g;
  if (!Number.isInteger(n) || n < 0) fail("graph.n", n, "must be a non-negative integer");
  checkLength("graph.inOffsets", g.inOffsets, n + 1);
  checkLength("graph.outWeight", g.outWeight, n);
  checkLength("graph.sources", g.sources, m);
  checkLength("graph.weights", g.weights, m);
  if (g.inOffsets[0] !== 0) fail("graph.inOffsets[0]", g.inOffsets[0], "must be 0");
  if (g.inOffsets[n] !== m) fail(`graph.inOffsets[${n}]`, g.inOffsets[n], `must be m = ${m}`);
  for (let v = 0; v < n; v++) {
    if (g.inOffsets[v + 1] < g.inOffsets[v]) fail(`graph.inOffsets[${v + 1}]`, g.inOffsets[v + 1], "must not decrease");
    const w = g.outWeight[v];
    if (!(w >= 0 && w < Infinity)) fail(`graph.outWeight[${v}]`, w, "must be finite and ≥ 0");
  }
  if (!((checkedSources.get(g.sources) ?? Infinity) <= n)) {
    for (let e = 0; e < m; e++) if (g.sources[e] >= n) fail(`graph.sources[${e}]`, g.sources[e], `must be < n = ${n}`);
    checkedSources.set(g.sources, n);
  }
  if (g.weights !== null) {
    for (let e = 0; e < m; e++) {
      const w = g.weights[e];
      if (!(w >= 0 && w < Infinity)) fail(`graph.weights[${e}]`, w, "must be finite and ≥ 0");
    }
  }
}
