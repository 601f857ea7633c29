import { describe, expect, it } from "vitest";
import { compareColumns } from "../../api/src/features/compare/compare.service";
import { averageRanks, kendallTauB, rankBiasedOverlap, spearmanRho } from "../../api/src/features/compare/rank-correlation";

const f = (values: number[]) => Float64Array.from(values);

/** Kendall tau-b by its definition, over all n(n−1)/2 pairs. */
function bruteKendall(x: Float64Array, y: Float64Array): number | null {
  let concordant = 0;
  let discordant = 0;
  let tiesX = 0;
  let tiesY = 0;
  let pairs = 0;
  for (let i = 0; i < x.length; i++) {
    for (let j = i + 1; j < x.length; j++) {
      pairs++;
      const dx = Math.sign(x[i] - x[j]);
      const dy = Math.sign(y[i] - y[j]);
      if (dx === 0) tiesX++;
      if (dy === 0) tiesY++;
      if (dx !== 0 && dy !== 0) {
        if (dx === dy) concordant++;
        else discordant++;
      }
    }
  }
  const denominator = Math.sqrt((pairs - tiesX) * (pairs - tiesY));
  return denominator === 0 ? null : (concordant - discordant) / denominator;
}

/** Spearman rho by its definition: Pearson correlation of average ranks computed by counting, O(n²). */
function bruteSpearman(x: Float64Array, y: Float64Array): number | null {
  const rank = (v: Float64Array) =>
    Array.from(v, (value) => {
      let less = 0;
      let equal = 0;
      for (const other of v) {
        if (other < value) less++;
        else if (other === value) equal++;
      }
      return less + (equal + 1) / 2;
    });
  const rx = rank(x);
  const ry = rank(y);
  const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
  const mx = mean(rx);
  const my = mean(ry);
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < rx.length; i++) {
    sxy += (rx[i] - mx) * (ry[i] - my);
    sxx += (rx[i] - mx) ** 2;
    syy += (ry[i] - my) ** 2;
  }
  return sxx === 0 || syy === 0 ? null : sxy / Math.sqrt(sxx * syy);
}

function randomScores(n: number, levels: number, seed: number): Float64Array {
  let state = seed >>> 0;
  return Float64Array.from({ length: n }, () => {
    state = (Math.imul(state, 1103515245) + 12345) >>> 0;
    return (state % levels) / levels;
  });
}

describe("Kendall tau-b and Spearman rho", () => {
  it("match hand-checked small cases", () => {
    expect(kendallTauB(f([1, 2, 3, 4, 5]), f([1, 2, 3, 4, 5]))).toBe(1);
    expect(kendallTauB(f([1, 2, 3, 4, 5]), f([5, 4, 3, 2, 1]))).toBe(-1);
    // one discordant pair of six: (5 − 1) / 6
    expect(kendallTauB(f([1, 2, 3, 4]), f([1, 3, 2, 4]))).toBeCloseTo(2 / 3, 15);
    // Σd² = 2: 1 − 6·2 / (4·15)
    expect(spearmanRho(f([1, 2, 3, 4]), f([1, 3, 2, 4]))).toBeCloseTo(0.8, 15);
    // four concordant pairs, one tied in x only, one tied in y only: 4 / √(5·5)
    expect(kendallTauB(f([1, 2, 2, 3]), f([1, 2, 3, 3]))).toBeCloseTo(0.8, 15);
    // average ranks [1, 2.5, 2.5, 4] and [1, 2, 3.5, 3.5]: 3.75 / 4.5
    expect(spearmanRho(f([1, 2, 2, 3]), f([1, 2, 3, 3]))).toBeCloseTo(3.75 / 4.5, 15);
    expect(Array.from(averageRanks(f([0.3, 0.1, 0.3, 0.2])))).toEqual([3.5, 1, 3.5, 2]);
  });

  it("are null for fewer than two items or a constant side", () => {
    expect(kendallTauB(f([1]), f([2]))).toBeNull();
    expect(spearmanRho(f([]), f([]))).toBeNull();
    expect(kendallTauB(f([1, 1, 1]), f([1, 2, 3]))).toBeNull();
    expect(spearmanRho(f([1, 2, 3]), f([4, 4, 4]))).toBeNull();
  });

  it.each([
    [2, 2, 1],
    [50, 1000, 2],
    [300, 7, 3],
    [1000, 40, 4],
    [777, 1_000_000, 5],
  ])("agree with the O(n²) definitions (n = %i, %i score levels)", (n, levels, seed) => {
    const x = randomScores(n, levels, seed);
    const y = randomScores(n, levels, seed * 7919);
    for (let i = 0; i < n; i += 3) y[i] = x[i]; // correlated, with joint ties
    const tau = kendallTauB(x, y);
    const brute = bruteKendall(x, y);
    if (brute === null) expect(tau).toBeNull();
    else expect(tau).toBeCloseTo(brute, 12);
    const rho = spearmanRho(x, y);
    const bruteRho = bruteSpearman(x, y);
    if (bruteRho === null) expect(rho).toBeNull();
    else expect(rho).toBeCloseTo(bruteRho, 12);
  });
});

describe("rank-biased overlap (extrapolated, equal depths)", () => {
  it("is 1 for identical rankings and 0 for disjoint ones", () => {
    const list = ["a", "b", "c", "d", "e"];
    expect(rankBiasedOverlap(list, list, 0.9)).toBeCloseTo(1, 14);
    expect(rankBiasedOverlap(list, ["v", "w", "x", "y", "z"], 0.9)).toBe(0);
  });

  it("matches a hand computation for a swapped head", () => {
    // X = [0, 2, 3]: 0.1/0.9 · (0 + 0.81 + 0.729) + 1 · 0.729 = 0.9
    expect(rankBiasedOverlap(["a", "b", "c"], ["b", "a", "c"], 0.9)).toBeCloseTo(0.9, 14);
  });

  it("weighs disagreement at the top more than at the bottom", () => {
    const base = ["a", "b", "c", "d", "e", "f"];
    const topSwap = ["b", "a", "c", "d", "e", "f"];
    const bottomSwap = ["a", "b", "c", "d", "f", "e"];
    expect(rankBiasedOverlap(base, topSwap, 0.9)).toBeLessThan(rankBiasedOverlap(base, bottomSwap, 0.9));
  });
});

describe("comparing two score columns", () => {
  it("matches nodes by id, finds movers and one-sided nodes", () => {
    const a = { ids: ["harbour", "council", "ferry", "museum", "farm-1"], scores: f([0.4, 0.3, 0.15, 0.1, 0.05]) };
    const b = { ids: ["council", "harbour", "museum", "ferry", "tourism"], scores: f([0.35, 0.3, 0.2, 0.1, 0.05]) };
    const result = compareColumns(a, b, 3, 10);
    expect(result.matchedNodes).toBe(4);
    expect(result.onlyInACount).toBe(1);
    expect(result.onlyInA).toEqual([{ nodeId: "farm-1", rank: 5, score: 0.05 }]);
    expect(result.onlyInB).toEqual([{ nodeId: "tourism", rank: 5, score: 0.05 }]);
    // common pairs by score: (0.4,0.3) (0.3,0.35) (0.15,0.1) (0.1,0.2): two swaps of six pairs
    expect(result.kendallTau).toBeCloseTo((4 - 2) / 6, 14);
    expect(result.topK).toEqual({ k: 3, overlap: 2, fraction: 2 / 3 });
    expect(result.moversUp.map((m) => [m.nodeId, m.change])).toEqual([
      ["council", 1],
      ["museum", 1],
    ]);
    expect(result.moversDown.map((m) => [m.nodeId, m.rankA, m.rankB])).toEqual([
      ["harbour", 1, 2],
      ["ferry", 3, 4],
    ]);
  });
});
