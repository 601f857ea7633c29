import type { Mover } from "../../../contracts/compare";
import { kendallTauB, rankBiasedOverlap, spearmanRho } from "./rank-correlation";

/** Node ids (as text) and scores in rank order: row i has rank i + 1. */
export interface ScoreColumns {
  ids: string[];
  scores: Float64Array;
}

export const RBO_P = 0.9;

export interface ComparisonCore {
  matchedNodes: number;
  onlyInACount: number;
  onlyInBCount: number;
  kendallTau: number | null;
  spearmanRho: number | null;
  topK: { k: number; overlap: number; fraction: number };
  rbo: { p: number; depth: number; value: number };
  moversUp: Mover[];
  moversDown: Mover[];
  onlyInA: { nodeId: string; rank: number; score: number }[];
  onlyInB: { nodeId: string; rank: number; score: number }[];
}

/**
 * Compares run b with run a. Both columns are in rank order (row i = rank i + 1). Movers are taken among common
 * nodes in either top-k (a node deep in the tail moving thousands of places says little); one-sided nodes are
 * listed best first.
 */
export function compareColumns(a: ScoreColumns, b: ScoreColumns, k: number, limit: number): ComparisonCore {
  const rowInB = new Map<string, number>();
  b.ids.forEach((id, row) => rowInB.set(id, row));
  const pairA: number[] = [];
  const pairB: number[] = [];
  const onlyInA: ComparisonCore["onlyInA"] = [];
  let onlyInACount = 0;
  const common = new Set<number>();
  for (let row = 0; row < a.ids.length; row++) {
    const other = rowInB.get(a.ids[row]);
    if (other === undefined) {
      onlyInACount++;
      if (onlyInA.length < limit) onlyInA.push({ nodeId: a.ids[row], rank: row + 1, score: a.scores[row] });
      continue;
    }
    pairA.push(row);
    pairB.push(other);
    common.add(other);
  }
  const onlyInB: ComparisonCore["onlyInB"] = [];
  let onlyInBCount = 0;
  for (let row = 0; row < b.ids.length; row++) {
    if (common.has(row)) continue;
    onlyInBCount++;
    if (onlyInB.length < limit) onlyInB.push({ nodeId: b.ids[row], rank: row + 1, score: b.scores[row] });
  }
  const x = Float64Array.from(pairA, (row) => a.scores[row]);
  const y = Float64Array.from(pairB, (row) => b.scores[row]);

  const depth = Math.min(k, a.ids.length, b.ids.length);
  const topA = a.ids.slice(0, depth);
  const topB = b.ids.slice(0, depth);
  const inTopB = new Set(topB);
  const overlap = topA.reduce((n, id) => n + (inTopB.has(id) ? 1 : 0), 0);

  const movers: Mover[] = [];
  for (let i = 0; i < pairA.length; i++) {
    if (pairA[i] >= depth && pairB[i] >= depth) continue;
    const change = pairA[i] - pairB[i];
    if (change !== 0) movers.push({ nodeId: a.ids[pairA[i]], rankA: pairA[i] + 1, rankB: pairB[i] + 1, change });
  }
  const moversUp = movers.filter((m) => m.change > 0).sort((p, q) => q.change - p.change || p.rankB - q.rankB).slice(0, limit);
  const moversDown = movers.filter((m) => m.change < 0).sort((p, q) => p.change - q.change || p.rankA - q.rankA).slice(0, limit);

  return {
    matchedNodes: pairA.length,
    onlyInACount,
    onlyInBCount,
    kendallTau: kendallTauB(x, y),
    spearmanRho: spearmanRho(x, y),
    topK: { k: depth, overlap, fraction: depth > 0 ? overlap / depth : 0 },
    rbo: { p: RBO_P, depth, value: rankBiasedOverlap(topA, topB, RBO_P) },
    moversUp,
    moversDown,
    onlyInA,
    onlyInB,
  };
}
