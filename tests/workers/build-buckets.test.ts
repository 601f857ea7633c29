// The directed unweighted build partitions arcs by target bucket (in WebAssembly on worker lanes, else in JS) and
// orders each bucket by a radix sort (in WebAssembly when the graph lives on a shared heap, else in JS); smaller graphs
// (and undirected ones) scatter list by list and sort each list. All must give the same graph, bit for bit, for every
// policy and thread count.
import { readFile } from "node:fs/promises";
import { afterAll, describe, expect, it } from "vitest";
import type { Graph } from "../../workers/src/core/graph";
import { ingestEdgeFile, type IngestRun } from "../../workers/src/ingest/ingest";
import { compileAssembly } from "../fixtures/assembly";
import { TempFiles } from "../fixtures/edges/edge-files";
import { sameBits, skewedEdgeText } from "./rank-test-graphs";

const files = new TempFiles();
afterAll(() => files.remove());

function sameGraph(a: Graph, b: Graph): void {
  expect(b.n).toBe(a.n);
  expect(b.m).toBe(a.m);
  expect(b.mergedEdges).toBe(a.mergedEdges);
  expect(Buffer.from(b.inOffsets.buffer, b.inOffsets.byteOffset, b.inOffsets.byteLength).equals(Buffer.from(a.inOffsets.buffer, a.inOffsets.byteOffset, a.inOffsets.byteLength))).toBe(true);
  expect(Buffer.from(b.sources.buffer, b.sources.byteOffset, b.sources.byteLength).equals(Buffer.from(a.sources.buffer, a.sources.byteOffset, a.sources.byteLength))).toBe(true);
  expect(sameBits(a.outWeight, b.outWeight)).toBe(true);
  if (a.weights === null) expect(b.weights).toBeNull();
  else expect(sameBits(a.weights, b.weights as Float64Array)).toBe(true);
  expect(b.ids).toEqual(a.ids);
}

describe("committed build binaries", () => {
  for (const [source, target, binary] of [
    ["order-lists.ts", "lists", "order-lists.wasm"],
    ["lane-passes.ts", "lanes", "lane-passes.wasm"],
  ]) {
    it(`${binary} matches a fresh compile of workers/assembly/${source} (npm run build:wasm)`, async () => {
      const fresh = await compileAssembly(`workers/assembly/${source}`, target);
      expect(Buffer.compare(Buffer.from(fresh), await readFile(new URL(`../../workers/assembly/${binary}`, import.meta.url)))).toBe(0);
    });
  }
});

describe("bucketed build", () => {
  // Skewed lines with repeats, self-loops and a few hubs, in no particular order.
  const path = files.write(skewedEdgeText(5, 20_000, 60_000, { base: 7, repeats: 0.1, selfLoops: 0.02 }));
  const small = { chunkBytes: 16 * 1024, parallelMinBytes: 0 };

  for (const selfLoops of ["drop", "keep"] as const) {
    for (const duplicates of ["merge", "keep"] as const) {
      it(`equals the list-by-list build: self-loops ${selfLoops}, duplicates ${duplicates}`, async () => {
        const ingest = (run: IngestRun) => ingestEdgeFile(path, { selfLoops, duplicates }, { duplicateLayout: "repeats", ...run });
        const plain = await ingest({ bucketBytes: Infinity, limits: { threads: 1 } });
        for (const threads of [1, 2]) {
          // 4 KiB buckets: dozens of them, several per slice, many spanning segments of many chunks. On a heap the
          // buckets are ordered in WebAssembly, in the space the graph's runs borrow later.
          for (const heapMinBytes of [0, Infinity]) {
            const bucketed = await ingest({ bucketBytes: 4096, heapMinBytes, limits: { threads, ...small } });
            expect(bucketed.graph.heap !== undefined).toBe(heapMinBytes === 0);
            sameGraph(plain.graph, bucketed.graph);
            expect(bucketed.stats).toEqual({ ...plain.stats, threads: bucketed.stats.threads });
          }
        }
      });
    }
  }

  it("equals it with hash-numbered ids (a relabel map per part) and with three threads", async () => {
    const ingest = (run: IngestRun) => ingestEdgeFile(path, {}, { duplicateLayout: "repeats", ...run });
    const plain = await ingest({ bucketBytes: Infinity, limits: { threads: 1 } });
    for (const run of [
      { hashIds: true, limits: { threads: 2, ...small } },
      { limits: { threads: 3, ...small } },
      { hashIds: true, heapMinBytes: 0, limits: { threads: 3, ...small } },
    ]) {
      const bucketed = await ingest({ bucketBytes: 4096, ...run });
      sameGraph(plain.graph, bucketed.graph);
      expect(bucketed.stats.duplicates).toBe(plain.stats.duplicates);
    }
  });

  it("equals it with duplicates merged into weights too", async () => {
    const ingest = (run: IngestRun) => ingestEdgeFile(path, {}, { duplicateLayout: "weights", ...run });
    const plain = await ingest({ bucketBytes: Infinity, limits: { threads: 1 } });
    expect(plain.graph.weights).not.toBeNull();
    for (const heapMinBytes of [0, Infinity]) {
      const bucketed = await ingest({ bucketBytes: 4096, heapMinBytes, limits: { threads: 2, ...small } });
      sameGraph(plain.graph, bucketed.graph);
    }
  });
});
