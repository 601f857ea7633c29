// Build the in-memory Graph from canonically numbered edges: apply the self-loop, direction and duplicate policies,
// renumber nodes hubs first, and lay out the in-edge CSR with each in-list sorted by source.
// Dense ids: nodes ordered by out-arc count, descending (hubs first, so the gathers of the iteration touch few cache
// lines and pages), ties by original id; with renumber off, by original id alone. Either way the graph depends only on
// the set of input lines. Duplicate arcs stay adjacent in file order, so merged weights are summed in file order.

import type { Graph, NodeIds } from "../core/graph";
import type { CanonicalEdges, EdgeSegment } from "../ingest/assemble";
import { sharedF64, sharedU32 } from "./shared";

export interface BuildPolicy {
  directed: boolean;
  selfLoops: "drop" | "keep";
  duplicates: "merge" | "keep";
  /** Renumber hubs first (default) or keep original-id order. */
  renumber: boolean;
}

export interface BuildReport {
  /** Arcs after the self-loop policy and undirected doubling, before duplicates were merged. */
  arcs: number;
  selfLoopsDropped: number;
  /** Arcs folded into an earlier identical arc (weights summed). */
  duplicatesMerged: number;
  order: "out-degree" | "id";
}

export function buildGraph(input: CanonicalEdges, policy: BuildPolicy): { graph: Graph; report: BuildReport } {
  const n = input.n;
  const dropSelf = policy.selfLoops === "drop";
  const both = !policy.directed;
  const weighted = input.segments.some((s) => s.weight !== null);
  if (n >= 2 ** 32 - 1) throw new RangeError(`too many nodes for 32-bit indexes: ${n}`);

  const outCount = new Uint32Array(n);
  const inCount = new Uint32Array(n);
  let arcs = 0;
  let dropped = 0;
  for (const { src, dst, map } of input.segments) {
    for (let i = 0; i < src.length; i++) {
      const u = map[src[i]];
      const v = map[dst[i]];
      if (u === v && dropSelf) {
        dropped++;
        continue;
      }
      outCount[u]++;
      inCount[v]++;
      arcs++;
      if (both && u !== v) {
        outCount[v]++;
        inCount[u]++;
        arcs++;
      }
    }
  }
  if (arcs >= 2 ** 32) throw new RangeError(`too many edges for 32-bit offsets: ${arcs}`);

  const perm = policy.renumber ? hubsFirst(outCount) : identity(n);
  const outStart = new Uint32Array(n + 1);
  const inOffsets = sharedU32(n + 1);
  for (let c = 0; c < n; c++) {
    outStart[perm[c] + 1] = outCount[c];
    inOffsets[perm[c] + 1] = inCount[c];
  }
  for (let u = 0; u < n; u++) {
    outStart[u + 1] += outStart[u];
    inOffsets[u + 1] += inOffsets[u];
  }

  // Pass A: arcs grouped by final source id (stable), carrying their target and weight.
  const bySrcDst = new Uint32Array(arcs);
  const bySrcW = weighted ? new Float64Array(arcs) : null;
  const cursor = outStart.slice(0, n);
  const finalMaps = new Map<Uint32Array, Uint32Array>();
  for (const seg of input.segments) {
    let fmap = finalMaps.get(seg.map);
    if (!fmap) {
      fmap = compose(perm, seg.map);
      finalMaps.set(seg.map, fmap);
    }
    scatterBySource(seg, fmap, dropSelf, both, cursor, bySrcDst, bySrcW);
  }

  // Pass B: walking sources in ascending order fills each in-list already sorted.
  const sources = sharedU32(arcs);
  let weights = weighted ? sharedF64(arcs) : null;
  const fill = inOffsets.slice(0, n);
  for (let u = 0; u < n; u++) {
    for (let p = outStart[u], end = outStart[u + 1]; p < end; p++) {
      const at = fill[bySrcDst[p]]++;
      sources[at] = u;
      if (weights !== null && bySrcW !== null) weights[at] = bySrcW[p];
    }
  }

  let m = arcs;
  let merged = 0;
  let srcOut = sources;
  if (policy.duplicates === "merge") {
    const r = mergeDuplicates(n, inOffsets, sources, weights);
    merged = arcs - r.m;
    m = r.m;
    weights = r.weights;
    srcOut = sources.subarray(0, m);
    if (weights) weights = weights.subarray(0, m);
  }

  const outWeight = sharedF64(n);
  for (let e = 0; e < m; e++) outWeight[srcOut[e]] += weights ? weights[e] : 1;

  const graph: Graph = { n, m, inOffsets, sources: srcOut, weights, outWeight, ids: permuteIds(input.ids, perm) };
  return {
    graph,
    report: { arcs, selfLoopsDropped: dropped, duplicatesMerged: merged, order: policy.renumber ? "out-degree" : "id" },
  };
}

function scatterBySource(
  seg: EdgeSegment,
  fmap: Uint32Array,
  dropSelf: boolean,
  both: boolean,
  cursor: Uint32Array,
  bySrcDst: Uint32Array,
  bySrcW: Float64Array | null,
): void {
  const { src, dst, weight } = seg;
  for (let i = 0; i < src.length; i++) {
    const u = fmap[src[i]];
    const v = fmap[dst[i]];
    if (u === v && dropSelf) continue;
    const w = weight !== null ? weight[i] : 1;
    let p = cursor[u]++;
    bySrcDst[p] = v;
    if (bySrcW !== null) bySrcW[p] = w;
    if (both && u !== v) {
      p = cursor[v]++;
      bySrcDst[p] = u;
      if (bySrcW !== null) bySrcW[p] = w;
    }
  }
}

/**
 * Fold runs of equal sources inside each in-list into one arc whose weight is the run's summed weight (unit weights
 * sum to the multiplicity, so the transition probabilities do not change). Compacts in place and rewrites inOffsets.
 */
function mergeDuplicates(
  n: number,
  inOffsets: Uint32Array,
  sources: Uint32Array,
  weights: Float64Array | null,
): { m: number; weights: Float64Array | null } {
  let dups = 0;
  for (let v = 0; v < n; v++) {
    for (let e = inOffsets[v] + 1, end = inOffsets[v + 1]; e < end; e++) if (sources[e] === sources[e - 1]) dups++;
  }
  if (dups === 0) return { m: inOffsets[n], weights };
  const out = weights ?? sharedF64(inOffsets[n] - dups);
  let wr = 0;
  for (let v = 0; v < n; v++) {
    const start = inOffsets[v];
    const end = inOffsets[v + 1];
    inOffsets[v] = wr;
    for (let e = start; e < end; e++) {
      const w = weights ? weights[e] : 1;
      if (e > start && sources[e] === sources[e - 1]) out[wr - 1] += w;
      else {
        sources[wr] = sources[e];
        out[wr] = w;
        wr++;
      }
    }
  }
  inOffsets[n] = wr;
  return { m: wr, weights: out };
}

/** perm[c] = final id: out-arc count descending, then canonical id ascending (stable counting sort). */
export function hubsFirst(outCount: Uint32Array): Uint32Array {
  const n = outCount.length;
  let maxDeg = 0;
  for (let c = 0; c < n; c++) if (outCount[c] > maxDeg) maxDeg = outCount[c];
  const perm = new Uint32Array(n);
  if (maxDeg <= 4 * n + 1024) {
    const start = new Uint32Array(maxDeg + 2);
    for (let c = 0; c < n; c++) start[maxDeg - outCount[c] + 1]++;
    for (let k = 0; k <= maxDeg; k++) start[k + 1] += start[k];
    for (let c = 0; c < n; c++) perm[c] = start[maxDeg - outCount[c]]++;
    return perm;
  }
  const order = identity(n).sort((a, b) => outCount[b] - outCount[a] || a - b);
  for (let i = 0; i < n; i++) perm[order[i]] = i;
  return perm;
}

function identity(n: number): Uint32Array {
  const a = new Uint32Array(n);
  for (let i = 0; i < n; i++) a[i] = i;
  return a;
}

function compose(outer: Uint32Array, inner: Uint32Array): Uint32Array {
  const r = new Uint32Array(inner.length);
  for (let i = 0; i < inner.length; i++) r[i] = outer[inner[i]];
  return r;
}

function permuteIds(ids: NodeIds, perm: Uint32Array): NodeIds {
  const n = perm.length;
  if (ids.kind === "integer") {
    const out = new BigUint64Array(n);
    for (let c = 0; c < n; c++) out[perm[c]] = ids.ids[c];
    return { kind: "integer", ids: out };
  }
  const lens = new Uint32Array(n + 1);
  for (let c = 0; c < n; c++) lens[perm[c] + 1] = ids.offsets[c + 1] - ids.offsets[c];
  for (let i = 0; i < n; i++) lens[i + 1] += lens[i];
  const bytes = new Uint8Array(ids.bytes.length);
  for (let c = 0; c < n; c++) bytes.set(ids.bytes.subarray(ids.offsets[c], ids.offsets[c + 1]), lens[perm[c]]);
  return { kind: "string", bytes, offsets: lens };
}
