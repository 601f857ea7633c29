// Node renumbering for locality: hubs first, so the hot part of the contribution vector shares cache lines.
import { fromDenseEdges, type Graph, type NodeIds } from "./graph";

/**
 * order[i] = old dense id of the node that becomes i: nodes by descending degree (out-degree = edges leaving,
 * in-degree = edges arriving), ties by ascending old id. Counting sort, O(n + max degree).
 * @example degreeOrder(g, "out") // [hub, …, leaves]
 */
export function degreeOrder(g: Graph, by: "out" | "in"): Uint32Array {
  const deg = new Uint32Array(g.n);
  if (by === "in") for (let v = 0; v < g.n; v++) deg[v] = g.inOffsets[v + 1] - g.inOffsets[v];
  else for (let e = 0; e < g.m; e++) deg[g.sources[e]]++;
  let max = 0;
  for (let v = 0; v < g.n; v++) if (deg[v] > max) max = deg[v];
  const start = new Uint32Array(max + 2);
  for (let v = 0; v < g.n; v++) start[max - deg[v] + 1]++;
  for (let d = 0; d <= max; d++) start[d + 1] += start[d];
  const order = new Uint32Array(g.n);
  for (let v = 0; v < g.n; v++) order[start[max - deg[v]]++] = v;
  return order;
}

function permuteIds(ids: NodeIds, order: Uint32Array): NodeIds {
  if (ids.kind === "integer") return { kind: "integer", ids: BigUint64Array.from(order, (v) => ids.ids[v]) };
  const offsets = new Uint32Array(order.length + 1);
  for (let i = 0; i < order.length; i++) offsets[i + 1] = offsets[i] + ids.offsets[order[i] + 1] - ids.offsets[order[i]];
  const bytes = new Uint8Array(offsets[order.length]);
  for (let i = 0; i < order.length; i++) bytes.set(ids.bytes.subarray(ids.offsets[order[i]], ids.offsets[order[i] + 1]), offsets[i]);
  return { kind: "string", bytes, offsets };
}

/**
 * The same graph with node order[i] renamed i: in-lists re-sorted by new source id, out-weights and original ids
 * carried over unchanged (so scores map back through ids alone). Throws RangeError unless order is a permutation.
 * @example relabel(g, degreeOrder(g, "out"))
 */
export function relabel(g: Graph, order: Uint32Array): Graph {
  const n = g.n;
  if (order.length !== n) throw new RangeError(`order.length must be n = ${n}. Value: ${order.length}`);
  const newId = new Uint32Array(n).fill(0xffffffff);
  for (let i = 0; i < n; i++) {
    const v = order[i];
    if (v >= n || newId[v] !== 0xffffffff) throw new RangeError(`order must be a permutation of 0..${n - 1}. Value at ${i}: ${v}`);
    newId[v] = i;
  }
  const src = new Uint32Array(g.m);
  const dst = new Uint32Array(g.m);
  for (let v = 0; v < n; v++) {
    for (let e = g.inOffsets[v]; e < g.inOffsets[v + 1]; e++) {
      src[e] = newId[g.sources[e]];
      dst[e] = newId[v];
    }
  }
  const out = fromDenseEdges(n, src, dst, g.weights, permuteIds(g.ids, order));
  for (let i = 0; i < n; i++) out.outWeight[i] = g.outWeight[order[i]];
  return out;
}
