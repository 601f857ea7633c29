// Mathematical identities of the iteration (no outside source needed).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { fromDenseEdges } from "../../workers/src/core/graph";
import { rank, RankPool, type RankParams } from "../../workers/src/engine/rank";
import { applyPolicies, l1, PARAMS, prng, randomEdges, sameBits, toGraph } from "./rank-test-graphs";

let pool: RankPool;
beforeAll(() => {
  pool = new RankPool({ threads: 2 });
});
afterAll(() => pool.close());

const tight: Partial<RankParams> = { tolerance: 1e-14, maxIterations: 10_000 };

describe("probability vector", () => {
  for (const [dangling, weighted, seeded] of [["teleport", false, false], ["uniform", true, true], ["teleport", true, true]] as const) {
    it(`sums to 1 and is non-negative (${dangling} dangling, ${weighted ? "weighted" : "unweighted"}, ${seeded ? "seeds" : "uniform"})`, async () => {
      for (let c = 0; c < 8; c++) {
        const e = applyPolicies(randomEdges(300 + c, 500 + 700 * c, 3), true);
        const teleport: RankParams["teleport"] = seeded
          ? { kind: "seeds", seeds: [{ node: 0, weight: 2 }, { node: e.n - 1, weight: 1 }] }
          : { kind: "uniform" };
        const r = await rank(toGraph(e), { ...PARAMS, dangling, weighted, teleport }, { pool });
        expect(r.scores.every((x) => x >= 0)).toBe(true);
        expect(Math.abs(r.scores.reduce((a, b) => a + b, 0) - 1)).toBeLessThan(1e-12);
      }
    });
  }
});

describe("zero cases", () => {
  it("a graph without edges keeps the teleport vector: every node is dangling", async () => {
    const g = fromDenseEdges(5, new Uint32Array(0), new Uint32Array(0));
    const r = await rank(g, PARAMS, { pool });
    expect(r.converged).toBe(true);
    expect(Array.from(r.scores)).toEqual(Array(5).fill(0.2));
    expect(r.danglingMass[0]).toBeCloseTo(1, 15);
    const seeded = await rank(g, { ...PARAMS, teleport: { kind: "seeds", seeds: [{ node: 2, weight: 1 }] } }, { pool });
    expect(Array.from(seeded.scores)).toEqual([0, 0, 1, 0, 0]);
  });

  it("maxIterations 0 returns x_0 = t unconverged, and the empty graph is refused", async () => {
    const g = fromDenseEdges(4, Uint32Array.of(0, 1), Uint32Array.of(1, 2));
    const r = await rank(g, { ...PARAMS, maxIterations: 0 }, { pool });
    expect(r).toMatchObject({ iterations: 0, stopReason: "iteration-cap", converged: false, residuals: [] });
    expect(Array.from(r.scores)).toEqual([0.25, 0.25, 0.25, 0.25]);
    await expect(rank(fromDenseEdges(0, new Uint32Array(0), new Uint32Array(0)), PARAMS, { pool })).rejects.toThrow(/graph\.n/);
  });
});

describe("nodes without in-edges", () => {
  it("score exactly (1−α)/n + α·D/n, D the dangling mass of the iterate the last step read", async () => {
    const e = applyPolicies(randomEdges(77, 3000, 2, 0.3), true);
    const g = toGraph(e);
    const a = 0.85;
    const r = await rank(g, { ...PARAMS, dangling: "uniform" }, { pool });
    const D = r.danglingMass[r.danglingMass.length - 2];
    const n = g.n;
    const expected = (1 - a) * (1 / n) + a * D * (1 / n);
    let checked = 0;
    for (let v = 0; v < n; v++) {
      if (g.inOffsets[v + 1] !== g.inOffsets[v]) continue;
      expect(r.scores[v]).toBe(expected);
      checked++;
    }
    expect(checked).toBeGreaterThan(100);
  });
});

describe("symmetry and relabelling", () => {
  it("automorphically equivalent nodes score exactly alike (a wheel: hub 0, rim 1..k)", async () => {
    const k = 9;
    const src: number[] = [];
    const dst: number[] = [];
    for (let i = 1; i <= k; i++) {
      src.push(0, i, i);
      dst.push(i, (i % k) + 1, 0);
    }
    const g = fromDenseEdges(k + 1, Uint32Array.from(src), Uint32Array.from(dst));
    const r = await rank(g, { ...PARAMS, ...tight }, { pool });
    for (let i = 2; i <= k; i++) expect(r.scores[i]).toBe(r.scores[1]);
    expect(r.scores[0]).not.toBe(r.scores[1]);
  });

  it("permuting the input edges changes no bit", async () => {
    const e = applyPolicies(randomEdges(5, 20_000, 4), true);
    const perm = [...e.src.keys()];
    const rnd = prng(6);
    for (let i = perm.length - 1; i > 0; i--) {
      const j = Math.floor(rnd() * (i + 1));
      [perm[i], perm[j]] = [perm[j], perm[i]];
    }
    const shuffled = { n: e.n, src: perm.map((i) => e.src[i]), dst: perm.map((i) => e.dst[i]), weight: perm.map((i) => e.weight[i]) };
    const a = await rank(toGraph(e), { ...PARAMS, weighted: true }, { pool });
    const b = await rank(toGraph(shuffled), { ...PARAMS, weighted: true }, { pool });
    expect(sameBits(a.scores, b.scores)).toBe(true);
  });

  it("relabelling the nodes permutes the scores (up to rounding order)", async () => {
    const e = applyPolicies(randomEdges(8, 10_000, 4), false);
    const rnd = prng(9);
    const label = [...Array(e.n).keys()];
    for (let i = e.n - 1; i > 0; i--) {
      const j = Math.floor(rnd() * (i + 1));
      [label[i], label[j]] = [label[j], label[i]];
    }
    const relabelled = { ...e, src: e.src.map((s) => label[s]), dst: e.dst.map((d) => label[d]) };
    const a = await rank(toGraph(e), { ...PARAMS, ...tight, weighted: true }, { pool });
    const b = await rank(toGraph(relabelled), { ...PARAMS, ...tight, weighted: true }, { pool });
    let worst = 0;
    for (let v = 0; v < e.n; v++) worst = Math.max(worst, Math.abs(a.scores[v] - b.scores[label[v]]) / a.scores[v]);
    expect(worst).toBeLessThan(1e-12);
    expect(a.iterations).toBe(b.iterations);
  });
});

describe("convergence", () => {
  // Closed clusters (directed cycles) mix slowly: the residual shrinks by about α per step, the worst case.
  function cycles(count: number, len: number) {
    const src: number[] = [];
    const dst: number[] = [];
    for (let c = 0; c < count; c++) {
      for (let i = 0; i < len; i++) {
        src.push(c * len + i);
        dst.push(c * len + ((i + 1) % len));
      }
      if (c > 0) {
        src.push(c * len);
        dst.push(0);
      }
    }
    return fromDenseEdges(count * len, Uint32Array.from(src), Uint32Array.from(dst));
  }

  it("iterations stay within log(τ/2)/log α + 1", async () => {
    for (const [tolerance, damping] of [[1e-8, 0.85], [1e-10, 0.85], [1e-6, 0.95]] as const) {
      for (const g of [cycles(50, 7), toGraph(applyPolicies(randomEdges(12, 5000, 3), true))]) {
        const r = await rank(g, { ...PARAMS, tolerance, damping }, { pool });
        expect(r.converged).toBe(true);
        expect(r.iterations).toBeLessThanOrEqual(Math.ceil(Math.log(tolerance / 2) / Math.log(damping)) + 1);
      }
    }
  });

  it("the a-posteriori bound α/(1−α)·r holds against a run to 1e-14", async () => {
    for (const g of [cycles(30, 5), toGraph(applyPolicies(randomEdges(13, 4000, 2, 0.4), true))]) {
      const pi = (await rank(g, { ...PARAMS, tolerance: 1e-14, maxIterations: 10_000 }, { pool })).scores;
      for (const maxIterations of [1, 3, 10, 30]) {
        const r = await rank(g, { ...PARAMS, maxIterations }, { pool });
        expect(r.stopReason).toBe("iteration-cap");
        expect(r.errorBound).toBeCloseTo((0.85 / 0.15) * r.residual, 15);
        expect(l1(r.scores, pi)).toBeLessThanOrEqual(r.errorBound + 1e-13);
      }
    }
  });

  it("stops with iteration-cap, not converged, when the cap comes first", async () => {
    const r = await rank(cycles(10, 4), { ...PARAMS, maxIterations: 5 }, { pool });
    expect(r).toMatchObject({ stopReason: "iteration-cap", converged: false, iterations: 5 });
    expect(r.residuals).toHaveLength(5);
  });
});

describe("personalization", () => {
  it("mixing two seed vectors mixes the results only when dangling mass is spread uniformly", async () => {
    const g = toGraph(applyPolicies(randomEdges(21, 2000, 3, 0.3), true));
    const s1 = [{ node: 3, weight: 1 }];
    const s2 = [{ node: 1500, weight: 1 }];
    const mix = [{ node: 3, weight: 0.3 }, { node: 1500, weight: 0.7 }];
    const run = (dangling: "uniform" | "teleport", seeds: { node: number; weight: number }[]) =>
      rank(g, { ...PARAMS, ...tight, dangling, teleport: { kind: "seeds", seeds } }, { pool });
    const gap = async (dangling: "uniform" | "teleport") => {
      const [a, b, m] = [await run(dangling, s1), await run(dangling, s2), await run(dangling, mix)];
      const lin = a.scores.map((x, i) => 0.3 * x + 0.7 * b.scores[i]);
      return l1(m.scores, lin);
    };
    expect(await gap("uniform")).toBeLessThan(1e-11);
    expect(await gap("teleport")).toBeGreaterThan(1e-4);
  });
});
