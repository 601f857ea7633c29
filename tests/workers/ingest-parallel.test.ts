// The parallel parse (worker threads, chunks of whole lines) must give exactly the graph of the single-thread parse,
// the same statistics and the same bad-line numbers; and the direct and hashed id paths must agree.
import { afterAll, describe, expect, it } from "vitest";
import type { Graph } from "../../workers/src/core/graph";
import { ingestEdgeFile, type IngestResult } from "../../workers/src/ingest/ingest";
import { isShared } from "../../workers/src/graph-store/shared";
import { nodeIds, TempFiles } from "../fixtures/edges/edge-files";
import { prng } from "./rank-test-graphs";

const files = new TempFiles();
afterAll(() => files.remove());

const SMALL_CHUNKS = { chunkBytes: 8192, parallelMinBytes: 0 };

/** Deterministic skewed graph text: hubs, duplicates, self-loops, weights, comments and some bad lines. */
function graphText(lines: number, opts: { bigIds?: boolean; strings?: boolean; bad?: boolean } = {}): string {
  let x = 0x2545f491;
  const rnd = () => {
    x ^= x << 13;
    x ^= x >>> 17;
    x ^= x << 5;
    return (x >>> 0) / 4294967296;
  };
  const id = () => {
    const k = Math.floor(rnd() ** 3 * 5000);
    if (opts.strings) return `isle-${k}-ø`;
    return opts.bigIds ? (18446744073709551615n - BigInt(k) * 977n).toString() : String(k);
  };
  const out: string[] = [];
  for (let i = 0; i < lines; i++) {
    if (i % 997 === 0) out.push("# tide table break");
    if (opts.bad && i % 1499 === 7) out.push("only-one-field");
    out.push(`${id()}\t${id()}\t${(Math.floor(rnd() * 100) / 8).toString()}`);
  }
  return `${out.join("\n")}\n`;
}

function sameGraph(a: Graph, b: Graph): void {
  expect(b.n).toBe(a.n);
  expect(b.m).toBe(a.m);
  expect(nodeIds(b)).toEqual(nodeIds(a));
  expect(Buffer.from(b.inOffsets.buffer, b.inOffsets.byteOffset, b.inOffsets.byteLength).equals(Buffer.from(a.inOffsets.buffer, a.inOffsets.byteOffset, a.inOffsets.byteLength))).toBe(true);
  expect(Array.from(b.sources)).toEqual(Array.from(a.sources));
  expect(b.weights === null).toBe(a.weights === null);
  if (a.weights && b.weights) expect(Array.from(b.weights)).toEqual(Array.from(a.weights));
  expect(Array.from(b.outWeight)).toEqual(Array.from(a.outWeight));
}

function sameStats(a: IngestResult, b: IngestResult): void {
  const strip = ({ threads: _t, idPath: _p, ...rest }: IngestResult["stats"]) => rest;
  expect(strip(b.stats)).toEqual(strip(a.stats));
  expect(b.badLines).toEqual(a.badLines);
}

describe("parallel parse", () => {
  type TextOpts = Parameters<typeof graphText>[1];
  it.each<[string, TextOpts]>([
    ["integer ids", {}],
    ["ids near 2^64", { bigIds: true }],
    ["string ids", { strings: true }],
    ["bad lines", { bad: true }],
  ])("matches the single-thread parse: %s", async (_name, opts) => {
    const path = files.write(graphText(40_000, opts));
    const options = { weighted: true, maxBadLines: 1000 };
    const one = await ingestEdgeFile(path, options, { limits: { ...SMALL_CHUNKS, threads: 1 } });
    const two = await ingestEdgeFile(path, options, { limits: { ...SMALL_CHUNKS, threads: 2 } });
    const three = await ingestEdgeFile(path, options, { limits: { ...SMALL_CHUNKS, threads: 3 } });
    expect(one.stats.threads).toBe(1);
    expect(two.stats.threads).toBe(2);
    sameGraph(one.graph, two.graph);
    sameGraph(one.graph, three.graph);
    sameStats(one, two);
    sameStats(one, three);
    if (opts?.bad) {
      expect(one.badLines.length).toBeGreaterThan(10);
      expect(one.badLines[0]).toMatchObject({ line: 9, reason: "wrong-column-count" });
    }
  });

  it("matches for dense integer ids counted on several threads (count tables reused by the numbering and build)", async () => {
    // Ids 0..19,999 on 600,000 lines (7 MB): every parse thread gets chunks, so the direct numbering counts in one
    // table per thread and writes the degrees and the id map over those tables. Self-loops kept and dropped.
    const rnd = prng(31);
    const lines = Array.from({ length: 600_000 }, () => `${Math.floor(rnd() ** 2 * 20_000)} ${Math.floor(rnd() * 20_000)}`);
    for (let i = 0; i < lines.length; i += 50) lines[i] = `${i % 20_000} ${i % 20_000}`;
    const path = files.write(`${lines.join("\n")}\n`);
    for (const selfLoops of ["keep", "drop"] as const) {
      const one = await ingestEdgeFile(path, { selfLoops }, { limits: { chunkBytes: 64 * 1024, parallelMinBytes: 0, threads: 1 } });
      const two = await ingestEdgeFile(path, { selfLoops }, { limits: { chunkBytes: 64 * 1024, parallelMinBytes: 0, threads: 2 } });
      expect(two.stats.idPath).toBe("direct");
      sameGraph(one.graph, two.graph);
      sameStats(one, two);
    }
  });

  it("matches for gzip input and for unweighted merging", async () => {
    const text = graphText(30_000);
    const plain = files.write(text);
    const gz = files.write(text, "edges.gz", true);
    const one = await ingestEdgeFile(plain, {}, { limits: { ...SMALL_CHUNKS, threads: 1 } });
    const two = await ingestEdgeFile(gz, {}, { limits: { ...SMALL_CHUNKS, threads: 2 } });
    sameGraph(one.graph, two.graph);
    expect(one.stats.duplicates).toBeGreaterThan(0);
  });

  it.each([
    ["direct ids, weighted", false, true],
    ["hashed ids, weighted", true, true],
    ["direct ids, unweighted", false, false],
    ["hashed ids, unweighted", true, false],
  ])("matches for undirected graphs with self-loops kept (%s)", async (_name, hashIds, weighted) => {
    const path = files.write(graphText(30_000));
    const options = { directed: false, selfLoops: "keep" as const, weighted };
    const one = await ingestEdgeFile(path, options, { hashIds, limits: { ...SMALL_CHUNKS, threads: 1 } });
    const two = await ingestEdgeFile(path, options, { hashIds, limits: { ...SMALL_CHUNKS, threads: 2 } });
    sameGraph(one.graph, two.graph);
    sameStats(one, two);
    expect(one.stats.selfLoops).toBeGreaterThan(0);
  });

  it("numbers ids the same through the direct table and the hash tables", async () => {
    const path = files.write(graphText(20_000));
    const direct = await ingestEdgeFile(path, { weighted: true });
    const hashed = await ingestEdgeFile(path, { weighted: true }, { hashIds: true });
    expect(direct.stats.idPath).toBe("direct");
    expect(hashed.stats.idPath).toBe("hash");
    sameGraph(direct.graph, hashed.graph);
  });

  it("builds the graph's big arrays on shared memory", async () => {
    const r = await ingestEdgeFile(files.write(graphText(1000)), { weighted: true });
    expect(isShared(r.graph.inOffsets) && isShared(r.graph.sources) && isShared(r.graph.outWeight)).toBe(true);
    expect(r.graph.weights && isShared(r.graph.weights)).toBe(true);
  });
});
