// The prepared graph on disk: write, load (whole and by piece), shared memory, and clear errors for corrupt stores.
import { readdirSync, readFileSync, truncateSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Graph } from "../../workers/src/core/graph";
import { GraphStoreError, planPieces } from "../../workers/src/graph-store/format";
import { GraphStore, loadGraphStore } from "../../workers/src/graph-store/load";
import { isShared } from "../../workers/src/graph-store/shared";
import { writeGraphStore } from "../../workers/src/graph-store/write";
import { ingestEdgeFile } from "../../workers/src/ingest/ingest";
import { FIXTURES, TempFiles } from "../fixtures/edges/edge-files";

const files = new TempFiles();
let weighted: Graph;
let plain: Graph;

beforeAll(async () => {
  const lines = Array.from({ length: 20_000 }, (_, i) => `${(i * 31) % 9001} ${(i * 17 + 5) % 9001} ${(i % 7) + 1}`);
  const path = files.write(`${lines.join("\n")}\n`);
  weighted = (await ingestEdgeFile(path, { weighted: true })).graph;
  plain = (await ingestEdgeFile(path, { duplicates: "keep" })).graph;
});
afterAll(() => files.remove());

function expectSame(a: Graph, b: Graph): void {
  expect(b.n).toBe(a.n);
  expect(b.m).toBe(a.m);
  expect(Array.from(b.inOffsets)).toEqual(Array.from(a.inOffsets));
  expect(Array.from(b.sources)).toEqual(Array.from(a.sources));
  expect(b.weights ? Array.from(b.weights) : null).toEqual(a.weights ? Array.from(a.weights) : null);
  expect(Array.from(b.outWeight)).toEqual(Array.from(a.outWeight));
  expect(b.ids).toEqual(a.ids);
}

describe("round trip", () => {
  it.each([1, 3, 64])("writes and loads the same arrays with %i pieces, on shared memory", async (pieces) => {
    const dir = files.path(`store-w-${pieces}`);
    const meta = await writeGraphStore(dir, weighted, { pieces, options: { weighted: true }, fingerprint: "abc" });
    expect(meta.pieces.length).toBeLessThanOrEqual(pieces);
    const { graph, meta: read } = await loadGraphStore(dir);
    expectSame(weighted, graph);
    expect(read).toEqual(meta);
    expect([graph.inOffsets, graph.sources, graph.weights as Float64Array, graph.outWeight].every(isShared)).toBe(true);
  });

  it("stores unweighted graphs without weight files, and string ids", async () => {
    const dir = files.path("store-plain");
    await writeGraphStore(dir, plain, { pieces: 2 });
    expect(readdirSync(dir).some((f) => f.includes("weights"))).toBe(false);
    expectSame(plain, (await loadGraphStore(dir)).graph);
    const ferries = (await ingestEdgeFile(join(FIXTURES, "kestrel-ferries.csv"), { weighted: true })).graph;
    await writeGraphStore(files.path("store-strings"), ferries);
    expectSame(ferries, (await loadGraphStore(files.path("store-strings"))).graph);
  });

  it("loads pieces on their own: contiguous target ranges balanced by edges", async () => {
    const dir = files.path("store-pieces");
    await writeGraphStore(dir, weighted, { pieces: 2 });
    const store = await GraphStore.open(dir);
    expect(store.meta.pieces).toHaveLength(2);
    const [a, b] = await Promise.all([store.loadPiece(0), store.loadPiece(1)]);
    expect(a.start).toBe(0);
    expect(b.start).toBe(a.end);
    expect(b.end).toBe(weighted.n);
    expect(a.start % 4096).toBe(0);
    expect(Array.from(a.sources)).toEqual(Array.from(weighted.sources.subarray(0, a.sources.length)));
    expect(isShared(b.sources)).toBe(true);
    await expect(store.loadPiece(2)).rejects.toThrow(RangeError);
  });

  it("cuts pieces on block boundaries near equal edge counts", () => {
    const n = 10 * 4096;
    const off = new Uint32Array(n + 1);
    for (let v = 0; v < n; v++) off[v + 1] = off[v] + (v < 4096 ? 9 : 1);
    const pieces = planPieces(off, n, 2);
    expect(pieces).toEqual([
      { start: 0, end: 4096 },
      { start: 4096, end: n },
    ]);
  });

  it("replaces an existing store in one step", async () => {
    const dir = files.path("store-replace");
    await writeGraphStore(dir, weighted);
    await writeGraphStore(dir, plain);
    expectSame(plain, (await loadGraphStore(dir)).graph);
    expect(readdirSync(files.dir).filter((f) => f.includes("store-replace"))).toEqual(["store-replace"]);
  });
});

describe("corrupt stores", () => {
  async function corrupted(name: string, damage: (dir: string) => void, verify = true): Promise<GraphStoreError> {
    const dir = files.path(name);
    await writeGraphStore(dir, weighted, { pieces: 2 });
    damage(dir);
    const err = await loadGraphStore(dir, { verify }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(GraphStoreError);
    expect((err as Error).message).toContain(dir);
    return err as GraphStoreError;
  }

  it("names a truncated file", async () => {
    const e = await corrupted("c-trunc", (d) => truncateSync(join(d, "piece-0001.sources.u32"), 10));
    expect(e.code).toBe("corrupt");
    expect(e.message).toMatch(/piece-0001\.sources\.u32 has 10 bytes/);
  });

  it("names a file whose bytes changed", async () => {
    const e = await corrupted("c-flip", (d) => {
      const p = join(d, "piece-0000.weights.f64");
      const b = readFileSync(p);
      b[3] ^= 0x40;
      writeFileSync(p, b);
    });
    expect(e.message).toMatch(/piece-0000\.weights\.f64 does not match its checksum/);
  });

  it("catches a source index out of range even without checksums", async () => {
    const e = await corrupted(
      "c-range",
      (d) => {
        const p = join(d, "piece-0000.sources.u32");
        const b = readFileSync(p);
        b.writeUInt32LE(0xfffffff0, 0);
        writeFileSync(p, b);
      },
      false,
    );
    expect(e.message).toMatch(/names node 4294967280/);
  });

  it("rejects other format versions and a missing or broken meta.json", async () => {
    const v = await corrupted("c-version", (d) => {
      const p = join(d, "meta.json");
      writeFileSync(p, readFileSync(p, "utf8").replace('"version": 1', '"version": 99'));
    });
    expect(v.code).toBe("version");
    expect(v.message).toMatch(/version 99 is not supported/);
    const j = await corrupted("c-json", (d) => writeFileSync(join(d, "meta.json"), "{ not json"));
    expect(j.message).toMatch(/not valid JSON/);
    const m = await corrupted("c-meta", (d) => {
      const p = join(d, "meta.json");
      writeFileSync(p, readFileSync(p, "utf8").replace(/"m": \d+/, '"m": 5'));
    });
    expect(m.message).toMatch(/pieces hold \d+ edges, not 5/);
    await expect(loadGraphStore(files.path("no-such-store"))).rejects.toThrow(/meta\.json is missing/);
  });
});
