// Unchecked hot loops of one power-iteration step over a target range. Callers validate (see pull-step.ts).
// Naming: n nodes, v target, u source, e edge slot; x0/x1 = x_k/x_{k+1}, c0/c1 = contributions x/W of x_k/x_{k+1}.

/** Per-block partial sums, 3 slots per block: dangling mass, L1 residual, sum of x. */
export const BLOCK_SLOTS = 3;
export const SLOT_DANGLING = 0;
export const SLOT_RESIDUAL = 1;
export const SLOT_SUM = 2;

/**
 * Scalars of one step: x1[v] = alpha·Σ + q + p·tel[v] (tel null: x1[v] = alpha·Σ + q).
 * The driver folds damping, teleport and dangling mass into p and q, so the kernel does not know the policy.
 */
export interface StepScalars {
  alpha: number;
  p: number;
  q: number;
}

/**
 * x1[v] = alpha·Σ_{u→v} c0[u]·w_uv + (q + p·tel[v]),  c1[v] = x1[v]/W[v] (0 when W[v] = 0), for v in [start, end);
 * blockSums[3b..3b+2] = (Σ_{v∈b, W[v]=0} x1[v], Σ_{v∈b} |x1[v] − x0[v]|, Σ_{v∈b} x1[v]) for every block b in range.
 * start and end lie on block boundaries (end may be n). Sums run in node order, the edge sum in four interleaved
 * accumulators combined as (s0 + s1) + (s2 + s3): the bits of x1 depend only on the graph, never on the range split.
 * @example pullStepCsr(0, n, g.inOffsets, g.sources, null, g.outWeight, c0, x0, x1, c1, s, null, sums, BLOCK_NODES)
 */
export function pullStepCsr(
  start: number,
  end: number,
  inOffsets: Uint32Array,
  sources: Uint32Array,
  weights: Float64Array | null,
  outWeight: Float64Array,
  c0: Float64Array,
  x0: Float64Array,
  x1: Float64Array,
  c1: Float64Array,
  s: StepScalars,
  tel: Float64Array | null,
  blockSums: Float64Array,
  blockNodes: number,
): Float64Array {
  const alpha = s.alpha;
  const p = s.p;
  const q = s.q;
  for (let b0 = start; b0 < end; b0 += blockNodes) {
    const b1 = Math.min(b0 + blockNodes, end);
    let dang = 0;
    let res = 0;
    let sum = 0;
    let lo = inOffsets[b0];
    for (let v = b0; v < b1; v++) {
      const hi = inOffsets[v + 1];
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      let e = lo;
      if (weights === null) {
        for (; e + 3 < hi; e += 4) {
          s0 += c0[sources[e]];
          s1 += c0[sources[e + 1]];
          s2 += c0[sources[e + 2]];
          s3 += c0[sources[e + 3]];
        }
        if (e < hi) s0 += c0[sources[e++]];
        if (e < hi) s1 += c0[sources[e++]];
        if (e < hi) s2 += c0[sources[e]];
      } else {
        for (; e + 3 < hi; e += 4) {
          s0 += c0[sources[e]] * weights[e];
          s1 += c0[sources[e + 1]] * weights[e + 1];
          s2 += c0[sources[e + 2]] * weights[e + 2];
          s3 += c0[sources[e + 3]] * weights[e + 3];
        }
        if (e < hi) {
          s0 += c0[sources[e]] * weights[e];
          e++;
        }
        if (e < hi) {
          s1 += c0[sources[e]] * weights[e];
          e++;
        }
        if (e < hi) s2 += c0[sources[e]] * weights[e];
      }
      lo = hi;
      const base = tel === null ? q : q + p * tel[v];
      const xv = alpha * (s0 + s1 + (s2 + s3)) + base;
      const w = outWeight[v];
      if (w > 0) {
        c1[v] = xv / w;
      } else {
        c1[v] = 0;
        dang += xv;
      }
      res += Math.abs(xv - x0[v]);
      sum += xv;
      x1[v] = xv;
    }
    const slot = (b0 / blockNodes) * BLOCK_SLOTS;
    blockSums[slot + SLOT_DANGLING] = dang;
    blockSums[slot + SLOT_RESIDUAL] = res;
    blockSums[slot + SLOT_SUM] = sum;
  }
  return x1;
}

/**
 * c[v] = x[v]/W[v] (0 when W[v] = 0) for v in [start, end); blockSums per block as in pullStepCsr with residual 0.
 * Gives the same contributions and dangling sums that pullStepCsr leaves behind for the same x.
 */
export function contributionsCsr(
  start: number,
  end: number,
  x: Float64Array,
  outWeight: Float64Array,
  c: Float64Array,
  blockSums: Float64Array,
  blockNodes: number,
): Float64Array {
  for (let b0 = start; b0 < end; b0 += blockNodes) {
    const b1 = Math.min(b0 + blockNodes, end);
    let dang = 0;
    let sum = 0;
    for (let v = b0; v < b1; v++) {
      const xv = x[v];
      const w = outWeight[v];
      if (w > 0) {
        c[v] = xv / w;
      } else {
        c[v] = 0;
        dang += xv;
      }
      sum += xv;
    }
    const slot = (b0 / blockNodes) * BLOCK_SLOTS;
    blockSums[slot + SLOT_DANGLING] = dang;
    blockSums[slot + SLOT_RESIDUAL] = 0;
    blockSums[slot + SLOT_SUM] = sum;
  }
  return c;
}

/** (D, r, S) = Σ_b blockSums[3b + slot], blocks combined in ascending order so the result is layout-independent. */
export function combineBlocks(blockSums: Float64Array, blocks: number): { dangling: number; residual: number; sum: number } {
  let dangling = 0;
  let residual = 0;
  let sum = 0;
  for (let b = 0; b < blocks; b++) {
    dangling += blockSums[b * BLOCK_SLOTS + SLOT_DANGLING];
    residual += blockSums[b * BLOCK_SLOTS + SLOT_RESIDUAL];
    sum += blockSums[b * BLOCK_SLOTS + SLOT_SUM];
  }
  return { dangling, residual, sum };
}
