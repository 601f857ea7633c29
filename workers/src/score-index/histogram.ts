// Score distribution on a log scale, as served with a run's results.
import type { Histogram } from "../../../api/contracts/runs";

const BINS_PER_DECADE = 4;

/**
 * count_e = #{ v : 10^(e/4) ≤ s_v < 10^((e+1)/4) } for e between the bins of the smallest and largest positive
 * score; scores ≤ 0 are counted as zeros. Independent of the order of `scores`.
 * @example logHistogram(Float64Array.of(0.5, 0.25, 0.25)).bins.length // 2
 */
export function logHistogram(scores: Float64Array): Histogram {
  let zeros = 0;
  let min = Infinity;
  let max = -Infinity;
  for (const s of scores) {
    if (s <= 0) {
      zeros++;
      continue;
    }
    if (s < min) min = s;
    if (s > max) max = s;
  }
  if (min === Infinity) return { bins: [], zeros, nodes: scores.length, minScore: null, maxScore: null };
  const lo = Math.floor(Math.log10(min) * BINS_PER_DECADE);
  const hi = Math.floor(Math.log10(max) * BINS_PER_DECADE);
  const counts = new Array<number>(hi - lo + 1).fill(0);
  for (const s of scores) {
    if (s <= 0) continue;
    const b = Math.min(hi, Math.max(lo, Math.floor(Math.log10(s) * BINS_PER_DECADE))) - lo;
    counts[b]++;
  }
  return {
    bins: counts.map((count, i) => ({ min: 10 ** ((lo + i) / BINS_PER_DECADE), max: 10 ** ((lo + i + 1) / BINS_PER_DECADE), count })),
    zeros,
    nodes: scores.length,
    minScore: min,
    maxScore: max,
  };
}
