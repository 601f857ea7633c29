// The pure core: step kernels, their checked wrappers, shard planning and the run's shared state.
import { describe, expect, it } from "vitest";
import { BLOCK_NODES, fromDenseEdges } from "../../workers/src/core/graph";
import { BLOCK_SLOTS, combineBlocks } from "../../workers/src/core/pull-step-csr";
import { checkGraph, contributions, markSourcesChecked, pullStep } from "../../workers/src/core/pull-step";
import { countMergedEdges, NODE_COST, planShards, rebalanceShards } from "../../workers/src/core/shard-plan";
import { outDegree, stepScalars, teleportVector } from "../../workers/src/core/teleport";
import { prepareRunState } from "../../workers/src/engine/run-state";
import { applyPolicies, prng, randomEdges, sameBits, toGraph } from "./rank-test-graphs";

const BN = 4;

function stepArgs(n: number) {
  // 0→1, 0→2, 1→2, 2→0, 3→2, 4 dangling, 5→4 (weights 1, 3, 1, 2, 1, 1)
  const g = fromDenseEdges(6, Uint32Array.of(0, 0, 1, 2, 3, 5), Uint32Array.of(1, 2, 2, 0, 2, 4), Float64Array.of(1, 3, 1, 2, 1, 1));
  const x0 = Float64Array.from({ length: n }, (_, i) => (i + 1) / 21);
  const c0 = new Float64Array(n);
  const blockSums = new Float64Array(Math.ceil(n / BN) * BLOCK_SLOTS);
  contributions({ start: 0, end: n, x: x0, outWeight: g.outWeight, c: c0, blockSums, blockNodes: BN });
  return {
    g,
    a: {
      start: 0,
      end: n,
      inOffsets: g.inOffsets,
      sources: g.sources,
      weights: g.weights,
      outWeight: g.outWeight,
      c0,
      x0,
      x1: new Float64Array(n),
      c1: new Float64Array(n),
      scalars: { alpha: 0.5, p: 0, q: 0.25 / n },
      tel: null,
      blockSums,
      blockNodes: BN,
    },
  };
}

describe("pullStep", () => {
  it("computes x1 = α·Σ c0[u]·w + q, c1 = x1/W and the block sums", () => {
    const { g, a } = stepArgs(6);
    const x = a.x0;
    pullStep(a);
    const W = [4, 1, 2, 1, 0, 1];
    const inflow = [(x[2] / 2) * 2, x[0] / 4, (x[0] / 4) * 3 + x[1] + x[3], 0, x[5], 0];
    inflow.forEach((s, v) => expect(a.x1[v]).toBeCloseTo(0.5 * s + 0.25 / 6, 15));
    W.forEach((w, v) => expect(a.c1[v]).toBe(w ? a.x1[v] / w : 0));
    expect(Array.from(g.outWeight)).toEqual(W);
    const sums = combineBlocks(a.blockSums, 2);
    expect(sums.dangling).toBe(a.x1[4]);
    expect(sums.sum).toBeCloseTo(a.x1.reduce((s, v) => s + v, 0), 15);
    expect(sums.residual).toBeCloseTo(a.x1.reduce((s, v, i) => s + Math.abs(v - x[i]), 0), 15);
  });

  it("gives the same bits computed as one range or as block-aligned pieces", () => {
    const e = applyPolicies(randomEdges(3, 1000, 6), true);
    const g = toGraph(e);
    const n = g.n;
    const x0 = new Float64Array(n).fill(1 / n);
    const c0 = new Float64Array(n);
    const bs = () => new Float64Array(Math.ceil(n / 64) * BLOCK_SLOTS);
    contributions({ start: 0, end: n, x: x0, outWeight: g.outWeight, c: c0, blockSums: bs(), blockNodes: 64 });
    const run = (cuts: number[]) => {
      const x1 = new Float64Array(n);
      const c1 = new Float64Array(n);
      const blockSums = bs();
      for (let i = 0; i + 1 < cuts.length; i++) {
        pullStep({ ...g, start: cuts[i], end: cuts[i + 1], c0, x0, x1, c1, tel: null, blockSums, blockNodes: 64,
          scalars: { alpha: 0.85, p: 0, q: 0.15 / n } });
      }
      return { x1, c1, blockSums };
    };
    const whole = run([0, n]);
    const parts = run([0, 64, 640, 704, n]);
    expect(sameBits(whole.x1, parts.x1)).toBe(true);
    expect(sameBits(whole.c1, parts.c1)).toBe(true);
    expect(sameBits(whole.blockSums, parts.blockSums)).toBe(true);
  });

  it("an empty range writes nothing", () => {
    const { a } = stepArgs(6);
    pullStep({ ...a, start: 4, end: 4 });
    expect(a.x1.every((v) => v === 0)).toBe(true);
  });

  it("rejects bad shapes with a RangeError naming the argument and value", () => {
    const { a } = stepArgs(6);
    expect(() => pullStep({ ...a, x1: new Float64Array(5) })).toThrow(/x1\.length must be 6\. Value: 5/);
    expect(() => pullStep({ ...a, start: 1 })).toThrow(/start must be a multiple of 4\. Value: 1/);
    expect(() => pullStep({ ...a, end: 7 })).toThrow(/end .*Value: 7/);
    expect(() => pullStep({ ...a, blockSums: new Float64Array(3) })).toThrow(/blockSums\.length/);
    expect(() => pullStep({ ...a, scalars: { alpha: 1, p: 0, q: 0 } })).toThrow(/scalars\.alpha/);
    expect(() => pullStep({ ...a, tel: new Float64Array(2) })).toThrow(/tel\.length/);
    expect(() => pullStep({ ...a, inOffsets: new Uint32Array(3) })).toThrow(RangeError);
  });
});

describe("checkGraph", () => {
  const g = toGraph(applyPolicies(randomEdges(4, 50, 3), true));
  it("accepts a well-formed graph and the empty graph", () => {
    expect(() => checkGraph(g)).not.toThrow();
    expect(() => checkGraph(fromDenseEdges(0, new Uint32Array(0), new Uint32Array(0)))).not.toThrow();
  });
  it("names the first bad entry", () => {
    const sources = g.sources.slice();
    sources[5] = 50;
    expect(() => checkGraph({ ...g, sources })).toThrow(/graph\.sources\[5\] must be < n = 50\. Value: 50/);
    const outWeight = g.outWeight.slice();
    outWeight[2] = -1;
    expect(() => checkGraph({ ...g, outWeight })).toThrow(/graph\.outWeight\[2\]/);
    const weights = (g.weights as Float64Array).slice();
    weights[0] = NaN;
    expect(() => checkGraph({ ...g, weights })).toThrow(/graph\.weights\[0\]/);
    expect(() => checkGraph({ ...g, m: g.m + 1 })).toThrow(/graph\.sources\.length/);
  });
  it("scans a sources array once: built, loaded or checked before, it is trusted", () => {
    const sources = g.sources.slice();
    checkGraph({ ...g, sources });
    // Changed behind its back, a checked array is not scanned again (the build and the store loader mark theirs).
    sources[5] = 50;
    expect(() => checkGraph({ ...g, sources })).not.toThrow();
    expect(() => checkGraph({ ...g, sources: sources.slice() })).toThrow(/graph\.sources\[5\]/);
    const marked = sources.slice();
    markSourcesChecked(marked, g.n);
    expect(() => checkGraph({ ...g, sources: marked })).not.toThrow();
    // Trusted for the n it was checked against, scanned again for a smaller one.
    const tiny = { n: 3, m: 3, inOffsets: Uint32Array.of(0, 1, 3, 3), sources: Uint32Array.of(0, 2, 2), weights: null, outWeight: Float64Array.of(1, 0, 2) };
    markSourcesChecked(tiny.sources, 3);
    expect(() => checkGraph(tiny)).not.toThrow();
    expect(() => checkGraph({ ...tiny, n: 2, inOffsets: Uint32Array.of(0, 1, 3), outWeight: Float64Array.of(1, 0) })).toThrow(/must be < n = 2/);
  });
});

describe("teleport and scalars", () => {
  it("normalizes seeds, adding duplicates", () => {
    expect(Array.from(teleportVector(4, [{ node: 2, weight: 1 }, { node: 0, weight: 2 }, { node: 2, weight: 1 }]))).toEqual([0.5, 0, 0.5, 0]);
    expect(() => teleportVector(4, [{ node: 1, weight: 0 }])).toThrow(/positive sum/);
    expect(() => teleportVector(4, [{ node: 1, weight: -1 }])).toThrow(/seeds\[0\]\.weight/);
    expect(() => teleportVector(4, [])).toThrow(RangeError);
  });
  it("counts out-edges for unweighted runs", () => {
    expect(Array.from(outDegree(Uint32Array.of(0, 2, 0, 0), new Float64Array(3).fill(9)))).toEqual([3, 0, 1]);
  });
  it("folds the damping and dangling policy into p and q", () => {
    expect(stepScalars(0.8, 0.5, 4, false, "teleport")).toEqual({ alpha: 0.8, p: 0, q: (1 - 0.8) * 0.25 + 0.8 * 0.5 * 0.25 });
    expect(stepScalars(0.8, 0.5, 4, true, "teleport")).toEqual({ alpha: 0.8, p: 1 - 0.8 + 0.8 * 0.5, q: 0 });
    expect(stepScalars(0.8, 0.5, 4, true, "uniform").q).toBe(0.8 * 0.5 * 0.25);
  });
});

describe("planShards", () => {
  const g = toGraph(applyPolicies(randomEdges(8, 50 * BLOCK_NODES + 17, 3), true));
  it("covers 0..n with contiguous non-empty ranges on block boundaries for any count", () => {
    for (let count = 1; count <= 60; count++) {
      const plan = planShards(g.inOffsets, g.n, count, BLOCK_NODES);
      expect(plan).toHaveLength(Math.min(count, 51));
      expect(plan[0].start).toBe(0);
      expect(plan[plan.length - 1].end).toBe(g.n);
      plan.forEach((s, i) => {
        expect(s.index).toBe(i);
        expect(s.end).toBeGreaterThan(s.start);
        expect(s.start % BLOCK_NODES).toBe(0);
        if (i > 0) expect(s.start).toBe(plan[i - 1].end);
        expect(s.edges).toBe(g.inOffsets[s.end] - g.inOffsets[s.start]);
      });
    }
  });
  it("balances in-edges plus weighted nodes within one block of cost", () => {
    // Skewed graph: low ids receive most edges, so equal node counts would be far from balanced.
    const plan = planShards(g.inOffsets, g.n, 4, BLOCK_NODES);
    const cost = plan.map((s) => s.edges + NODE_COST * (s.end - s.start));
    const total = g.m + NODE_COST * g.n;
    let maxBlock = 0;
    for (let b = 0; b < g.n; b += BLOCK_NODES) {
      const end = Math.min(b + BLOCK_NODES, g.n);
      maxBlock = Math.max(maxBlock, g.inOffsets[end] - g.inOffsets[b] + NODE_COST * (end - b));
    }
    for (const c of cost) expect(Math.abs(c - total / 4)).toBeLessThanOrEqual(maxBlock);
    // Neither an edge-only nor a node-only balance: the shards differ in both.
    const nodes = plan.map((s) => s.end - s.start);
    const edges = plan.map((s) => s.edges);
    expect(Math.max(...nodes) / Math.min(...nodes)).toBeGreaterThan(1.1);
    expect(Math.max(...edges) / Math.min(...edges)).toBeGreaterThan(1.5);
  });
  it("moves towards equal measured times: the slow range gives blocks to the fast one, on block boundaries", () => {
    const plan = planShards(g.inOffsets, g.n, 3, BLOCK_NODES);
    const cost = (r: { start: number; end: number }) => g.inOffsets[r.end] - g.inOffsets[r.start] + NODE_COST * (r.end - r.start);
    // Range 0 ran twice as slowly per unit of cost as the others.
    const times = plan.map((r, i) => cost(r) * (i === 0 ? 2 : 1) * 1e-6);
    const moved = rebalanceShards(g.inOffsets, g.n, plan, times, BLOCK_NODES);
    expect(moved).not.toBeNull();
    const next = moved as NonNullable<typeof moved>;
    expect(next[0].start).toBe(0);
    expect(next[2].end).toBe(g.n);
    next.forEach((r, i) => {
      expect(r.index).toBe(i);
      expect(r.start % BLOCK_NODES).toBe(0);
      expect(r.end).toBeGreaterThan(r.start);
      if (i > 0) expect(r.start).toBe(next[i - 1].end);
      expect(r.edges).toBe(g.inOffsets[r.end] - g.inOffsets[r.start]);
    });
    expect(next[0].end).toBeLessThan(plan[0].end);
    // Estimated with the measured rates, the new ranges are within a block's time of equal.
    const rate = (v: number) => (v < plan[0].end ? 2 : 1);
    const est = next.map((r) => {
      let t = 0;
      for (let b = r.start; b < r.end; b += BLOCK_NODES) t += cost({ start: b, end: Math.min(b + BLOCK_NODES, r.end) }) * rate(b);
      return t;
    });
    const mean = est.reduce((a, b) => a + b, 0) / 3;
    let maxBlock = 0;
    for (let b = 0; b < g.n; b += BLOCK_NODES) maxBlock = Math.max(maxBlock, 2 * cost({ start: b, end: Math.min(b + BLOCK_NODES, g.n) }));
    for (const t of est) expect(Math.abs(t - mean)).toBeLessThanOrEqual(maxBlock);
    // Balanced times, missing times or a single range: no change.
    expect(rebalanceShards(g.inOffsets, g.n, plan, plan.map((r) => cost(r) * 1e-6), BLOCK_NODES)).toBeNull();
    expect(rebalanceShards(g.inOffsets, g.n, plan, [1, 0, 1], BLOCK_NODES)).toBeNull();
    expect(rebalanceShards(g.inOffsets, g.n, plan.slice(0, 1), [1], BLOCK_NODES)).toBeNull();
  });
  it("returns no shard for the empty graph and rejects a bad count", () => {
    expect(planShards(Uint32Array.of(0), 0, 3, BLOCK_NODES)).toEqual([]);
    expect(() => planShards(g.inOffsets, g.n, 0, BLOCK_NODES)).toThrow(/count .*Value: 0/);
  });
  it("counts a shard's edges once per distinct source in each list (repeats, empty lists, equal neighbours across lists)", () => {
    // Sorted in-lists with runs of repeats; many lists empty; a list often ends with the source the next one starts with.
    const rnd = prng(21);
    const n = 3000;
    const offsets = new Uint32Array(n + 1);
    const sources: number[] = [];
    for (let v = 0; v < n; v++) {
      const len = rnd() < 0.4 ? 0 : Math.floor(rnd() * 12);
      const list = Array.from({ length: len }, () => Math.floor(rnd() * 40)).sort((a, b) => a - b);
      if (len > 0 && sources.length > 0 && rnd() < 0.5) list[0] = sources[sources.length - 1];
      list.sort((a, b) => a - b);
      sources.push(...list);
      offsets[v + 1] = sources.length;
    }
    const src = Uint32Array.from(sources);
    const distinct = (a: number, b: number) => {
      let d = 0;
      for (let v = a; v < b; v++) for (let e = offsets[v]; e < offsets[v + 1]; e++) if (e === offsets[v] || src[e] !== src[e - 1]) d++;
      return d;
    };
    for (const count of [1, 2, 7]) {
      const plan = countMergedEdges(planShards(offsets, n, count, 64), offsets, src);
      for (const r of plan) expect(r.edges).toBe(distinct(r.start, r.end));
      expect(plan.reduce((a, r) => a + r.edges, 0)).toBe(distinct(0, n));
    }
  });
});

describe("run state", () => {
  it("uses arrays already in shared memory without copying, and copies others", () => {
    const g = toGraph(applyPolicies(randomEdges(10, 100, 3), true));
    const sources = new Uint32Array(new SharedArrayBuffer(g.sources.byteLength));
    sources.set(g.sources);
    const s = prepareRunState({ ...g, sources }, { kernel: "js", weighted: true, seeds: null, start: null });
    expect(s.views.sources).toBe(sources);
    expect(s.views.inOffsets).not.toBe(g.inOffsets);
    expect(s.views.inOffsets.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(Array.from(s.views.inOffsets)).toEqual(Array.from(g.inOffsets));
    expect(s.mass).toBeCloseTo(1, 14);
  });
});
