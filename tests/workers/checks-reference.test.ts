// Comparison with a general-purpose library: graphology 0.26 + graphology-metrics 2.4 `pagerank`
// (power iteration, uniform teleport, dangling mass spread uniformly; weights through getEdgeWeight).
// Its default stop is an n·tolerance rule with 100 iterations: a tiny tolerance and a high cap are passed instead.
import { DirectedGraph } from "graphology";
import pagerank from "graphology-metrics/centrality/pagerank";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { rank, RankPool } from "../../workers/src/engine/rank";
import { applyPolicies, l1, PARAMS, prng, randomEdges, toGraph, type EdgeList } from "./rank-test-graphs";

let pool: RankPool;
beforeAll(() => {
  pool = new RankPool({ threads: 2 });
});
afterAll(() => pool.close());

function reference(e: EdgeList, weighted: boolean): Float64Array {
  const g = new DirectedGraph();
  for (let v = 0; v < e.n; v++) g.addNode(String(v));
  e.src.forEach((s, i) => g.addDirectedEdge(String(s), String(e.dst[i]), { weight: e.weight[i] }));
  const pr = pagerank(g, {
    alpha: 0.85,
    tolerance: 1e-15,
    maxIterations: 100_000,
    getEdgeWeight: weighted ? "weight" : null,
  });
  return Float64Array.from({ length: e.n }, (_, v) => pr[String(v)]);
}

const CASES = 60;

describe("graphology-metrics pagerank as reference", () => {
  for (let c = 0; c < CASES; c++) {
    const weighted = c % 2 === 0;
    const keepSelfLoops = c % 3 !== 0;
    it(`random graph #${c} (${weighted ? "weighted" : "unweighted"}, self-loops ${keepSelfLoops ? "kept" : "dropped"})`, async () => {
      const rnd = prng(1000 + c);
      const n = c < 50 ? 2 + Math.floor(rnd() * 300) : 5000 + Math.floor(rnd() * 15_000);
      const raw = randomEdges(2000 + c, n, 1 + rnd() * 6, 0.05 + rnd() * 0.4);
      const e = applyPolicies(raw, keepSelfLoops);
      const want = reference(e, weighted);
      const r = await rank(
        toGraph(e),
        { ...PARAMS, weighted, dangling: "uniform", tolerance: 1e-14, maxIterations: 10_000, shards: 1 + (c % 4) },
        { pool },
      );
      expect(r.stopReason).toBe("converged");
      // Both sides carry a certified bound α/(1−α)·residual: theirs stops at residual < n·1e-15, ours at 1e-14.
      expect(l1(r.scores, want)).toBeLessThan((0.85 / 0.15) * (n * 1e-15 + 1e-14) + 1e-13);
    });
  }
});
