// Every file of the bad-input corpus goes through the ingest: a rejected file must fail with the manifest's code,
// naming the file, the first bad line and its reason; an accepted one must build with the stated statistics.
import { readdirSync } from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { BAD_LINE_REASONS, describeBadLine, IngestError, REASON_CODES, type BadLineReason } from "../../workers/src/ingest/errors";
import { ingestEdgeFile, type IngestResult, type IngestRun } from "../../workers/src/ingest/ingest";
import { caseBytes, CORPUS_DIR, loadCorpus, NOT_INPUTS, type AcceptedStats, type CorpusCase, type RejectedCase } from "../fixtures/bad-input/corpus";
import { nodeIds, TempFiles } from "../fixtures/edges/edge-files";

const cases = loadCorpus();
const rejected = cases.filter((c): c is RejectedCase => c.outcome === "rejected");
const accepted = cases.filter((c) => c.outcome === "accepted");
const files = new TempFiles();
afterAll(() => files.remove());

const generated = new Map<string, string>();
function fileOf(c: CorpusCase): string {
  if (!c.generate) return path.join(CORPUS_DIR, c.file);
  let file = generated.get(c.file);
  if (!file) {
    file = files.write(caseBytes(c), c.file);
    generated.set(c.file, file);
  }
  return file;
}

async function ingestError(file: string, c: CorpusCase, run: IngestRun = {}): Promise<IngestError> {
  const outcome = await ingestEdgeFile(file, c.options ?? {}, run).then(
    (r) => r,
    (e: unknown) => e,
  );
  if (!(outcome instanceof IngestError)) throw new Error(`${c.file}: expected an IngestError, got ${outcome instanceof Error ? outcome.stack : "a graph"}`);
  return outcome;
}

function expectRejection(err: IngestError, c: RejectedCase, file: string): void {
  expect(err.code).toBe(c.code);
  expect(err.file).toBe(file);
  expect(err.message).toContain(c.file);
  expect(err.message).toContain(c.text);
  if (c.line === null) {
    expect(err.firstBadLine).toBeNull();
    return;
  }
  const first = err.firstBadLine;
  expect(first).toMatchObject({ line: c.line, reason: c.reason });
  if (!first) return;
  // The sentence the portal shows: "line N: <reason>[ (detail)]".
  expect(describeBadLine(first)).toMatch(new RegExp(`^line ${c.line}: ${escape(BAD_LINE_REASONS[first.reason])}`));
  expect(err.badLines[0]).toEqual(first);
  if (c.code === "too-many-bad-lines") expect(err.message).toContain(`line ${c.line}: ${BAD_LINE_REASONS[first.reason]}`);
}

function expectStats(r: IngestResult, want: AcceptedStats): void {
  const { ids, warning, ...stats } = want;
  expect(r.stats).toMatchObject(stats);
  if (ids) expect(nodeIds(r.graph).sort()).toEqual(ids);
  if (warning) expect(r.stats.warnings.join("\n")).toContain(warning);
}

function escape(text: string): string {
  return text.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
}

describe("the corpus", () => {
  it("has a manifest entry for every file and a file for every entry", () => {
    const onDisk = readdirSync(CORPUS_DIR).filter((f) => !NOT_INPUTS.has(f)).sort();
    const committed = cases.filter((c) => !c.generate).map((c) => c.file).sort();
    expect(onDisk).toEqual(committed);
    expect(new Set(cases.map((c) => c.file)).size).toBe(cases.length);
    expect(cases.length).toBeGreaterThanOrEqual(30);
  });

  it("covers every bad-line reason and the file-level failures", () => {
    const reasons = new Set(rejected.flatMap((c) => (c.reason ? [c.reason] : [])));
    expect([...reasons].sort()).toEqual([...REASON_CODES].sort());
    for (const r of reasons) expect(REASON_CODES).toContain(r as BadLineReason);
    const codes = new Set(rejected.map((c) => c.code));
    for (const code of ["too-many-bad-lines", "no-edges", "empty-file", "no-data", "header-only", "gzip-corrupt", "gzip-bomb"]) {
      expect(codes).toContain(code);
    }
  });

  it("generates a long line over 10 MB and a gzip bomb with a high expansion ratio", () => {
    const long = cases.find((c) => c.generate === "long-line");
    const bomb = cases.find((c) => c.generate === "gzip-bomb");
    if (!long || !bomb) throw new Error("generated cases missing from the manifest");
    expect(caseBytes(long).length).toBeGreaterThan(10 * 2 ** 20);
    const packed = caseBytes(bomb);
    expect([packed[0], packed[1]]).toEqual([0x1f, 0x8b]);
    expect((24 * 2 ** 20) / packed.length).toBeGreaterThan(500);
  });
});

describe("rejected files", () => {
  it.each(rejected.map((c) => [c.file, c] as const))("%s", async (_name, c) => {
    const file = fileOf(c);
    expectRejection(await ingestError(file, c), c, file);
  });
});

describe("rejected files are accepted when the options allow their bad lines", () => {
  const retried = rejected.filter((c) => c.retry);
  it("has retry cases", () => expect(retried.length).toBeGreaterThanOrEqual(8));
  it.each(retried.map((c) => [c.file, c] as const))("%s", async (_name, c) => {
    if (!c.retry) return;
    const r = await ingestEdgeFile(fileOf(c), c.retry.options);
    expectStats(r, c.retry.expect);
    expect(r.badLines[0]).toMatchObject({ line: c.line, reason: c.reason });
  });
});

describe("accepted files", () => {
  it.each(accepted.map((c) => [c.file, c] as const))("%s", async (_name, c) => {
    if (c.outcome !== "accepted") return;
    const r = await ingestEdgeFile(fileOf(c), c.options ?? {});
    expect(r.stats.badLines).toBe(0);
    expectStats(r, c.expect);
  });
});

describe("line numbers do not depend on how the file is cut into chunks and spread over threads", () => {
  const small = rejected.filter((c) => c.line !== null && !c.generate);
  const run: IngestRun = { limits: { threads: 2, parallelMinBytes: 0, chunkBytes: 4096 } };
  it.each(small.map((c) => [c.file, c] as const))("%s", async (_name, c) => {
    const file = fileOf(c);
    expectRejection(await ingestError(file, c, run), c, file);
  });
});
