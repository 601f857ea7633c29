// Statistics of an ingest: what was read, what the graph became, and its degree distributions.

import type { Graph } from "../core/graph";
import type { FileFormat, IdKind } from "./sniff";

/** Log-binned histogram: bin 0 holds degree 0, bin k ≥ 1 holds degrees in [2^(k-1), 2^k). */
export interface DegreeBin {
  min: number;
  max: number;
  count: number;
}

export interface GraphStats {
  format: FileFormat & { gzip: boolean };
  /** Physical lines, data rows (good edge lines), and the rest. */
  lines: number;
  rows: number;
  commentLines: number;
  blankLines: number;
  headerLines: number;
  badLines: number;
  nodes: number;
  /** Edges of the graph (after the self-loop, direction and duplicate policies). */
  edges: number;
  /** Self-loop lines in the file, and how many of them the policy dropped. */
  selfLoops: number;
  selfLoopsDropped: number;
  /** Arcs merged into an identical earlier arc (0 when duplicates are kept). */
  duplicates: number;
  danglingNodes: number;
  idKind: IdKind;
  /** Range of the weight column (null without one). */
  weight: { min: number; max: number } | null;
  weighted: boolean;
  inDegree: DegreeBin[];
  outDegree: DegreeBin[];
  maxInDegree: number;
  maxOutDegree: number;
  /** sha256 of the raw file bytes (compressed bytes for gzip). */
  fingerprint: string;
  bytesRead: number;
  threads: number;
  idPath: "direct" | "hash";
  order: "out-degree" | "id";
  warnings: string[];
}

export function degreeHistogram(deg: Uint32Array): DegreeBin[] {
  const counts: number[] = [];
  for (let i = 0; i < deg.length; i++) {
    const d = deg[i];
    const bin = d === 0 ? 0 : 32 - Math.clz32(d);
    while (counts.length <= bin) counts.push(0);
    counts[bin]++;
  }
  return counts.map((count, k) => ({ min: k === 0 ? 0 : 2 ** (k - 1), max: k === 0 ? 0 : 2 ** k - 1, count }));
}

/** Degree histograms of g; `given` (from the build) saves a pass over the edges. */
export function degreeStats(
  g: Graph,
  given?: { in: Uint32Array; out: Uint32Array },
): {
  inDegree: DegreeBin[];
  outDegree: DegreeBin[];
  maxInDegree: number;
  maxOutDegree: number;
  danglingNodes: number;
} {
  const { inDeg, outDeg } = given ? { inDeg: given.in, outDeg: given.out } : countDegrees(g);
  let maxIn = 0;
  for (let v = 0; v < g.n; v++) if (inDeg[v] > maxIn) maxIn = inDeg[v];
  let maxOut = 0;
  let dangling = 0;
  for (let u = 0; u < g.n; u++) {
    if (outDeg[u] > maxOut) maxOut = outDeg[u];
    if (g.outWeight[u] === 0) dangling++;
  }
  return {
    inDegree: degreeHistogram(inDeg),
    outDegree: degreeHistogram(outDeg),
    maxInDegree: maxIn,
    maxOutDegree: maxOut,
    danglingNodes: dangling,
  };
}

function countDegrees(g: Graph): { inDeg: Uint32Array; outDeg: Uint32Array } {
  const inDeg = new Uint32Array(g.n);
  const outDeg = new Uint32Array(g.n);
  // A repeated source in an in-list (Graph.mergedEdges) is one edge: count it once.
  const repeats = g.mergedEdges !== undefined;
  for (let v = 0; v < g.n; v++) {
    const lo = g.inOffsets[v];
    const hi = g.inOffsets[v + 1];
    let d = hi - lo;
    if (repeats) {
      for (let e = lo; e < hi; e++) {
        if (e > lo && g.sources[e] === g.sources[e - 1]) d--;
        else outDeg[g.sources[e]]++;
      }
    }
    inDeg[v] = d;
  }
  if (!repeats) for (let e = 0; e < g.m; e++) outDeg[g.sources[e]]++;
  return { inDeg, outDeg };
}
