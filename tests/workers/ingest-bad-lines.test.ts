// Bad lines: every reason is named with its physical line number; the threshold decides between failing and skipping.
import { afterAll, describe, expect, it } from "vitest";
import { IngestError, type BadLineReason } from "../../workers/src/ingest/errors";
import { ingestEdgeFile } from "../../workers/src/ingest/ingest";
import { edgeList, TempFiles } from "../fixtures/edges/edge-files";

const files = new TempFiles();
afterAll(() => files.remove());

const GOOD = "# comment line\n1,2,1\n\n2,3,1\n";
const long = "9".repeat(2000);

// Each case: a bad line placed after GOOD (4 lines), so it is line 5 of the file.
const cases: Array<[BadLineReason, string | Uint8Array]> = [
  ["wrong-column-count", "4,5\n"],
  ["wrong-column-count", "4,5,1,9\n"],
  ["empty-id", ",5,1\n"],
  ["id-too-large", "18446744073709551616,5,1\n"],
  ["id-too-large", "4,1234567890123456789012345,1\n"],
  ["field-too-long", `x${long},5,1\n`],
  ["invalid-utf8", new Uint8Array([0x61, 0xff, 0x62, 0x2c, 0x35, 0x2c, 0x31, 0x0a])],
  ["invalid-utf8", new Uint8Array([0xed, 0xa0, 0x80, 0x2c, 0x35, 0x2c, 0x31, 0x0a])],
  ["nul-byte", new Uint8Array([0x34, 0x00, 0x2c, 0x35, 0x2c, 0x31, 0x0a])],
  ["unterminated-quote", '"Gannet,5,1\n'],
  ["bad-weight", "4,5,heavy\n"],
  ["negative-weight", "4,5,-0.5\n"],
  ["non-finite-weight", "4,5,NaN\n"],
  ["non-finite-weight", "4,5,inf\n"],
  ["non-finite-weight", "4,5,1e999\n"],
];

function withGood(bad: string | Uint8Array, crlf = false): Uint8Array {
  const head = Buffer.from(crlf ? GOOD.replaceAll("\n", "\r\n") : GOOD);
  const tail = typeof bad === "string" ? Buffer.from(bad) : Buffer.from(bad);
  return Buffer.concat([head, tail, Buffer.from("3,1,1\n")]);
}

describe("bad-line reasons", () => {
  it.each(cases)("%s is reported at its line number, and fails the ingest by default", async (reason, bad) => {
    const path = files.write(withGood(bad));
    const err = await ingestEdgeFile(path).then(
      () => null,
      (e: unknown) => e,
    );
    expect(err).toBeInstanceOf(IngestError);
    const e = err as IngestError;
    expect(e.code).toBe("too-many-bad-lines");
    expect(e.firstBadLine).toMatchObject({ line: 5, reason });
    expect(e.message).toContain(path);
    expect(e.message).toContain("line 5");
  });

  it.each(cases)("%s is skipped and sampled when under maxBadLines", async (reason, bad) => {
    const r = await ingestEdgeFile(files.write(withGood(bad, true)), { maxBadLines: 1 });
    expect(r.stats.badLines).toBe(1);
    expect(r.badLines).toEqual([expect.objectContaining({ line: 5, reason })]);
    expect(edgeList(r.graph)).toEqual(["1>2", "2>3", "3>1"]);
  });

  it("reports an over-long line (beyond the line limit) with its line number", async () => {
    const huge = `1,${"7".repeat(3 << 20)},1\n`;
    const r = await ingestEdgeFile(files.write(withGood(huge)), { maxBadLines: 5 }, { limits: { chunkBytes: 1 << 16 } });
    expect(r.badLines).toEqual([expect.objectContaining({ line: 5, reason: "line-too-long" })]);
    expect(r.stats.lines).toBe(6);
    expect(edgeList(r.graph)).toEqual(["1>2", "2>3", "3>1"]);
  });
});

describe("threshold", () => {
  it("samples the first 100 bad lines and counts them all", async () => {
    const lines = ["1 2"];
    for (let i = 0; i < 250; i++) lines.push(i % 2 ? "3 4 5 6" : `${i} ${i + 1}`);
    const r = await ingestEdgeFile(files.write(`${lines.join("\n")}\n`), { maxBadLines: 1000 });
    expect(r.stats.badLines).toBe(125);
    expect(r.badLines).toHaveLength(100);
    expect(r.badLines[0]).toMatchObject({ line: 3, reason: "wrong-column-count", detail: "expected 2 columns, found 4" });
    expect(r.badLines[99].line).toBe(201);
  });

  it("fails once the count passes maxBadLines, naming the first bad line", async () => {
    const path = files.write("1 2\nx\n2 3\ny\nz\n");
    const err = (await ingestEdgeFile(path, { maxBadLines: 2 }).catch((e: unknown) => e)) as IngestError;
    expect(err.code).toBe("too-many-bad-lines");
    expect(err.firstBadLine?.line).toBe(2);
    expect(err.badLineCount).toBe(3);
    const ok = await ingestEdgeFile(path, { maxBadLines: 3 });
    expect(ok.stats.badLines).toBe(3);
  });

  it("fails with a clear error when every line is bad", async () => {
    const err = (await ingestEdgeFile(files.write("a b c\nd e f g\n"), { maxBadLines: 10 }).catch((e: unknown) => e)) as IngestError;
    expect(err.code).toBe("no-edges");
  });
});
