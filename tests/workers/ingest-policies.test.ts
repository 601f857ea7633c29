// Self-loop, duplicate and direction policies, renumbering, and the statistics of the validation report.
import { afterAll, describe, expect, it } from "vitest";
import { fromDenseEdges } from "../../workers/src/core/graph";
import { degreeHistogram } from "../../workers/src/ingest/stats";
import { ingestEdgeFile } from "../../workers/src/ingest/ingest";
import { edgeList, nodeIds, outWeights, TempFiles } from "../fixtures/edges/edge-files";

const files = new TempFiles();
afterAll(() => files.remove());

// 1→2 three times (weights 1, 2, 4), 2→2 self-loop, 2→3, 3→1, 4 only in a self-loop, 5 a pure sink.
const TEXT = "1 2 1\n1 2 2\n2 2 5\n2 3 1\n3 1 1\n1 2 4\n4 4 1\n3 5 1\n";

describe("self-loops and duplicates", () => {
  it("drops self-loops and merges duplicates by default, counting both", async () => {
    const r = await ingestEdgeFile(files.write(TEXT));
    expect(r.stats.selfLoops).toBe(2);
    expect(r.stats.selfLoopsDropped).toBe(2);
    expect(r.stats.duplicates).toBe(2);
    // Unweighted: merged duplicates weigh their multiplicity, so the transition probabilities are unchanged.
    expect(edgeList(r.graph)).toEqual(["1>2:3", "2>3:1", "3>1:1", "3>5:1"]);
    expect(outWeights(r.graph)).toMatchObject({ "1": 3, "2": 1, "3": 2, "4": 0, "5": 0 });
    // A node seen only in a dropped self-loop is still a node (dangling).
    expect(nodeIds(r.graph)).toContain("4");
    expect(r.stats.danglingNodes).toBe(2);
  });

  it("sums weights of merged duplicates when weighted", async () => {
    const r = await ingestEdgeFile(files.write(TEXT), { weighted: true });
    expect(edgeList(r.graph)).toEqual(["1>2:7", "2>3:1", "3>1:1", "3>5:1"]);
    expect(outWeights(r.graph)["1"]).toBe(7);
  });

  it("keeps self-loops and duplicates when asked", async () => {
    const r = await ingestEdgeFile(files.write(TEXT), { selfLoops: "keep", duplicates: "keep", weighted: true });
    expect(r.stats.selfLoopsDropped).toBe(0);
    expect(r.stats.duplicates).toBe(0);
    expect(r.graph.m).toBe(8);
    // Kept duplicates stay in file order inside their in-list.
    expect(edgeList(r.graph)).toEqual(["1>2:1", "1>2:2", "1>2:4", "2>2:5", "2>3:1", "3>1:1", "3>5:1", "4>4:1"].sort());
    const v2 = nodeIds(r.graph).indexOf("2");
    const w = r.graph.weights as Float64Array;
    const list = Array.from(w.subarray(r.graph.inOffsets[v2], r.graph.inOffsets[v2 + 1]));
    expect(list.filter((x) => x !== 5)).toEqual([1, 2, 4]);
  });
});

describe("undirected", () => {
  it("adds every line both ways; a self-loop once", async () => {
    const r = await ingestEdgeFile(files.write("1 2\n2 3\n3 3\n2 1\n"), { directed: false, selfLoops: "keep" });
    // 1-2 twice (1 2, 2 1) → arcs 1>2, 2>1 each twice, merged to weight 2.
    expect(edgeList(r.graph)).toEqual(["1>2:2", "2>1:2", "2>3:1", "3>2:1", "3>3:1"]);
    expect(r.stats.duplicates).toBe(2);
  });
});

describe("numbering", () => {
  it("puts hubs first, ties by original id, and sorts every in-list", async () => {
    const r = await ingestEdgeFile(files.write("9 1\n9 2\n9 3\n5 9\n5 1\n7 9\n1 2\n"));
    expect(nodeIds(r.graph)).toEqual(["9", "5", "1", "7", "2", "3"]);
    const g = r.graph;
    for (let v = 0; v < g.n; v++) {
      for (let e = g.inOffsets[v] + 1; e < g.inOffsets[v + 1]; e++) expect(g.sources[e]).toBeGreaterThan(g.sources[e - 1]);
    }
  });

  it("keeps original-id order with renumbering off", async () => {
    const r = await ingestEdgeFile(files.write("9 1\n9 2\n9 3\n5 9\n"), {}, { renumber: false });
    expect(nodeIds(r.graph)).toEqual(["1", "2", "3", "5", "9"]);
    expect(r.stats.order).toBe("id");
  });

  it("builds the same CSR as the reference builder", async () => {
    const r = await ingestEdgeFile(files.write("0 1\n0 2\n1 2\n2 0\n3 2\n"), {}, { renumber: false });
    const ref = fromDenseEdges(4, Uint32Array.of(0, 0, 1, 2, 3), Uint32Array.of(1, 2, 2, 0, 2));
    expect(Array.from(r.graph.inOffsets)).toEqual(Array.from(ref.inOffsets));
    expect(Array.from(r.graph.sources)).toEqual(Array.from(ref.sources));
    expect(Array.from(r.graph.outWeight)).toEqual(Array.from(ref.outWeight));
    expect(r.graph.weights).toBeNull();
  });

  it("gives the same graph for any order of the input lines", async () => {
    const lines = Array.from({ length: 3000 }, (_, i) => `${(i * 7919) % 1009} ${(i * 104729) % 997} ${(i % 5) + 0.5}`);
    const shuffled = [...lines].reverse();
    for (let i = shuffled.length - 1; i > 0; i--) {
      const j = (i * 2654435761) % (i + 1);
      [shuffled[i], shuffled[j]] = [shuffled[j], shuffled[i]];
    }
    const a = await ingestEdgeFile(files.write(`${lines.join("\n")}\n`), { weighted: true, duplicates: "keep" });
    const b = await ingestEdgeFile(files.write(`${shuffled.join("\n")}\n`), { weighted: true, duplicates: "keep" });
    expect(Array.from(b.graph.inOffsets)).toEqual(Array.from(a.graph.inOffsets));
    expect(Array.from(b.graph.sources)).toEqual(Array.from(a.graph.sources));
    expect(nodeIds(b.graph)).toEqual(nodeIds(a.graph));
    expect(edgeList(b.graph)).toEqual(edgeList(a.graph));
  });
});

describe("statistics", () => {
  it("bins degrees logarithmically: 0, 1, 2-3, 4-7, …", () => {
    expect(degreeHistogram(Uint32Array.of(0, 1, 2, 3, 4, 7, 8, 0))).toEqual([
      { min: 0, max: 0, count: 2 },
      { min: 1, max: 1, count: 1 },
      { min: 2, max: 3, count: 2 },
      { min: 4, max: 7, count: 2 },
      { min: 8, max: 15, count: 1 },
    ]);
  });

  it("reports rows, nodes, edges, dangling nodes and degree histograms", async () => {
    // A star: hub 0 points at 1..9; 1 points back; 10 appears only as a target of 1.
    const lines = Array.from({ length: 9 }, (_, i) => `0,${i + 1}`);
    lines.push("1,0", "1,10");
    const r = await ingestEdgeFile(files.write(`from,to\n${lines.join("\n")}\n`));
    const s = r.stats;
    expect(s).toMatchObject({ rows: 11, lines: 12, headerLines: 1, nodes: 11, edges: 11, danglingNodes: 9 });
    expect(s.maxOutDegree).toBe(9);
    expect(s.maxInDegree).toBe(1);
    expect(s.outDegree).toEqual([
      { min: 0, max: 0, count: 9 },
      { min: 1, max: 1, count: 0 },
      { min: 2, max: 3, count: 1 },
      { min: 4, max: 7, count: 0 },
      { min: 8, max: 15, count: 1 },
    ]);
    expect(s.inDegree).toEqual([
      { min: 0, max: 0, count: 0 },
      { min: 1, max: 1, count: 11 },
    ]);
  });
});
