// Graph builders shared by the engine tests: seeded random edge lists and the edge policies applied by ingest.
import { fromDenseEdges, type Graph, type NodeIds } from "../../workers/src/core/graph";
import type { RankParams } from "../../workers/src/engine/rank";

import { mulberry32 as prng } from "../../workers/src/core/prng";

export { prng };

export interface EdgeList {
  n: number;
  src: number[];
  dst: number[];
  weight: number[];
}

/**
 * A random directed edge list with dangling nodes, duplicate edges and self-loops: about `danglingShare` of the
 * nodes have no out-edges, the rest pick targets with a skew towards low ids.
 */
export function randomEdges(seed: number, n: number, avgOut: number, danglingShare = 0.2): EdgeList {
  const rnd = prng(seed);
  const e: EdgeList = { n, src: [], dst: [], weight: [] };
  for (let u = 0; u < n; u++) {
    if (rnd() < danglingShare) continue;
    const k = 1 + Math.floor(rnd() * 2 * avgOut);
    for (let j = 0; j < k; j++) {
      const r = rnd();
      const v = rnd() < 0.1 ? u : Math.floor(r * r * n);
      e.src.push(u);
      e.dst.push(v);
      e.weight.push(0.25 + Math.floor(rnd() * 8) / 2);
      if (rnd() < 0.1) {
        e.src.push(u);
        e.dst.push(v);
        e.weight.push(1);
      }
    }
  }
  return e;
}

/** Ingest's default policies: optionally drop self-loops, merge duplicate (src, dst) pairs by summing weights. */
/**
 * A skewed random edge list as text, one "u v" line per edge: sources spread as a², targets as b³ over n ids from
 * `base`; a `repeats` share of lines written twice, a `selfLoops` share of lines u → u, and ids where `skip(u)` holds
 * never a source (dangling nodes).
 */
export function skewedEdgeText(
  seed: number,
  n: number,
  lines: number,
  o: { base: number; repeats: number; selfLoops?: number; skip?: (u: number) => boolean },
): string {
  const rnd = prng(seed);
  const out: string[] = [];
  for (let i = 0; i < lines; i++) {
    const a = rnd();
    const b = rnd();
    const u = o.base + Math.floor(a * a * n);
    const v = o.selfLoops && rnd() < o.selfLoops ? u : o.base + Math.floor(b * b * b * n);
    if (o.skip?.(u)) continue;
    out.push(`${u}\t${v}`);
    if (rnd() < o.repeats) out.push(`${u}\t${v}`);
  }
  return `${out.join("\n")}\n`;
}

export function applyPolicies(e: EdgeList, keepSelfLoops: boolean): EdgeList {
  const merged = new Map<string, number>();
  const order: [number, number][] = [];
  for (let i = 0; i < e.src.length; i++) {
    if (!keepSelfLoops && e.src[i] === e.dst[i]) continue;
    const key = `${e.src[i]}:${e.dst[i]}`;
    const w = merged.get(key);
    if (w === undefined) order.push([e.src[i], e.dst[i]]);
    merged.set(key, (w ?? 0) + e.weight[i]);
  }
  return {
    n: e.n,
    src: order.map(([s]) => s),
    dst: order.map(([, d]) => d),
    weight: order.map(([s, d]) => merged.get(`${s}:${d}`) as number),
  };
}

export function toGraph(e: EdgeList, weighted = true): Graph {
  return fromDenseEdges(e.n, Uint32Array.from(e.src), Uint32Array.from(e.dst), weighted ? Float64Array.from(e.weight) : null);
}

/** Unweighted graph from 1-based (source, target) pairs as printed in the published examples. */
export function fromPairs(n: number, pairs: [number, number][]): Graph {
  return fromDenseEdges(n, Uint32Array.from(pairs.map(([s]) => s - 1)), Uint32Array.from(pairs.map(([, d]) => d - 1)));
}

export const PARAMS: RankParams = {
  damping: 0.85,
  tolerance: 1e-9,
  maxIterations: 1000,
  dangling: "teleport",
  teleport: { kind: "uniform" },
  weighted: false,
};

export function l1(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += Math.abs(a[i] - b[i]);
  return s;
}

export function sameBits(a: Float64Array, b: Float64Array): boolean {
  return Buffer.compare(Buffer.from(a.buffer, a.byteOffset, a.byteLength), Buffer.from(b.buffer, b.byteOffset, b.byteLength)) === 0;
}

/** String ids as the engine keeps them: UTF-8 bytes and offsets. */
export function stringIds(names: readonly string[]): NodeIds & { kind: "string" } {
  const enc = new TextEncoder();
  const parts = names.map((s) => enc.encode(s));
  const offsets = new Uint32Array(parts.length + 1);
  parts.forEach((p, i) => (offsets[i + 1] = offsets[i] + p.length));
  const bytes = new Uint8Array(offsets[parts.length]);
  parts.forEach((p, i) => bytes.set(p, offsets[i]));
  return { kind: "string", bytes, offsets };
}
