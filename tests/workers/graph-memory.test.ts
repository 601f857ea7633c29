// Where a graph lives and how merged duplicates are stored: repeated sources instead of weights, the graph's own
// shared heap lent to its runs, and both through the graph store. Each layout must give the answers of the plain one.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { countMergedEdges, mergedEdgesFromPrefix, planShards } from "../../workers/src/core/shard-plan";
import { rank, RankPool } from "../../workers/src/engine/rank";
import { touchPages } from "../../workers/src/graph-store/build-passes";
import { loadGraphStore } from "../../workers/src/graph-store/load";
import { writeGraphStore } from "../../workers/src/graph-store/write";
import { ingestEdgeFile } from "../../workers/src/ingest/ingest";
import { degreeStats } from "../../workers/src/ingest/stats";
import { edgeList, TempFiles } from "../fixtures/edges/edge-files";
import { l1, PARAMS, sameBits, skewedEdgeText } from "./rank-test-graphs";

const files = new TempFiles();
const dirs: string[] = [];
const pool = new RankPool({ threads: 2 });
afterAll(async () => {
  files.remove();
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
  await pool.close();
});

// Many repeated lines, dangling nodes (a share of ids only ever receive) and self-loops.
const TEXT = skewedEdgeText(17, 3000, 40_000, { base: 100, repeats: 0.15, skip: (u) => u % 7 === 3 });
const weightedRun = { ...PARAMS, weighted: true, tolerance: 1e-12 };
const plainRun = { ...PARAMS, weighted: false, tolerance: 1e-12 };

describe("merged duplicates as repeated sources", () => {
  it("reports the same graph as merging into weights: edges, duplicates, degrees, dangling nodes", async () => {
    const path = files.write(TEXT);
    const asWeights = await ingestEdgeFile(path, {}, { duplicateLayout: "weights" });
    const asRepeats = await ingestEdgeFile(path, {}, { duplicateLayout: "repeats" });
    expect(asWeights.graph.weights).not.toBeNull();
    expect(asRepeats.graph.weights).toBeNull();
    expect(asRepeats.stats.duplicates).toBeGreaterThan(1000);
    expect(asRepeats.graph.m).toBe(asWeights.graph.m + asRepeats.stats.duplicates);
    expect(asRepeats.graph.mergedEdges).toBe(asWeights.graph.m);
    for (const key of ["edges", "duplicates", "danglingNodes", "inDegree", "outDegree", "maxInDegree", "maxOutDegree"] as const) {
      expect(asRepeats.stats[key], key).toEqual(asWeights.stats[key]);
    }
    // The degrees the build hands over agree with a count over the finished graph, for every policy.
    for (const r of [
      asWeights,
      asRepeats,
      await ingestEdgeFile(path, { duplicates: "keep" }),
      await ingestEdgeFile(path, { directed: false, selfLoops: "keep" }, { duplicateLayout: "repeats" }),
    ]) {
      const counted = degreeStats(r.graph);
      expect(r.stats.inDegree).toEqual(counted.inDegree);
      expect(r.stats.outDegree).toEqual(counted.outDegree);
      expect([r.stats.maxInDegree, r.stats.maxOutDegree]).toEqual([counted.maxInDegree, counted.maxOutDegree]);
    }
    // Every merged edge appears as its multiplicity of repeated sources.
    const expanded = edgeList(asWeights.graph).flatMap((e) => {
      const [pair, w] = e.split(":");
      return Array.from({ length: Number(w ?? 1) }, () => pair);
    });
    expect(edgeList(asRepeats.graph)).toEqual(expanded.sort());
    // The build keeps the prefix sums of distinct sources per list: any node range's merged edges without a pass.
    const prefix = asRepeats.graph.distinctInOffsets as Uint32Array;
    expect(prefix[asRepeats.graph.n]).toBe(asRepeats.graph.mergedEdges);
    for (const count of [1, 3, 8]) {
      const plan = planShards(asRepeats.graph.inOffsets, asRepeats.graph.n, count, 64);
      expect(mergedEdgesFromPrefix(plan, prefix)).toEqual(countMergedEdges(plan, asRepeats.graph.inOffsets, asRepeats.graph.sources));
    }
  });

  it("gives the scores of the weights layout: multiplicities counted in weighted runs, each edge once otherwise", async () => {
    const path = files.write(TEXT);
    const asWeights = (await ingestEdgeFile(path, {}, { duplicateLayout: "weights" })).graph;
    const asRepeats = (await ingestEdgeFile(path, {}, { duplicateLayout: "repeats" })).graph;
    const w1 = await rank(asWeights, weightedRun, { pool });
    let shardEdges = 0;
    const w2 = await rank(asRepeats, { ...weightedRun, shards: 3 }, {
      pool,
      onIteration: (p) => void (shardEdges = p.shards.reduce((sum, sh) => sum + sh.edges, 0)),
    });
    // Shards report the graph's edges, a repeated source once.
    expect(shardEdges).toBe(asRepeats.mergedEdges);
    // Same transition matrix; only the order of additions differs.
    expect(w2.iterations).toBe(w1.iterations);
    expect(l1(w1.scores, w2.scores)).toBeLessThan(1e-13);
    const p1 = await rank(asWeights, plainRun, { pool });
    const p2 = await rank(asRepeats, plainRun, { pool });
    // Unweighted: the repeats are folded into the very in-lists the weights layout has, so the bits match.
    expect(sameBits(p1.scores, p2.scores)).toBe(true);
    // And the two kinds of run really differ on this graph (the check above could not pass by ignoring repeats).
    expect(l1(w2.scores, p2.scores)).toBeGreaterThan(1e-4);
  });

  it("stays a weight per edge when most arcs are duplicates", async () => {
    const text = "1 2\n1 2\n1 2\n1 2\n2 3\n2 3\n2 3\n3 1\n";
    const r = await ingestEdgeFile(files.write(text), {}, { duplicateLayout: "repeats" });
    expect(r.graph.mergedEdges).toBeUndefined();
    expect(edgeList(r.graph)).toEqual(["1>2:4", "2>3:3", "3>1:1"]);
  });
});

describe("the graph's shared heap", () => {
  it("is faulted in ahead by touches that keep whatever another thread wrote there first (atomic touches)", () => {
    const buffer = new SharedArrayBuffer(64 * 4096);
    const words = new Int32Array(buffer);
    // Values written before the touch, at page starts (where a touch stores) and elsewhere.
    for (let p = 0; p < 64; p += 3) words[(p * 4096) / 4] = p + 1;
    words[5000] = -7;
    const stop = new Int32Array(new SharedArrayBuffer(4));
    expect(touchPages({ buffer, from: 4096, to: 60 * 4096, parts: 2, stop, atomic: true })).toBe(59 * 4096);
    for (let p = 0; p < 64; p++) expect(words[(p * 4096) / 4]).toBe(p % 3 === 0 ? p + 1 : 0);
    expect(words[5000]).toBe(-7);
    // A stopped touch does nothing.
    Atomics.store(stop, 0, 1);
    expect(touchPages({ buffer, from: 0, to: 4096, parts: 1, stop, atomic: true })).toBe(0);
  });

  it("lends its free space to one run at a time; runs after it and beside it give the same bits", async () => {
    const path = files.write(TEXT);
    const onHeap = (await ingestEdgeFile(path, {}, { duplicateLayout: "repeats", heapMinBytes: 0 })).graph;
    const plain = (await ingestEdgeFile(path, {}, { duplicateLayout: "repeats", heapMinBytes: Infinity })).graph;
    expect(onHeap.heap).toBeDefined();
    expect(onHeap.sources.buffer).toBe(onHeap.heap?.buffer);
    expect(plain.heap).toBeUndefined();
    const reference = await rank(plain, weightedRun, { pool, kernel: "js" });
    const first = await rank(onHeap, weightedRun, { pool });
    expect(first.kernel).toBe("wasm");
    // The second run borrows space the first gave back (and now holds stale values). The next three run at the same
    // time: one borrows, one cannot and copies the graph, and the unweighted one folds the repeats into a copy.
    const second = await rank(onHeap, weightedRun, { pool });
    const [third, fourth, fifth] = await Promise.all([
      rank(onHeap, weightedRun, { pool }),
      rank(onHeap, weightedRun, { pool }),
      rank(onHeap, plainRun, { pool }),
    ]);
    const plainReference = await rank(plain, plainRun, { pool, kernel: "js" });
    for (const r of [first, second, third, fourth]) expect(sameBits(r.scores, reference.scores)).toBe(true);
    expect(sameBits(fifth.scores, plainReference.scores)).toBe(true);
    // Every run gave its loan back, a refused one too.
    await expect(rank(onHeap, weightedRun, { pool, resumeFrom: { k: 3, x: new Float64Array(5) } })).rejects.toThrow(/resumeFrom/);
    const loan = onHeap.heap?.lend();
    expect(loan).toBeTruthy();
    loan?.release();
    // A canceled run keeps the loan (a stopped thread may still write there); later runs copy and stay right.
    const stop = new AbortController();
    const canceled = await rank(onHeap, weightedRun, {
      pool,
      signal: stop.signal,
      onIteration: (p) => void (p.k === 2 && stop.abort()),
    });
    expect(canceled.stopReason).toBe("canceled");
    expect(onHeap.heap?.lend()).toBeNull();
    const after = await rank(onHeap, weightedRun, { pool });
    expect(sameBits(after.scores, reference.scores)).toBe(true);
  });

  it("survives the graph store: repeated sources and the heap come back on load", async () => {
    const path = files.write(TEXT);
    const built = (await ingestEdgeFile(path, {}, { duplicateLayout: "repeats", heapMinBytes: 0 })).graph;
    const dir = mkdtempSync(join(tmpdir(), "stillpoint-heap-"));
    dirs.push(dir);
    await writeGraphStore(join(dir, "g"), built, { pieces: 3 });
    const { graph, meta } = await loadGraphStore(join(dir, "g"), { heapMinBytes: 0 });
    expect(meta.mergedEdges).toBe(built.mergedEdges);
    expect(graph.mergedEdges).toBe(built.mergedEdges);
    expect(graph.heap).toBeDefined();
    expect(edgeList(graph)).toEqual(edgeList(built));
    const a = await rank(built, plainRun, { pool });
    const b = await rank(graph, plainRun, { pool });
    expect(sameBits(a.scores, b.scores)).toBe(true);
  });
});
