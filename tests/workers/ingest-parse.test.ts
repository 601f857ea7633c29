// Parsing edge-list files: formats, id kinds, headers, gzip, and the clear errors for files without edges.
import { join } from "node:path";
import { gzipSync } from "node:zlib";
import { afterAll, describe, expect, it } from "vitest";
import { IngestError } from "../../workers/src/ingest/errors";
import { ingestEdgeFile } from "../../workers/src/ingest/ingest";
import { edgeList, FIXTURES, nodeIds, outWeights, TempFiles } from "../fixtures/edges/edge-files";

const files = new TempFiles();
afterAll(() => files.remove());

async function edgesOf(content: string | Uint8Array, options = {}, gzip = false) {
  return ingestEdgeFile(files.write(content, undefined, gzip), options);
}

async function failure(content: string | Uint8Array, options = {}): Promise<IngestError> {
  const path = files.write(content);
  const err = await ingestEdgeFile(path, options).then(
    () => null,
    (e: unknown) => e,
  );
  expect(err).toBeInstanceOf(IngestError);
  const e = err as IngestError;
  expect(e.message).toContain(path);
  return e;
}

describe("integer ids", () => {
  it("keeps ids above 2^53 exact, up to 2^64 - 1", async () => {
    const r = await edgesOf("9007199254740993 9007199254740992\n18446744073709551615 9007199254740993\n1 18446744073709551614\n");
    expect(r.stats.idKind).toBe("integer");
    expect(r.graph.ids.kind).toBe("integer");
    expect(nodeIds(r.graph).sort()).toEqual(
      ["1", "9007199254740992", "9007199254740993", "18446744073709551614", "18446744073709551615"].sort(),
    );
    expect(edgeList(r.graph)).toEqual(
      ["9007199254740993>9007199254740992", "18446744073709551615>9007199254740993", "1>18446744073709551614"].sort(),
    );
  });

  it("reads thousands of random 64-bit ids exactly (fast path and general path agree)", async () => {
    let x = 0x9e3779b97f4a7c15n;
    const next = () => {
      x ^= (x << 13n) & 0xffffffffffffffffn;
      x ^= x >> 7n;
      x ^= (x << 17n) & 0xffffffffffffffffn;
      return x >> BigInt(Number(x & 63n));
    };
    const pairs = Array.from({ length: 3000 }, () => [next(), next()] as const);
    const text = pairs.map(([a, b]) => `${a}\t${b}`).join("\n");
    const expected = [...new Set(pairs.map(([a, b]) => `${a}>${b}`))].sort();
    const r = await edgesOf(`${text}\n`, { selfLoops: "keep", duplicates: "merge" });
    const plain = (g: typeof r.graph) => edgeList(g).map((e) => e.replace(/:\d+$/, "")).sort();
    expect(plain(r.graph)).toEqual(expected);
    const padded = await edgesOf(`${pairs.map(([a, b]) => `000${a} 0${b}`).join("\n")}\n`, { selfLoops: "keep" });
    expect(plain(padded.graph)).toEqual(expected);
  });

  it("treats leading zeros as the same integer", async () => {
    const r = await edgesOf("007 8\n7 9\n");
    expect(nodeIds(r.graph).sort()).toEqual(["7", "8", "9"]);
    expect(r.graph.m).toBe(2);
  });

  it("reads the citation fixture: % comments, CRLF, spaces, an id past 2^53", async () => {
    const r = await ingestEdgeFile(join(FIXTURES, "tidal-citations.txt"));
    expect(r.stats.format.delimiter).toBe(" ");
    expect(r.stats.commentLines).toBe(1);
    expect(r.stats.lines).toBe(6);
    expect(edgeList(r.graph)).toEqual(["101>205", "101>317", "205>317", "317>101", "9007199254740993>101"]);
  });
});

describe("string ids", () => {
  it("keeps UTF-8 ids byte for byte, quoted CSV fields included", async () => {
    const r = await ingestEdgeFile(join(FIXTURES, "kestrel-ferries.csv"), { weighted: true });
    expect(r.stats.idKind).toBe("string");
    expect(r.stats.format).toMatchObject({ delimiter: ",", header: true, columns: 3 });
    expect(nodeIds(r.graph).sort()).toEqual(["Gannet Quay", "Puffin Sound", "Skerry Head", "Tern Harbour, North Pier", "Ørnholm Jetty"]);
    expect(edgeList(r.graph)).toContain("Gannet Quay>Skerry Head:20");
    expect(edgeList(r.graph)).toContain("Tern Harbour, North Pier>Puffin Sound:3.5");
    expect(outWeights(r.graph)["Gannet Quay"]).toBe(27);
    expect(r.stats.selfLoops).toBe(1);
    expect(r.stats.duplicates).toBe(1);
  });

  it("unescapes doubled quotes inside a quoted field", async () => {
    const r = await edgesOf('"The ""Kittiwake"" Café",Lighthouse\n');
    expect(nodeIds(r.graph).sort()).toEqual(["Lighthouse", 'The "Kittiwake" Café']);
  });

  it("turns an integer file into a string-id file when a later id is not an integer", async () => {
    const lines = Array.from({ length: 1500 }, (_, i) => `${i} ${i + 1}`);
    lines.push("1500 harbour-master");
    const r = await edgesOf(`${lines.join("\n")}\n`, {}, false);
    expect(r.stats.idKind).toBe("string");
    expect(r.stats.warnings.join(" ")).toMatch(/non-integer id/);
    expect(r.graph.n).toBe(1502);
    expect(edgeList(r.graph)).toContain("1500>harbour-master");
    expect(edgeList(r.graph)).toContain("0>1");
  });
});

describe("layout", () => {
  it("accepts CRLF line ends and a UTF-8 byte order mark", async () => {
    const r = await edgesOf(new Uint8Array([0xef, 0xbb, 0xbf, ...Buffer.from("1,2\r\n2,3\r\n3,1")]));
    expect(edgeList(r.graph)).toEqual(["1>2", "2>3", "3>1"]);
    expect(r.stats.format.delimiter).toBe(",");
  });

  it("detects a header row from its words and from non-integer ids above integer rows", async () => {
    const a = await edgesOf("source\ttarget\n1\t2\n");
    expect(a.stats.format.header).toBe(true);
    expect(a.stats.headerLines).toBe(1);
    const b = await edgesOf("citing,cited_by_x\n1,2\n2,3\n");
    expect(b.stats.format.header).toBe(true);
    expect(edgeList(b.graph)).toEqual(["1>2", "2>3"]);
    const c = await edgesOf("1,2\n2,3\n");
    expect(c.stats.format.header).toBe(false);
  });

  it("follows a stated header and delimiter", async () => {
    const r = await edgesOf("10 20\n30 40\n", { header: true, delimiter: " " });
    expect(edgeList(r.graph)).toEqual(["30>40"]);
    const t = await edgesOf("a b\tc d\n", { delimiter: "\t" });
    expect(edgeList(t.graph)).toEqual(["a b>c d"]);
  });

  it("reads gzip files (detected by magic bytes, not the name)", async () => {
    const text = Array.from({ length: 5000 }, (_, i) => `${i}\t${(i * 7) % 5000}`).join("\n");
    const plain = await edgesOf(text);
    const gz = await edgesOf(text, {}, true);
    expect(gz.stats.format.gzip).toBe(true);
    expect(plain.stats.format.gzip).toBe(false);
    expect(edgeList(gz.graph)).toEqual(edgeList(plain.graph));
    expect(gz.stats.fingerprint).not.toBe(plain.stats.fingerprint);
  });

  it("refuses a gzip stream that expands too much, and names corrupt gzip data", async () => {
    const bomb = files.write(`${"1 2\n".repeat(3_000_000)}`, "bomb.gz", true);
    const ratio = (await ingestEdgeFile(bomb).catch((e: unknown) => e)) as IngestError;
    expect(ratio).toBeInstanceOf(IngestError);
    expect(ratio.code).toBe("gzip-bomb");
    expect(ratio.message).toMatch(/expands more than 200x/);
    const fine = await ingestEdgeFile(bomb, {}, { limits: { maxExpansionRatio: 100_000 } });
    expect(fine.stats.rows).toBe(3_000_000);
    const capped = (await ingestEdgeFile(bomb, {}, { limits: { maxExpansionRatio: 100_000, maxDecompressedBytes: 1 << 20 } }).catch(
      (e: unknown) => e,
    )) as IngestError;
    expect(capped.code).toBe("gzip-bomb");
    const gz = gzipSync(Buffer.from("1 2\n2 3\n".repeat(1000)));
    gz[gz.length - 6] ^= 0xff;
    const corrupt = (await ingestEdgeFile(files.write(gz)).catch((e: unknown) => e)) as IngestError;
    expect(corrupt.code).toBe("gzip-corrupt");
  });

  it("fingerprints the raw bytes with sha256", async () => {
    const { createHash } = await import("node:crypto");
    const text = "1 2\n2 3\n";
    const r = await edgesOf(text);
    expect(r.stats.fingerprint).toBe(createHash("sha256").update(text).digest("hex"));
    expect(r.stats.bytesRead).toBe(text.length);
  });

  it("fingerprints every raw byte whatever the chunking: a BOM, lines across chunks, an over-long line, no final newline", async () => {
    const { createHash } = await import("node:crypto");
    const lines = Array.from({ length: 30_000 }, (_, i) => `${i % 977} ${(i * 31) % 1013}`);
    const cases: Array<[string, Buffer]> = [
      ["plain", Buffer.from(`${lines.join("\n")}\n`)],
      ["bom, no final newline", Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(lines.join("\n"))])],
      // A comment line longer than the line limit (1 MiB) is replaced by a mark for the parser, not in the fingerprint.
      ["over-long line", Buffer.from(`${lines.slice(0, 100).join("\n")}\n# ${"x".repeat((1 << 20) + 5000)}\n${lines.slice(100).join("\n")}\n`)],
    ];
    for (const [name, bytes] of cases) {
      const want = createHash("sha256").update(bytes).digest("hex");
      for (const limits of [{}, { chunkBytes: 4096, parallelMinBytes: 0, threads: 2 }]) {
        const r = await ingestEdgeFile(files.write(bytes), { maxBadLines: 10 }, { limits }).catch((e: unknown) => e);
        const fingerprint = r instanceof IngestError ? null : (r as Awaited<ReturnType<typeof ingestEdgeFile>>).stats.fingerprint;
        expect(fingerprint, `${name} ${JSON.stringify(limits)}`).toBe(want);
      }
    }
  });

  it("keeps the weight range even when weights are not used", async () => {
    const r = await edgesOf("1,2,0.25\n2,3,1e3\n3,1,7\n");
    expect(r.stats.weight).toEqual({ min: 0.25, max: 1000 });
    expect(r.graph.weights).toBeNull();
    const w = await edgesOf("1,2,0.25\n2,3,1e3\n3,1,7\n", { weighted: true });
    expect(edgeList(w.graph)).toEqual(["1>2:0.25", "2>3:1000", "3>1:7"]);
  });
});

describe("files without edges", () => {
  it("rejects an empty file", async () => {
    expect((await failure("")).code).toBe("empty-file");
  });
  it("rejects a file of comments and blank lines", async () => {
    const e = await failure("# nothing\n\n% here\n");
    expect(e.code).toBe("no-data");
    expect(e.message).toMatch(/only comments/);
  });
  it("rejects a header without rows", async () => {
    const e = await failure("source,target\n");
    expect(e.code).toBe("header-only");
    expect(e.message).toMatch(/only a header row/);
  });
});
