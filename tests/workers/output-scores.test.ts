// Score files and rank order: round trips through CSV, Arrow IPC and Parquet.
import { tableFromIPC, type Table } from "apache-arrow";
import { mkdtemp, readdir, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Compression, ParquetFile, readParquet } from "parquet-wasm/node";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { NodeIds } from "../../workers/src/core/graph";
import { SharedHeap } from "../../workers/src/core/shared-heap";
import { assemblyModule } from "../../workers/src/tasks/assembly";
import { certainTop, rankOrder, rankOrderIn, ranks, topK } from "../../workers/src/output/rank-order";
import { writeScores } from "../../workers/src/output/write-scores";
import { prng, sameBits, stringIds } from "./rank-test-graphs";

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "stillpoint-scores-"));
});
afterAll(() => rm(dir, { recursive: true, force: true }));

function naiveOrder(s: Float64Array): number[] {
  return [...s.keys()].sort((a, b) => s[b] - s[a] || a - b);
}

function scoresWithTies(seed: number, n: number): Float64Array {
  const rnd = prng(seed);
  const pool = Float64Array.from({ length: 1 + Math.floor(n / 3) }, () => rnd() * 1e-3 * (rnd() < 0.1 ? 1e-200 : 1));
  return Float64Array.from({ length: n }, () => (rnd() < 0.05 ? 0 : pool[Math.floor(rnd() * pool.length)]));
}

describe("rank order", () => {
  it("orders by score descending, ties by ascending dense id, like a comparison sort", () => {
    for (const n of [0, 1, 2, 17, 1000, 70_000]) {
      const s = scoresWithTies(n + 1, n);
      const want = naiveOrder(s);
      expect(Array.from(rankOrder(s))).toEqual(want);
      const wantRanks = new Uint32Array(n);
      want.forEach((v, i) => (wantRanks[v] = i + 1));
      expect(ranks(s)).toEqual(wantRanks);
      for (const k of [0, 1, 5, n, n + 3]) expect(Array.from(topK(s, k))).toEqual(want.slice(0, k));
    }
  });

  it("treats −0 as 0 and handles extremes", () => {
    const s = Float64Array.of(-0, 0, Number.MIN_VALUE, 1, Number.MAX_VALUE, 0.5);
    expect(Array.from(rankOrder(s))).toEqual([4, 3, 5, 2, 0, 1]);
    expect(Array.from(topK(s, 3))).toEqual([4, 3, 5]);
    expect(() => topK(s, -1)).toThrow(/k must be/);
  });

  it("gives the same order in WebAssembly on a shared heap (the CLI's way), negatives, zeros and ties included", () => {
    for (const n of [0, 1, 17, 70_000]) {
      const s = scoresWithTies(n + 7, n);
      for (let i = 0; i < n; i += 13) s[i] = -s[i];
      if (n > 2) [s[0], s[1]] = [-0, 0];
      const heap = SharedHeap.create(7 * 4 * n + 6 * 2048 * 4 + 4096) as SharedHeap;
      const order = rankOrderIn(heap.memory, assemblyModule("order-lists"), s, (length) => heap.u32(length));
      expect(order.buffer).toBe(heap.buffer);
      expect(Array.from(order)).toEqual(Array.from(rankOrder(s)));
    }
  });
});

describe("certain top-k positions", () => {
  it("marks a position certain only when both neighbours are more than twice the bound away", () => {
    const s = Float64Array.of(0.1, 0.3, 0.05, 0.29, 0.26);
    // rank order: 1 (0.3), 3 (0.29), 4 (0.26), 0 (0.1), 2 (0.05)
    const r = certainTop(s, 4, 0.01);
    expect(Array.from(r.top)).toEqual([1, 3, 4, 0]);
    expect(Array.from(r.certain)).toEqual([0, 0, 1, 1]);
    expect(Array.from(certainTop(s, 5, 0).certain)).toEqual([1, 1, 1, 1, 1]);
    expect(Array.from(certainTop(s, 2, 0.1).certain)).toEqual([0, 0]);
    expect(() => certainTop(s, 2, NaN)).toThrow(/bound/);
  });
});

const META = { damping: "0.85", weighted: "false", iterations: "12", residual: "8.1e-10", fingerprint: "sha256:ab12" };

function integerIds(n: number): NodeIds {
  return { kind: "integer", ids: BigUint64Array.from({ length: n }, (_, i) => (i === 0 ? 18_446_744_073_709_551_615n : BigInt(i) * 1_000_003n)) };
}

function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = "";
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') field += text[++i];
      else if (ch === '"') quoted = false;
      else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ",") {
      row.push(field);
      field = "";
    } else if (ch === "\n") {
      rows.push([...row, field]);
      row = [];
      field = "";
    } else field += ch;
  }
  return rows;
}

describe("writeScores", () => {
  const n = 50_000;
  const scores = scoresWithTies(5, n);
  const order = naiveOrder(scores);
  const ids = integerIds(n);
  const idsOf = (v: number) => (ids.kind === "integer" ? ids.ids[v] : 0n);
  const wantIds = BigUint64Array.from(order, idsOf);
  const wantScores = Float64Array.from(order, (v) => scores[v]);
  const wantRanks = Uint32Array.from(order, (_, i) => i + 1);
  const expectColumns = (t: Table) => {
    expect(sameBits(t.getChild("score")?.toArray() as Float64Array, wantScores)).toBe(true);
    expect(t.getChild("node_id")?.toArray()).toEqual(wantIds);
    expect(t.getChild("rank")?.toArray()).toEqual(wantRanks);
  };

  it("CSV: header, rank order, and scores that parse back to the same bits", async () => {
    const path = join(dir, "scores.csv");
    await writeScores(path, "csv", ids, scores, META);
    const rows = parseCsv(await readFile(path, "utf8"));
    expect(rows[0]).toEqual(["node_id", "score", "rank"]);
    expect(rows).toHaveLength(n + 1);
    const body = rows.slice(1);
    expect(BigUint64Array.from(body, (r) => BigInt(r[0]))).toEqual(wantIds);
    expect(sameBits(Float64Array.from(body, (r) => Number(r[1])), wantScores)).toBe(true);
    expect(Uint32Array.from(body, (r) => Number(r[2]))).toEqual(wantRanks);
  });

  it("CSV quotes string ids that need it and keeps UTF-8", async () => {
    const names = ["Kestrel Point", 'North "Gull" Rock', "Tide,Station 4", "Sǽl Haven", "line\nbreak"];
    const s = Float64Array.of(0.1, 0.4, 0.2, 0.25, 0.05);
    const path = join(dir, "strings.csv");
    await writeScores(path, "csv", stringIds(names), s, META);
    const rows = parseCsv(await readFile(path, "utf8")).slice(1);
    expect(rows.map((r) => r[0])).toEqual([names[1], names[3], names[2], names[0], names[4]]);
  });

  it("Arrow IPC file: uint64 ids, float64 scores, uint32 ranks and the metadata", async () => {
    const path = join(dir, "scores.arrow");
    await writeScores(path, "arrow", ids, scores, META);
    const t = tableFromIPC(await readFile(path));
    expect(t.schema.fields.map((f) => `${f.name}:${String(f.type)}`)).toEqual(["node_id:Uint64", "score:Float64", "rank:Uint32"]);
    expect(Object.fromEntries(t.schema.metadata)).toEqual(META);
    expect(t.numRows).toBe(n);
    expectColumns(t);
  });

  it("Parquet (ZSTD): same columns read back with parquet-wasm, metadata in the file footer", async () => {
    const path = join(dir, "scores.parquet");
    await writeScores(path, "parquet", ids, scores, META);
    const bytes = new Uint8Array(await readFile(path));
    const t = tableFromIPC(readParquet(bytes).intoIPCStream());
    expect(t.numRows).toBe(n);
    expectColumns(t);
    const file = await ParquetFile.fromFile(new Blob([bytes]));
    const meta = file.metadata();
    const kv = meta.fileMetadata().keyValueMetadata() as Map<string, string>;
    for (const [k, v] of Object.entries(META)) expect(kv.get(k)).toBe(v);
    const rg = meta.rowGroup(0);
    for (let c = 0; c < rg.numColumns(); c++) expect(rg.column(c).compression()).toBe(Compression.ZSTD);
  });

  it("Parquet and Arrow carry string ids as utf8", async () => {
    const names = ["Kestrel Point", "Sǽl Haven", "Tide,Station 4"];
    const s = Float64Array.of(0.2, 0.5, 0.3);
    for (const format of ["arrow", "parquet"] as const) {
      const path = join(dir, `strings.${format}`);
      await writeScores(path, format, stringIds(names), s, META);
      const bytes = new Uint8Array(await readFile(path));
      const t = format === "arrow" ? tableFromIPC(bytes) : tableFromIPC(readParquet(bytes).intoIPCStream());
      expect(String(t.schema.fields[0].type)).toMatch(/Utf8/);
      expect(t.getChild("node_id")?.toArray()).toEqual([names[1], names[2], names[0]]);
    }
  });

  it("replaces an existing file atomically and leaves no temp files, also after a failure", async () => {
    const sub = await mkdtemp(join(dir, "atomic-"));
    const path = join(sub, "scores.csv");
    await writeFile(path, "old");
    await writeScores(path, "csv", integerIds(3), Float64Array.of(0.5, 0.3, 0.2), META);
    expect((await readFile(path, "utf8")).split("\n")[0]).toBe("node_id,score,rank");
    await expect(writeScores(path, "csv", integerIds(2), Float64Array.of(0.5, 0.3, 0.2), META)).rejects.toThrow(RangeError);
    await expect(writeScores(join(sub, "no-such-dir", "x.csv"), "csv", integerIds(1), Float64Array.of(1), META)).rejects.toThrow();
    expect(await readdir(sub)).toEqual(["scores.csv"]);
  });
});
