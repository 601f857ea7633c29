// Bad files through the real API: tus upload, POST /api/graphs, an in-process runner. A rejected graph says which
// file, line and reason; the upload stays listed with unchanged bytes; the server stays healthy; a retry with options
// that allow the bad lines gives a ready graph.
import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GraphDetailSchema, type GraphDetail } from "../../api/contracts/graphs";
import { UploadPageSchema } from "../../api/contracts/uploads";
import { uploadsDir } from "../../api/src/lib/data-paths";
import type { RunningServer } from "../../api/src/server";
import { BAD_LINE_REASONS, type BadLineReason } from "../../workers/src/ingest/errors";
import { startRunner, type Runner } from "../../workers/src/runner/main";
import { caseBytes, loadCorpus, type AcceptedStats, type CorpusCase } from "../fixtures/bad-input/corpus";
import { tokenClient, tusUpload, waitFor, type TusResult } from "./portal-support";
import { removeDir, runnerConfig, tempDataDir } from "./runner-support";
import { createTestTeam, startTestServer, type ApiClient } from "./support";

const SUBSET = [
  "one-column.csv",
  "id-over-u64.txt",
  "negative-weight.csv",
  "nul-byte.txt",
  "windows-1252.csv",
  "stray-quote.csv",
  "bad-line-in-gzip.txt.gz",
  "nan-weight-first-line.txt",
  "truncated.csv.gz",
  "header-only.csv",
  "long-line.csv",
  "gzip-bomb.csv.gz",
  "crlf-lf-mix.csv",
  "utf8-bom-string-ids.csv",
];

const corpus = loadCorpus();
const subset = SUBSET.map((file) => {
  const c = corpus.find((k) => k.file === file);
  if (!c) throw new Error(`${file} is not in the corpus manifest`);
  return c;
});

interface Sent {
  c: CorpusCase;
  bytes: Buffer;
  sha256: string;
  upload: TusResult;
  graphId: number;
}

const sha256 = (bytes: Buffer) => createHash("sha256").update(bytes).digest("hex");

function expectStats(detail: GraphDetail, want: AcceptedStats): void {
  const { ids: _ids, warning, ...stats } = want;
  expect(detail.statistics).toMatchObject(stats);
  if (warning) expect(detail.statistics?.warnings?.join("\n")).toContain(warning);
}

describe("bad uploads through the API", () => {
  let server: RunningServer;
  let runner: Runner;
  let dataDir: string;
  let api: ApiClient;
  const sent = new Map<string, Sent>();

  async function finished(graphId: number): Promise<GraphDetail> {
    return waitFor(`graph ${graphId} to be ingested`, async () => {
      const detail = GraphDetailSchema.parse((await api.get(`/api/graphs/${graphId}`)).body);
      return detail.status === "ready" || detail.status === "rejected" ? detail : null;
    });
  }

  async function expectUploadIntact(s: Sent): Promise<void> {
    const page = UploadPageSchema.parse((await api.get("/api/uploads?limit=200")).body);
    const listed = page.items.find((u) => u.id === s.upload.uploadId);
    expect(listed).toMatchObject({ state: "complete", filename: s.c.file, size: s.bytes.length, checksum: `sha256:${s.sha256}` });
    expect(sha256(readFileSync(path.join(uploadsDir(dataDir), s.upload.tusId)))).toBe(s.sha256);
  }

  async function expectHealthy(): Promise<void> {
    const health = await api.get("/api/health");
    expect(health.status).toBe(200);
    expect(health.body).toEqual({ ok: true });
  }

  beforeAll(async () => {
    dataDir = tempDataDir();
    server = await startTestServer({ STILLPOINT_DATA_DIR: dataDir });
    const team = await createTestTeam(server, "bad-uploads");
    api = await tokenClient(server, team.email.engineer);
    runner = await startRunner(runnerConfig(dataDir, team.teamId));
    for (const c of subset) {
      const bytes = caseBytes(c);
      const upload = await tusUpload(server, { bearer: api.bearer }, bytes, c.file, { chunkSize: 4 * 2 ** 20 });
      const created = await api.post<{ id: number }>("/api/graphs", { uploadId: upload.uploadId, name: `Kestrel input ${c.file}`, options: c.options ?? {} });
      if (created.status !== 202) throw new Error(`POST /api/graphs for ${c.file}: ${created.status} ${JSON.stringify(created.body)}`);
      sent.set(c.file, { c, bytes, sha256: sha256(bytes), upload, graphId: created.body.id });
    }
  });

  afterAll(async () => {
    await runner?.stop();
    await server?.close();
    removeDir(dataDir);
  });

  it("covers at least eight rejected files and the accepted layouts", () => {
    expect(subset.filter((c) => c.outcome === "rejected").length).toBeGreaterThanOrEqual(8);
    expect(subset.filter((c) => c.outcome === "accepted").length).toBeGreaterThanOrEqual(2);
  });

  it.each(subset.filter((c) => c.outcome === "rejected").map((c) => [c.file, c] as const))(
    "%s ends rejected with the file, line and reason; the upload is kept unchanged",
    async (file, c) => {
      if (c.outcome !== "rejected") return;
      const s = sent.get(file);
      if (!s) throw new Error(`${file} was not sent`);
      const detail = await finished(s.graphId);
      expect(detail.status).toBe("rejected");
      const rejection = detail.rejection;
      expect(rejection).toMatchObject({ code: c.code, file, line: c.line });
      expect(rejection?.message).toContain(file);
      expect(rejection?.message).toContain(c.text);
      expect(rejection?.message).not.toContain(dataDir);
      if (c.reason) {
        expect(rejection?.reason).toContain(BAD_LINE_REASONS[c.reason as BadLineReason]);
        expect(detail.problems[0]).toMatchObject({ line: c.line, reason: c.reason });
      } else {
        expect(detail.problems).toEqual([]);
      }
      expect(detail.statistics).toBeNull();
      await expectUploadIntact(s);
      await expectHealthy();
    },
  );

  it.each(subset.filter((c) => c.outcome === "accepted").map((c) => [c.file, c] as const))("%s is accepted", async (file, c) => {
    if (c.outcome !== "accepted") return;
    const s = sent.get(file);
    if (!s) throw new Error(`${file} was not sent`);
    const detail = await finished(s.graphId);
    expect(detail.rejection).toBeNull();
    expect(detail.status).toBe("ready");
    expectStats(detail, c.expect);
    expect(detail.fingerprint).toBe(`sha256:${s.sha256}`);
    await expectUploadIntact(s);
  });

  it.each(subset.flatMap((c) => (c.outcome === "rejected" && c.retry ? [[c.file, c] as const] : [])))(
    "%s is accepted when retried with options that allow its bad line",
    async (file, c) => {
      if (c.outcome !== "rejected" || !c.retry) return;
      const s = sent.get(file);
      if (!s) throw new Error(`${file} was not sent`);
      expect((await finished(s.graphId)).status).toBe("rejected");
      const retried = await api.post<{ id: number }>(`/api/graphs/${s.graphId}/retry`, { options: c.retry.options });
      expect(retried.status).toBe(202);
      expect(retried.body.id).toBe(s.graphId);
      const detail = await finished(s.graphId);
      expect(detail.rejection).toBeNull();
      expect(detail.status).toBe("ready");
      expect(detail.options.maxBadLines).toBe(c.retry.options.maxBadLines);
      expectStats(detail, c.retry.expect);
      expect(detail.problems[0]).toMatchObject({ line: c.line, reason: c.reason });
      await expectUploadIntact(s);
    },
  );

  it("stays healthy after the whole batch", async () => {
    await expectHealthy();
    const page = UploadPageSchema.parse((await api.get("/api/uploads?limit=200")).body);
    expect(page.items.filter((u) => u.state === "complete").length).toBe(subset.length);
  });
});
