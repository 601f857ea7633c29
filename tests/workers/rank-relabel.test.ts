// Renumbering nodes for locality changes no score: results map back through the carried ids.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { degreeOrder, relabel } from "../../workers/src/core/relabel";
import { rank, RankPool } from "../../workers/src/engine/rank";
import { hubsFirst } from "../../workers/src/graph-store/build";
import { applyPolicies, PARAMS, prng, randomEdges, toGraph } from "./rank-test-graphs";

let pool: RankPool;
beforeAll(() => {
  pool = new RankPool({ threads: 2 });
});
afterAll(() => pool.close());

describe("relabel", () => {
  const g = toGraph(applyPolicies(randomEdges(55, 9000, 4), true));

  it("orders nodes by descending degree, ties by ascending id", () => {
    for (const by of ["out", "in"] as const) {
      const order = degreeOrder(g, by);
      const deg = (v: number) =>
        by === "in" ? g.inOffsets[v + 1] - g.inOffsets[v] : g.sources.reduce((s, u) => s + (u === v ? 1 : 0), 0);
      const degs = Array.from(order.subarray(0, 300), deg);
      for (let i = 1; i < degs.length; i++) {
        expect(degs[i]).toBeLessThanOrEqual(degs[i - 1]);
        if (degs[i] === degs[i - 1]) expect(order[i]).toBeGreaterThan(order[i - 1]);
      }
      expect(new Set(order).size).toBe(g.n);
    }
  });

  it("keeps the graph: same edges, weights, out-weights and ids under the new names", () => {
    const order = degreeOrder(g, "out");
    const r = relabel(g, order);
    expect(r.m).toBe(g.m);
    const newId = new Uint32Array(g.n);
    order.forEach((v, i) => (newId[v] = i));
    const edges = (x: typeof g, name: (v: number) => number) => {
      const out: string[] = [];
      for (let v = 0; v < x.n; v++) {
        for (let e = x.inOffsets[v]; e < x.inOffsets[v + 1]; e++) out.push(`${name(x.sources[e])}>${name(v)}:${x.weights?.[e]}`);
      }
      return out.sort();
    };
    expect(edges(r, (v) => v)).toEqual(edges(g, (v) => newId[v]));
    for (let i = 0; i < g.n; i++) {
      expect(r.outWeight[i]).toBe(g.outWeight[order[i]]);
      if (r.ids.kind === "integer" && g.ids.kind === "integer") expect(r.ids.ids[i]).toBe(g.ids.ids[order[i]]);
      const list = r.sources.subarray(r.inOffsets[i], r.inOffsets[i + 1]);
      for (let k = 1; k < list.length; k++) expect(list[k]).toBeGreaterThanOrEqual(list[k - 1]);
    }
  });

  it("gives the same scores (up to summation order) for every original id", async () => {
    const order = degreeOrder(g, "in");
    const a = await rank(g, { ...PARAMS, weighted: true, tolerance: 1e-13 }, { pool });
    const b = await rank(relabel(g, order), { ...PARAMS, weighted: true, tolerance: 1e-13 }, { pool });
    let worst = 0;
    order.forEach((v, i) => (worst = Math.max(worst, Math.abs(b.scores[i] - a.scores[v]) / a.scores[v])));
    expect(worst).toBeLessThan(1e-12);
  });

  it("rejects an order that is not a permutation", () => {
    const order = degreeOrder(g, "out");
    order[5] = order[6];
    expect(() => relabel(g, order)).toThrow(/permutation/);
    expect(() => relabel(g, new Uint32Array(3))).toThrow(/order\.length/);
  });
});

describe("hubs-first numbering of a build", () => {
  // The counting sort serves degrees up to about 4n; beyond that (many repeated arcs on few nodes) a comparison sort.
  for (const [name, n, spread] of [
    ["counting sort", 5000, 40],
    ["comparison sort (a degree far above n)", 50, 100_000],
  ] as const) {
    it(`${name}: out-degree descending, ties by canonical id, and the degrees in final order`, () => {
      const rnd = prng(n);
      const out = Uint32Array.from({ length: n }, () => Math.floor(rnd() ** 4 * spread));
      // The case takes the path its name says.
      expect(Math.max(...out) > 4 * n + 1024).toBe(name.startsWith("comparison"));
      const { perm, outByFinal } = hubsFirst(out);
      expect([...perm].sort((a, b) => a - b)).toEqual(Array.from({ length: n }, (_, i) => i));
      for (let c = 0; c < n; c++) expect(outByFinal[perm[c]]).toBe(out[c]);
      for (let u = 1; u < n; u++) expect(outByFinal[u]).toBeLessThanOrEqual(outByFinal[u - 1]);
      for (let c = 1; c < n; c++) if (out[c] === out[c - 1]) expect(perm[c]).toBeGreaterThan(perm[c - 1]);
    });
  }
});
