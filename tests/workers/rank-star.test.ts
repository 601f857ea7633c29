// A one-million-node star: an n·tolerance stopping rule would stop at once here; the plain L1 rule must not.
import { describe, expect, it } from "vitest";
import { fromDenseEdges } from "../../workers/src/core/graph";
import { rank, RankPool } from "../../workers/src/engine/rank";
import { PARAMS } from "./rank-test-graphs";

describe("one-million-node star", () => {
  it("converges to the exact hub score with the default tolerance", async () => {
    const n = 1_000_000;
    // Leaves 1..n−1 point at the hub 0; the hub is dangling.
    const src = Uint32Array.from({ length: n - 1 }, (_, i) => i + 1);
    const dst = new Uint32Array(n - 1);
    const g = fromDenseEdges(n, src, dst);
    const pool = new RankPool({ threads: 2 });
    try {
      const a = PARAMS.damping;
      const r = await rank(g, { ...PARAMS, dangling: "uniform" }, { pool });
      // h·(n − α − α²(n−1)) = (1−α)(1 + α(n−1)), from h = B(1 + α(n−1)) with B = (1 − α + α·h)/n.
      const hub = ((1 - a) * (1 + a * (n - 1))) / (n - a - a * a * (n - 1));
      expect(hub).toBeCloseTo(0.4595, 4);
      expect(r.converged).toBe(true);
      expect(Math.abs(r.scores[0] - hub)).toBeLessThan(r.errorBound + 1e-12);
      expect(Math.abs(r.scores[0] - hub)).toBeLessThan(1e-8);
    } finally {
      await pool.close();
    }
  });
});
