// The in-memory shape of a prepared graph: what ingest produces and what the iteration consumes.
// Dense node ids are 0..n-1 and are ours; original ids live in `ids` for output.

import type { SharedHeap } from "./shared-heap";

/** Node-sum block: global sums (dangling mass, residual) are added per block and blocks combined in order. */
export const BLOCK_NODES = 4096;

export type NodeIds =
  /** ids[dense] = original unsigned 64-bit integer id. */
  | { kind: "integer"; ids: BigUint64Array }
  /** UTF-8 bytes of node `dense` are bytes[offsets[dense] .. offsets[dense + 1]). */
  | { kind: "string"; bytes: Uint8Array; offsets: Uint32Array };

/**
 * Graph = { n, m, inOffsets: Uint32Array (n+1), sources: Uint32Array (m), weights: Float64Array (m) | null,
 *           outWeight: Float64Array (n), ids }.
 * In-edges of target v are sources[inOffsets[v] .. inOffsets[v+1]) (CSR by target), each list sorted ascending.
 * outWeight[u] = W_u = sum of weights of u's out-edges (edge count when unweighted); 0 means u is dangling.
 * When `weights` is null every edge weighs 1.
 * `mergedEdges` is set when duplicate edges were merged by keeping each copy as a repeated source (cheaper than a
 * weight per edge when duplicates are few): a source listed k times in an in-list is one edge weighing k, and
 * mergedEdges counts it once (m counts it k times). Unweighted runs on such a graph count each edge once.
 * `distinctInOffsets` (n+1), when the build kept it, holds the prefix sums of each in-list's distinct sources: the
 * merged edges of any node range without a pass over its lists.
 * `heap` is set when inOffsets, sources, weights and outWeight all live in it (runs then borrow its free space).
 */
export interface Graph {
  n: number;
  m: number;
  inOffsets: Uint32Array;
  sources: Uint32Array;
  weights: Float64Array | null;
  outWeight: Float64Array;
  ids: NodeIds;
  mergedEdges?: number;
  distinctInOffsets?: Uint32Array;
  heap?: SharedHeap;
}

/**
 * Reference builder from dense edge arrays (no policies applied: the caller has already dropped or kept self-loops
 * and merged or kept duplicates). Plain and O(n + m); the streaming ingest builds the same structure.
 * @example fromDenseEdges(3, Uint32Array.of(0, 1), Uint32Array.of(1, 2)) // 0→1, 1→2
 */
export function fromDenseEdges(
  n: number,
  src: Uint32Array,
  dst: Uint32Array,
  weight: Float64Array | null = null,
  ids?: NodeIds,
): Graph {
  const m = src.length;
  if (dst.length !== m) throw new RangeError(`dst must have ${m} entries. Value: ${dst.length}`);
  if (weight && weight.length !== m) throw new RangeError(`weight must have ${m} entries. Value: ${weight.length}`);
  const inOffsets = new Uint32Array(n + 1);
  const outWeight = new Float64Array(n);
  for (let e = 0; e < m; e++) {
    if (src[e] >= n || dst[e] >= n) throw new RangeError(`edge ${e} names a node outside 0..${n - 1}`);
    inOffsets[dst[e] + 1]++;
    outWeight[src[e]] += weight ? weight[e] : 1;
  }
  for (let v = 0; v < n; v++) inOffsets[v + 1] += inOffsets[v];
  // Stable placement by ascending source: order edges by (dst, src) via a counting pass over sources.
  const order = new Uint32Array(m);
  const bySrc = new Uint32Array(n + 1);
  for (let e = 0; e < m; e++) bySrc[src[e] + 1]++;
  for (let u = 0; u < n; u++) bySrc[u + 1] += bySrc[u];
  for (let e = 0; e < m; e++) order[bySrc[src[e]]++] = e;
  const fill = inOffsets.slice(0, n);
  const sources = new Uint32Array(m);
  const weights = weight ? new Float64Array(m) : null;
  for (let i = 0; i < m; i++) {
    const e = order[i];
    const at = fill[dst[e]]++;
    sources[at] = src[e];
    if (weights && weight) weights[at] = weight[e];
  }
  return {
    n,
    m,
    inOffsets,
    sources,
    weights,
    outWeight,
    ids: ids ?? { kind: "integer", ids: BigUint64Array.from({ length: n }, (_, i) => BigInt(i)) },
  };
}
