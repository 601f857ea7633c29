// Shard planning: contiguous target ranges on block boundaries, balanced by work.

/**
 * Cost of a target node in in-edges: a step reads and writes several n-long arrays per node and gathers its few
 * in-edges from all over. Fitted on R-MAT scale 20 renumbered hubs first (two threads, WebAssembly kernel): about
 * 0.94 ms per million in-edges and 13.6 ns per node, so one node costs what 14 edges do. With edges alone, the shard
 * of the many light nodes took twice as long as the hubs' shard.
 */
export const NODE_COST = 14;

/** A contiguous target range [start, end) with its in-edge count; start is a multiple of the block size. */
export interface ShardRange {
  index: number;
  start: number;
  end: number;
  edges: number;
}

/**
 * Splits 0..n into min(count, blocks) non-empty ranges cut on multiples of blockNodes, balancing
 * cost(range) = in-edges + NODE_COST · nodes (the per-node work of a step is not free). Boundary i goes to the block edge whose
 * prefix cost is nearest to i/k of the total, keeping at least one block per shard. Empty for n = 0.
 * @example planShards(g.inOffsets, g.n, 4, BLOCK_NODES) // [{ index: 0, start: 0, end: 8192, edges: … }, …]
 */
export function planShards(inOffsets: Uint32Array, n: number, count: number, blockNodes: number): ShardRange[] {
  if (!Number.isInteger(count) || count < 1) throw new RangeError(`count must be a positive integer. Value: ${count}`);
  if (!Number.isInteger(blockNodes) || blockNodes < 1) {
    throw new RangeError(`blockNodes must be a positive integer. Value: ${blockNodes}`);
  }
  if (inOffsets.length !== n + 1) throw new RangeError(`inOffsets.length must be ${n + 1}. Value: ${inOffsets.length}`);
  if (n === 0) return [];
  const blocks = Math.ceil(n / blockNodes);
  const k = Math.min(count, blocks);
  const node = (j: number) => Math.min(j * blockNodes, n);
  const cost = (j: number) => inOffsets[node(j)] + NODE_COST * node(j);
  const cuts = equalCuts(cost, blocks, k);
  const shards: ShardRange[] = [];
  for (let i = 0; i < k; i++) {
    const start = node(cuts[i]);
    const end = node(cuts[i + 1]);
    shards.push({ index: i, start, end, edges: inOffsets[end] - inOffsets[start] });
  }
  return shards;
}

/**
 * The plan moved towards equal step times, from one step's measured time per range: each range's time is spread over
 * its blocks in proportion to their cost (in-edges + NODE_COST · nodes), and boundary i goes to the block edge where
 * that estimate reaches i/k of the total (at least one block a range). Null when the times are within `tolerance` of
 * each other, a time is missing, or the boundaries would not move. Any plan gives the same bits, so a run may change
 * its plan between steps: the cost model misjudges some graphs (cache behaviour differs between hubs and the rest).
 */
export function rebalanceShards(
  inOffsets: Uint32Array,
  n: number,
  plan: readonly ShardRange[],
  times: readonly number[],
  blockNodes: number,
  tolerance = 0.04,
): ShardRange[] | null {
  const k = plan.length;
  if (k < 2 || times.length !== k || !times.every((t) => t > 0)) return null;
  if (Math.max(...times) <= Math.min(...times) * (1 + tolerance)) return null;
  const blocks = Math.ceil(n / blockNodes);
  const node = (j: number) => Math.min(j * blockNodes, n);
  const cost = (j: number) => inOffsets[node(j)] + NODE_COST * node(j);
  const first = plan.map((r) => Math.floor(r.start / blockNodes));
  const last = plan.map((r) => Math.ceil(r.end / blockNodes));
  const density = plan.map((_, i) => times[i] / Math.max(1, cost(last[i]) - cost(first[i])));
  // Estimated time of blocks [0, j).
  const estimate = (j: number) => {
    let t = 0;
    for (let i = 0; i < k && first[i] < j; i++) t += density[i] * (cost(Math.min(j, last[i])) - cost(first[i]));
    return t;
  };
  const cuts = equalCuts(estimate, blocks, k);
  if (cuts.every((j, i) => i === k || node(j) === plan[i].start)) return null;
  return plan.map((r, i) => {
    const start = node(cuts[i]);
    const end = node(cuts[i + 1]);
    return { index: r.index, start, end, edges: inOffsets[end] - inOffsets[start] };
  });
}

/**
 * Block boundaries 0 = c_0 < c_1 < … < c_k = blocks, c_i the block edge whose prefix (non-decreasing, prefix(0) = 0)
 * is nearest to i/k of prefix(blocks), keeping at least one block per range.
 */
function equalCuts(prefix: (j: number) => number, blocks: number, k: number): number[] {
  const total = prefix(blocks);
  const cuts = [0];
  for (let i = 1; i < k; i++) {
    const target = (total * i) / k;
    const minJ = cuts[i - 1] + 1;
    let lo = minJ;
    let hi = blocks - (k - i);
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (prefix(mid) < target) lo = mid + 1;
      else hi = mid;
    }
    if (lo > minJ && target - prefix(lo - 1) < prefix(lo) - target) lo--;
    cuts.push(lo);
  }
  cuts.push(blocks);
  return cuts;
}

/**
 * The plan with each range's edges counted once per distinct source in an in-list: on a graph that keeps merged
 * duplicates as repeated sources (Graph.mergedEdges), the ranges then add up to the graph's edges.
 */
export function countMergedEdges(plan: ShardRange[], inOffsets: Uint32Array, sources: Uint32Array): ShardRange[] {
  return plan.map((r) => {
    // Equal neighbours over the whole range in one flat loop, less those that straddle two lists.
    const lo = inOffsets[r.start];
    const hi = inOffsets[r.end];
    let repeats = 0;
    for (let e = lo + 1; e < hi; e++) if (sources[e] === sources[e - 1]) repeats++;
    for (let v = r.start + 1; v < r.end; v++) {
      const b = inOffsets[v];
      // A boundary once (empty lists share it), and only inside the range.
      if (b !== inOffsets[v - 1] && b > lo && b < hi && sources[b] === sources[b - 1]) repeats--;
    }
    return { ...r, edges: r.edges - repeats };
  });
}

/** countMergedEdges from the prefix sums of distinct in-list sources (Graph.distinctInOffsets): O(1) a range. */
export function mergedEdgesFromPrefix(plan: ShardRange[], distinctInOffsets: Uint32Array): ShardRange[] {
  return plan.map((r) => ({ ...r, edges: distinctInOffsets[r.end] - distinctInOffsets[r.start] }));
}
