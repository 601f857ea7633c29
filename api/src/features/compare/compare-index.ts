import type { Mover } from "../../../contracts/compare";
import { matchSlots } from "../../../../workers/src/score-index/join";
import type { ScoreIndex } from "../../../../workers/src/score-index/read";
import { RBO_P, type ComparisonCore } from "./compare-columns";
import { kendallTauB, rankBiasedOverlap, spearmanRho } from "./rank-correlation";

const CHUNK = 1 << 16;
const RANDOM_CHUNK = 256;

/** Sequential window over one section of an index: reads a chunk when the wanted position leaves it. */
class Window<T extends Float64Array | Uint32Array> {
  begin = 0;
  end = 0;
  values: T | null = null;

  constructor(
    private readonly read: (from: number, count: number) => Promise<T>,
    private readonly n: number,
    private readonly size: number,
  ) {}

  async seek(i: number): Promise<void> {
    const count = Math.min(this.size, this.n - i);
    this.values = await this.read(i, count);
    this.begin = i;
    this.end = i + count;
  }
}

type MoverAt = Omit<Mover, "nodeId"> & { slot: number };

/** The first `limit` rows (rank − 1) not marked in `paired`, best first. */
function firstUnpaired(paired: Uint8Array, limit: number): number[] {
  const rows: number[] = [];
  for (let row = 0; row < paired.length && rows.length < limit; row++) if (!paired[row]) rows.push(row);
  return rows;
}

async function oneSided(index: ScoreIndex, rows: number[]): Promise<ComparisonCore["onlyInA"]> {
  return Promise.all(
    rows.map(async (row) => {
      const [slot] = await index.order(row, 1);
      const [score] = await index.scores(slot, 1);
      return { nodeId: await index.idText(slot), rank: row + 1, score };
    }),
  );
}

/**
 * Compares run b with run a from their score indexes, with the same results as compareColumns over their score
 * files: pairs are collected in a's rank order, so every statistic sees its input in the same order. Reads each
 * index's scores and ranks once, in chunks; ids only when the two id tables differ (one merge pass).
 */
export async function compareIndexes(a: ScoreIndex, b: ScoreIndex, k: number, limit: number): Promise<ComparisonCore> {
  const { match, monotone } = await matchSlots(a, b);
  const depth = Math.min(k, a.n, b.n);
  // x, y by a's row (rank − 1); rows without a partner are squeezed out afterwards.
  const x = new Float64Array(a.n);
  const y = new Float64Array(a.n);
  const pairedA = new Uint8Array(a.n);
  const pairedB = new Uint8Array(b.n);
  const candidates: MoverAt[] = [];
  const size = monotone ? CHUNK : RANDOM_CHUNK;
  const scoresB = new Window((from, count) => b.scores(from, count), b.n, size);
  const ranksB = new Window((from, count) => b.ranks(from, count), b.n, size);
  for (let s0 = 0; s0 < a.n; s0 += CHUNK) {
    const count = Math.min(CHUNK, a.n - s0);
    const [scoresA, ranksA] = await Promise.all([a.scores(s0, count), a.ranks(s0, count)]);
    for (let i = 0; i < count; i++) {
      const slot = s0 + i;
      const other = match ? match[slot] : slot;
      if (other < 0) continue;
      if (other < scoresB.begin || other >= scoresB.end) await Promise.all([scoresB.seek(other), ranksB.seek(other)]);
      const rowA = ranksA[i] - 1;
      const rowB = (ranksB.values as Uint32Array)[other - ranksB.begin] - 1;
      x[rowA] = scoresA[i];
      y[rowA] = (scoresB.values as Float64Array)[other - scoresB.begin];
      pairedA[rowA] = 1;
      pairedB[rowB] = 1;
      if ((rowA < depth || rowB < depth) && rowA !== rowB) candidates.push({ slot, rankA: rowA + 1, rankB: rowB + 1, change: rowA - rowB });
    }
  }
  let matched = 0;
  for (let row = 0; row < a.n; row++) {
    if (!pairedA[row]) continue;
    x[matched] = x[row];
    y[matched] = y[row];
    matched++;
  }
  const xs = x.subarray(0, matched);
  const ys = y.subarray(0, matched);

  const [topA, topB] = await Promise.all([a.order(0, depth), b.order(0, depth)]);
  // Nodes named by their slot in b (a's slot when b lacks them): equal names = equal original ids.
  const keyA = Array.from(topA, (s) => {
    const other = match ? match[s] : s;
    return other >= 0 ? `b${other}` : `a${s}`;
  });
  const keyB = Array.from(topB, (s) => `b${s}`);
  const inTopB = new Set(keyB);
  const overlap = keyA.reduce((n, key) => n + (inTopB.has(key) ? 1 : 0), 0);

  const up = candidates.filter((m) => m.change > 0).sort((p, q) => q.change - p.change || p.rankB - q.rankB).slice(0, limit);
  const down = candidates.filter((m) => m.change < 0).sort((p, q) => p.change - q.change || p.rankA - q.rankA).slice(0, limit);
  const named = (list: MoverAt[]) => Promise.all(list.map(async ({ slot, ...m }) => ({ nodeId: await a.idText(slot), ...m })));

  const [moversUp, moversDown, onlyInA, onlyInB] = await Promise.all([
    named(up),
    named(down),
    oneSided(a, firstUnpaired(pairedA, limit)),
    oneSided(b, firstUnpaired(pairedB, limit)),
  ]);
  return {
    matchedNodes: matched,
    onlyInACount: a.n - matched,
    onlyInBCount: b.n - matched,
    kendallTau: kendallTauB(xs, ys),
    spearmanRho: spearmanRho(xs, ys),
    topK: { k: depth, overlap, fraction: depth > 0 ? overlap / depth : 0 },
    rbo: { p: RBO_P, depth, value: rankBiasedOverlap(keyA, keyB, RBO_P) },
    moversUp,
    moversDown,
    onlyInA,
    onlyInB,
  };
}
