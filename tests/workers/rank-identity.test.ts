// Results are the same bits for any thread count, shard count and scheduling.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { BLOCK_NODES } from "../../workers/src/core/graph";
import { rank, RankPool, type RankParams } from "../../workers/src/engine/rank";
import { applyPolicies, PARAMS, randomEdges, sameBits, toGraph } from "./rank-test-graphs";

const pools = new Map<number, RankPool>();
beforeAll(() => {
  for (const t of [1, 2]) pools.set(t, new RankPool({ threads: t }));
});
afterAll(() => Promise.all([...pools.values()].map((p) => p.close())));

describe("bit-identical across threads and shards", () => {
  const e = applyPolicies(randomEdges(42, 12 * BLOCK_NODES + 123, 5, 0.25), true);
  const g = toGraph(e);
  const variants: [string, Partial<RankParams>, "js" | "wasm"][] = [
    ["unweighted, uniform teleport, JS kernel", {}, "js"],
    ["unweighted, uniform teleport, wasm kernel", {}, "wasm"],
    ["weighted, seeds, dangling follows teleport", { weighted: true, teleport: { kind: "seeds", seeds: [{ node: 7, weight: 1 }, { node: 40_000, weight: 3 }] } }, "wasm"],
    ["weighted, seeds, uniform dangling", { weighted: true, dangling: "uniform", teleport: { kind: "seeds", seeds: [{ node: 9, weight: 1 }] } }, "js"],
  ];
  for (const [name, p, kernel] of variants) {
    it(name, async () => {
      let first: Float64Array | null = null;
      let firstResiduals: number[] = [];
      for (const threads of [1, 2]) {
        for (const shards of [1, 2, 3, 7]) {
          const r = await rank(g, { ...PARAMS, ...p, shards }, { pool: pools.get(threads), kernel });
          expect(r.converged).toBe(true);
          if (first === null) {
            first = r.scores;
            firstResiduals = r.residuals;
            continue;
          }
          expect(sameBits(r.scores, first), `threads ${threads}, shards ${shards}`).toBe(true);
          expect(r.residuals).toEqual(firstResiduals);
        }
      }
    });
  }

  it("a graph whose arrays already live in shared memory gives the same bits on the JS kernel", async () => {
    const share = <T extends Uint32Array | Float64Array>(a: T, make: (b: SharedArrayBuffer) => T): T => {
      const s = make(new SharedArrayBuffer(a.byteLength));
      s.set(a);
      return s;
    };
    const shared = {
      ...g,
      inOffsets: share(g.inOffsets, (b) => new Uint32Array(b)),
      sources: share(g.sources, (b) => new Uint32Array(b)),
      outWeight: share(g.outWeight, (b) => new Float64Array(b)),
      weights: g.weights && share(g.weights, (b) => new Float64Array(b)),
    };
    const a = await rank(g, { ...PARAMS, weighted: true }, { pool: pools.get(2) });
    const b = await rank(shared, { ...PARAMS, weighted: true }, { pool: pools.get(2), kernel: "js" });
    expect(sameBits(a.scores, b.scores)).toBe(true);
  });

  it("an unweighted run of a weighted graph uses out-edge counts, like the same graph without weights", async () => {
    const a = await rank(g, { ...PARAMS, weighted: false }, { pool: pools.get(2) });
    const b = await rank(toGraph(e, false), { ...PARAMS, weighted: true }, { pool: pools.get(2) });
    expect(sameBits(a.scores, b.scores)).toBe(true);
    const w = await rank(g, { ...PARAMS, weighted: true }, { pool: pools.get(2) });
    expect(sameBits(a.scores, w.scores)).toBe(false);
  });
});
