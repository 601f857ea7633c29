// Build the in-memory Graph from canonically numbered edges: apply the self-loop, direction and duplicate policies,
// renumber nodes hubs first, and lay out the in-edge CSR with each in-list sorted by source.
// Dense ids: nodes ordered by out-arc count, descending (hubs first, so the gathers of the iteration touch few cache
// lines and pages), ties by original id; with renumber off, by original id alone. Either way the graph depends only on
// the set of input lines. Duplicate arcs stay adjacent in file order, so merged weights are summed in file order.

import type { Graph, NodeIds } from "../core/graph";
import type { ArcCounts, CanonicalEdges, EdgeSegment } from "../ingest/assemble";
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
  const merge = policy.duplicates === "merge";
  if (n >= 2 ** 32 - 1) throw new RangeError(`too many nodes for 32-bit indexes: ${n}`);
  const counts = input.degrees ?? countArcs(input, dropSelf, both);
  const arcs = counts.arcs;
  if (arcs >= 2 ** 32) throw new RangeError(`too many edges for 32-bit offsets: ${arcs}`);

  const perm = policy.renumber ? hubsFirst(counts.out) : identity(n);
  const outStart = new Uint32Array(n + 1);
  const inOffsets = sharedU32(n + 1);
  for (let c = 0; c < n; c++) {
    outStart[perm[c] + 1] = counts.out[c];
    inOffsets[perm[c] + 1] = counts.in[c];
  }
  for (let u = 0; u < n; u++) {
    outStart[u + 1] += outStart[u];
    inOffsets[u + 1] += inOffsets[u];
  }

  // Pass A: arcs grouped by final source id (stable: file order inside a group), carrying target and weight.
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

  // Pass B: walking sources in ascending order fills each in-list already sorted; an arc equal to the one just
  // placed in its list is a duplicate and (when merging) adds its weight there. W_u sums u's arcs in file order.
  const sources = sharedU32(arcs);
  let weights = weighted || merge ? sharedF64(arcs) : null;
  const outWeight = sharedF64(n);
  const fillLast = new Uint32Array(2 * n);
  for (let v = 0; v < n; v++) {
    fillLast[2 * v] = inOffsets[v];
    fillLast[2 * v + 1] = NO_SOURCE;
  }
  let merged = 0;
  for (let u = 0; u < n; u++) {
    let sum = 0;
    for (let p = outStart[u], end = outStart[u + 1]; p < end; p++) {
      const v = bySrcDst[p];
      const w = bySrcW !== null ? bySrcW[p] : 1;
      sum += w;
      const at = fillLast[2 * v];
      if (merge && fillLast[2 * v + 1] === u) {
        (weights as Float64Array)[at - 1] += w;
        merged++;
        continue;
      }
      sources[at] = u;
      if (weights !== null) weights[at] = w;
      fillLast[2 * v] = at + 1;
      fillLast[2 * v + 1] = u;
    }
    outWeight[u] = sum;
  }

  let m = arcs;
  if (merged > 0) m = compact(n, inOffsets, fillLast, sources, weights);
  else if (!weighted) weights = null;
  const graph: Graph = {
    n,
    m,
    inOffsets,
    sources: m === arcs ? sources : sources.subarray(0, m),
    weights: weights && m !== arcs ? weights.subarray(0, m) : weights,
    outWeight,
    ids: permuteIds(input.ids, perm),
  };
  return {
    graph,
    report: { arcs, selfLoopsDropped: counts.selfLoopsDropped, duplicatesMerged: merged, order: policy.renumber ? "out-degree" : "id" },
  };
}

const NO_SOURCE = 0xffffffff;

/** Arc counts by canonical id (the hash path; the direct path counts while numbering). */
function countArcs(input: CanonicalEdges, dropSelf: boolean, both: boolean): ArcCounts {
  const n = input.n;
  const out = new Uint32Array(n);
  const inn = new Uint32Array(n);
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
      out[u]++;
      inn[v]++;
      arcs++;
      if (both && u !== v) {
        out[v]++;
        inn[u]++;
        arcs++;
      }
    }
  }
  return { out, in: inn, arcs, selfLoopsDropped: dropped };
}

/** Close the gaps merged duplicates left at the end of in-lists; rewrites inOffsets, returns the edge count. */
function compact(n: number, inOffsets: Uint32Array, fillLast: Uint32Array, sources: Uint32Array, weights: Float64Array | null): number {
  let wr = 0;
  for (let v = 0; v < n; v++) {
    const start = inOffsets[v];
    const end = fillLast[2 * v];
    inOffsets[v] = wr;
    if (start !== wr) {
      sources.copyWithin(wr, start, end);
      if (weights) weights.copyWithin(wr, start, end);
    }
    wr += end - start;
  }
  inOffsets[n] = wr;
  return wr;
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
