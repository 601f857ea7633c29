// Published worked examples, each with its source beside the check.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { rank, RankPool, type RankParams } from "../../workers/src/engine/rank";
import { fromPairs, PARAMS } from "./rank-test-graphs";

let pool: RankPool;
beforeAll(() => {
  pool = new RankPool({ threads: 2 });
});
afterAll(() => pool.close());

const exact: Partial<RankParams> = { tolerance: 1e-14, maxIterations: 10_000 };

describe("published examples", () => {
  // C. Moler, Numerical Computing with MATLAB, SIAM 2004, §2.11 (pagerank.m): the six-page "tiny web", p = 0.85.
  it("Moler's tiny web: six pages, page 5 dangling and spread uniformly", async () => {
    const g = fromPairs(6, [[1, 2], [1, 6], [2, 3], [2, 4], [3, 4], [3, 5], [3, 6], [4, 1], [6, 1]]);
    for (const dangling of ["teleport", "uniform"] as const) {
      const r = await rank(g, { ...PARAMS, ...exact, dangling }, { pool });
      expect(r.stopReason).toBe("converged");
      const published = [0.321, 0.1705, 0.1066, 0.1368, 0.0643, 0.2007];
      const recomputed = [0.32101694, 0.17054304, 0.10659163, 0.13679259, 0.0643118, 0.200744];
      published.forEach((p, i) => expect(Math.abs(r.scores[i] - p)).toBeLessThan(5e-5));
      recomputed.forEach((p, i) => expect(Math.abs(r.scores[i] - p)).toBeLessThan(5e-9));
    }
  });

  // Leskovec, Rajaraman & Ullman, Mining of Massive Datasets, ch. 5: the spider trap y, a, m with β = 0.8.
  const Y = 1;
  const A = 2;
  const M = 3;
  it("spider trap with self-loops kept: y 7/33, a 5/33, m 21/33", async () => {
    const g = fromPairs(3, [[Y, Y], [Y, A], [A, Y], [A, M], [M, M]]);
    const r = await rank(g, { ...PARAMS, ...exact, damping: 0.8 }, { pool });
    expect(r.scores[0]).toBeCloseTo(7 / 33, 13);
    expect(r.scores[1]).toBeCloseTo(5 / 33, 13);
    expect(r.scores[2]).toBeCloseTo(21 / 33, 13);
  });

  it("spider trap with self-loops dropped: a 0.391304, y 0.304348, m 0.304348 (m becomes dangling)", async () => {
    const g = fromPairs(3, [[Y, A], [A, Y], [A, M]]);
    const r = await rank(g, { ...PARAMS, ...exact, damping: 0.8, dangling: "uniform" }, { pool });
    expect(r.scores[1]).toBeCloseTo(0.391304, 6);
    expect(r.scores[0]).toBeCloseTo(0.304348, 6);
    expect(r.scores[2]).toBeCloseTo(0.304348, 6);
  });

  // A. Langville & C. Meyer, "Deeper inside PageRank", Internet Mathematics 1(3), 2004 (as recalled): six nodes,
  // node 2 dangling with a uniform row, α = 0.9. Secondary check: the values were recomputed, not re-read.
  it("Langville & Meyer six nodes: π and the order 4 6 5 2 3 1", async () => {
    const g = fromPairs(6, [[1, 2], [1, 3], [3, 1], [3, 2], [3, 5], [4, 5], [4, 6], [5, 4], [5, 6], [6, 4]]);
    const r = await rank(g, { ...PARAMS, ...exact, damping: 0.9, dangling: "uniform" }, { pool });
    const recomputed = [0.03721197, 0.05395735, 0.04150565, 0.37508082, 0.20599833, 0.28624589];
    recomputed.forEach((p, i) => expect(Math.abs(r.scores[i] - p)).toBeLessThan(5e-9));
    const order = [...r.scores.keys()].sort((a, b) => r.scores[b] - r.scores[a]).map((i) => i + 1);
    expect(order).toEqual([4, 6, 5, 2, 3, 1]);
  });

  // Single edge 1→2 at damping 0.85 (arithmetic by hand): node 2 is dangling.
  describe("single edge 1→2", () => {
    const g = fromPairs(2, [[1, 2]]);
    it("uniform teleport: 20/57 and 37/57", async () => {
      const r = await rank(g, { ...PARAMS, ...exact, dangling: "uniform" }, { pool });
      expect(r.scores[0]).toBeCloseTo(20 / 57, 14);
      expect(r.scores[1]).toBeCloseTo(37 / 57, 14);
    });
    const seeds = { kind: "seeds" as const, seeds: [{ node: 0, weight: 0 }, { node: 1, weight: 1 }] };
    it("personalized {1: 0, 2: 1}, dangling spread uniformly: 17/57 and 40/57", async () => {
      const r = await rank(g, { ...PARAMS, ...exact, teleport: seeds, dangling: "uniform" }, { pool });
      expect(r.scores[0]).toBeCloseTo(17 / 57, 14);
      expect(r.scores[1]).toBeCloseTo(40 / 57, 14);
    });
    it("personalized {1: 0, 2: 1}, dangling follows the teleport vector: (0, 1)", async () => {
      const r = await rank(g, { ...PARAMS, ...exact, teleport: seeds, dangling: "teleport" }, { pool });
      expect(r.scores[0]).toBe(0);
      expect(r.scores[1]).toBe(1);
    });
  });
});
