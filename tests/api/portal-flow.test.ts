import { execFile } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { tableFromIPC } from "apache-arrow";
import { readParquet } from "parquet-wasm/node";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ComparisonSchema } from "../../api/contracts/compare";
import { GraphDetailSchema, GraphPageSchema } from "../../api/contracts/graphs";
import { IterationListSchema, NodeLookupSchema, RunDetailSchema, ShardListSchema, TopPageSchema, type RunDetail } from "../../api/contracts/runs";
import type { RunningServer } from "../../api/src/server";
import { startRunner, type Runner } from "../../workers/src/runner/main";
import { tokenClient, tusUpload, waitFor } from "./portal-support";
import { removeDir, ROOT, runnerConfig, tempDataDir } from "./runner-support";
import { createTestTeam, startTestServer, type ApiClient, type TestTeam } from "./support";

const run = promisify(execFile);

/** A crawl-shaped edge list with string ids (URLs, one with a comma), five self-loops and repeated lines. */
function crawl(n: number): { text: string; nodes: number; edges: number; selfLoops: number; duplicates: number } {
  const id = (v: number) => (v === 7 ? `"https://museum.kestrel.example/tides,1890"` : `https://${["council", "harbour", "ferry"][v % 3]}.kestrel.example/p/${v}`);
  let state = 12345;
  const next = () => (state = (Math.imul(state, 1103515245) + 12345) >>> 0);
  const lines = ["source,target"];
  const seen = new Set<string>();
  let duplicates = 0;
  let selfLoops = 0;
  const add = (u: number, v: number) => {
    if (u === v) selfLoops++;
    const key = `${u}>${v}`;
    if (u !== v && seen.has(key)) duplicates++;
    if (u !== v) seen.add(key);
    lines.push(`${id(u)},${id(v)}`);
  };
  for (let v = 0; v < n; v++) add(v, (v + 1) % n);
  for (let i = 0; i < 3 * n; i++) add(next() % n, next() % Math.ceil(n / 20));
  for (let i = 0; i < 5; i++) add(i * 11, i * 11);
  for (let i = 0; i < 10; i++) add(i, i + 1);
  return { text: `${lines.join("\n")}\n`, nodes: n, edges: seen.size, selfLoops, duplicates };
}

function csvRows(text: string): Array<[string, number, number]> {
  const [header, ...lines] = text.trimEnd().split("\n");
  expect(header).toBe("node_id,score,rank");
  return lines.map((line) => {
    const rankAt = line.lastIndexOf(",");
    const scoreAt = line.lastIndexOf(",", rankAt - 1);
    return [line.slice(0, scoreAt), Number(line.slice(scoreAt + 1, rankAt)), Number(line.slice(rankAt + 1))];
  });
}

describe("the whole flow with an API token only", () => {
  let server: RunningServer;
  let runner: Runner;
  let dataDir: string;
  let team: TestTeam;
  let api: ApiClient;
  const data = crawl(3000);
  let graphId = 0;
  let runId = 0;
  let seededRunId = 0;
  let finished: RunDetail;

  beforeAll(async () => {
    dataDir = tempDataDir();
    server = await startTestServer({ STILLPOINT_DATA_DIR: dataDir });
    team = await createTestTeam(server, "flow");
    api = await tokenClient(server, team.email.engineer);
    runner = await startRunner(runnerConfig(dataDir, team.teamId));
  });

  afterAll(async () => {
    await runner?.stop();
    await server?.close();
    removeDir(dataDir);
  });

  it("uploads with tus, creates a graph and reports its validation statistics", async () => {
    const upload = await tusUpload(server, { bearer: api.bearer }, Buffer.from(data.text), "kestrel-crawl.csv", { chunkSize: 32 * 1024 });
    const created = await api.post<{ id: number }>("/api/graphs", { uploadId: upload.uploadId, name: "Kestrel crawl sample" });
    expect(created.status).toBe(202);
    graphId = created.body.id;
    const graph = await waitFor("the graph to be ingested", async () => {
      const res = await api.get(`/api/graphs/${graphId}`);
      const detail = GraphDetailSchema.parse(res.body);
      return detail.status === "ready" || detail.status === "rejected" ? detail : null;
    });
    expect(graph.status).toBe("ready");
    expect(graph.statistics).toMatchObject({
      nodes: data.nodes,
      edges: data.edges,
      selfLoops: data.selfLoops,
      selfLoopsDropped: data.selfLoops,
      duplicates: data.duplicates,
      idKind: "string",
      badLines: 0,
      headerLines: 1,
    });
    expect(graph.statistics?.inDegree.reduce((n, bin) => n + bin.count, 0)).toBe(data.nodes);
    expect(graph.upload?.checksum).toMatch(/^sha256:[0-9a-f]{64}$/);
    expect(graph.fingerprint).toBe(graph.upload?.checksum);
    expect(graph.problems).toEqual([]);

    const list = GraphPageSchema.parse((await api.get("/api/graphs?sort=nodes&order=desc&q=crawl")).body);
    expect(list.items.map((g) => g.id)).toContain(graphId);
  });

  it("runs to convergence and records every iteration and shard", async () => {
    const submitted = await api.post<{ id: number }>("/api/runs", { graphId, tolerance: 1e-10, topK: 40, shards: 3 });
    expect(submitted.status).toBe(202);
    runId = submitted.body.id;
    finished = await waitFor("the run to finish", async () => {
      const detail = RunDetailSchema.parse((await api.get(`/api/runs/${runId}`)).body);
      return ["queued", "running"].includes(detail.status) ? null : detail;
    });
    expect(finished.status).toBe("converged");
    expect(finished.residual).toBeLessThan(1e-10);
    expect(finished.errorBound).toBeCloseTo((0.85 / 0.15) * (finished.residual ?? 0), 20);
    expect(finished.softwareVersion).toBeTruthy();
    expect(finished.inputFingerprint).toMatch(/^sha256:/);
    expect(finished.files.map((f) => f.format).sort()).toEqual(["arrow", "csv", "parquet"]);

    const iterations = IterationListSchema.parse((await api.get(`/api/runs/${runId}/iterations`)).body);
    expect(iterations.items.map((i) => i.k)).toEqual(Array.from({ length: finished.iterations }, (_, i) => i + 1));
    expect(iterations.items.at(-1)?.residual).toBe(finished.residual);
    const later = IterationListSchema.parse((await api.get(`/api/runs/${runId}/iterations?after=${finished.iterations - 2}`)).body);
    expect(later.items.map((i) => i.k)).toEqual([finished.iterations - 1, finished.iterations]);

    const shards = ShardListSchema.parse((await api.get(`/api/runs/${runId}/shards`)).body);
    expect(shards.items.length).toBeGreaterThan(0);
    expect(shards.items.every((s) => s.state === "done")).toBe(true);
    expect(shards.items.reduce((n, s) => n + s.edgeCount, 0)).toBe(data.edges);
  });

  it("serves the top-k page by page and finds any node's rank", async () => {
    const first = TopPageSchema.parse((await api.get(`/api/runs/${runId}/top?limit=25`)).body);
    expect(first.total).toBe(40);
    expect(first.items.map((r) => r.rank)).toEqual(Array.from({ length: 25 }, (_, i) => i + 1));
    expect(first.nextCursor).not.toBeNull();
    const second = TopPageSchema.parse((await api.get(`/api/runs/${runId}/top?limit=25&cursor=${first.nextCursor}`)).body);
    expect(second.items.map((r) => r.rank)).toEqual(Array.from({ length: 15 }, (_, i) => i + 26));
    expect(second.nextCursor).toBeNull();
    const scores = [...first.items, ...second.items].map((r) => r.score);
    expect(scores).toEqual([...scores].sort((a, b) => b - a));
    expect(first.certainPrefix).toBeGreaterThan(0);

    const csv = csvRows((await api.get<string>(`/api/runs/${runId}/scores.csv`)).body);
    for (const row of [csv[0], csv[1234], csv[csv.length - 1], csv.find((r) => r[0].includes("tides"))]) {
      if (!row) throw new Error("row missing");
      const nodeId = row[0].startsWith('"') ? row[0].slice(1, -1) : row[0];
      const res = await api.get(`/api/runs/${runId}/nodes/${encodeURIComponent(nodeId)}`);
      expect(res.status).toBe(200);
      expect(NodeLookupSchema.parse(res.body)).toMatchObject({ nodeId, score: row[1], rank: row[2], of: data.nodes });
    }
    const missing = await api.get(`/api/runs/${runId}/nodes/${encodeURIComponent("https://nowhere.kestrel.example/")}`);
    expect(missing.status).toBe(404);
  });

  it("downloads the CSV with the CLI's exact rows, and Arrow and Parquet that parse back", async () => {
    const work = mkdtempSync(path.join(tmpdir(), "stillpoint-cli-"));
    try {
      const input = path.join(work, "kestrel-crawl.csv");
      writeFileSync(input, data.text);
      const out = path.join(work, "cli.csv");
      await run(process.execPath, [path.join(ROOT, "bin/stillpoint.mjs"), "rank", input, "--out", out, "--tolerance", "1e-10", "--json"], { cwd: ROOT });
      const res = await api.request<string>("GET", `/api/runs/${runId}/scores.csv`);
      expect(res.status).toBe(200);
      expect(res.headers.get("content-disposition")).toContain(`filename="Kestrel-crawl-sample-run${runId}-scores.csv"`);
      expect(res.body).toBe(readFileSync(out, "utf8"));
    } finally {
      removeDir(work);
    }
    const csv = csvRows((await api.get<string>(`/api/runs/${runId}/scores.csv`)).body);
    const auth = { authorization: `Bearer ${api.bearer}` };
    const arrow = tableFromIPC(new Uint8Array(await (await fetch(`${server.url}/api/runs/${runId}/scores.arrow`, { headers: auth })).arrayBuffer()));
    const parquetBytes = new Uint8Array(await (await fetch(`${server.url}/api/runs/${runId}/scores.parquet`, { headers: auth })).arrayBuffer());
    const parquet = tableFromIPC(readParquet(parquetBytes).intoIPCStream());
    for (const table of [arrow, parquet]) {
      expect(table.numRows).toBe(csv.length);
      const ids = table.getChild("node_id")?.toArray() as string[];
      const scores = table.getChild("score")?.toArray() as Float64Array;
      const ranks = table.getChild("rank")?.toArray() as Uint32Array;
      for (const i of [0, 1, 500, csv.length - 1]) {
        const csvId = csv[i][0].startsWith('"') ? csv[i][0].slice(1, -1) : csv[i][0];
        expect([ids[i], scores[i], ranks[i]]).toEqual([csvId, csv[i][1], csv[i][2]]);
      }
    }
  });

  it("answers Range requests with the right bytes, and 416 outside the file", async () => {
    const url = `${server.url}/api/runs/${runId}/scores.csv`;
    const auth = { authorization: `Bearer ${api.bearer}` };
    const whole = Buffer.from(await (await fetch(url, { headers: auth })).arrayBuffer());
    const part = await fetch(url, { headers: { ...auth, range: "bytes=100-1099" } });
    expect(part.status).toBe(206);
    expect(part.headers.get("content-range")).toBe(`bytes 100-1099/${whole.length}`);
    expect(Buffer.from(await part.arrayBuffer()).equals(whole.subarray(100, 1100))).toBe(true);
    const tail = await fetch(url, { headers: { ...auth, range: "bytes=-64" } });
    expect(tail.status).toBe(206);
    expect(Buffer.from(await tail.arrayBuffer()).equals(whole.subarray(whole.length - 64))).toBe(true);
    const open = await fetch(url, { headers: { ...auth, range: `bytes=${whole.length - 10}-` } });
    expect(Buffer.from(await open.arrayBuffer()).equals(whole.subarray(whole.length - 10))).toBe(true);
    const beyond = await fetch(url, { headers: { ...auth, range: `bytes=${whole.length}-` } });
    expect(beyond.status).toBe(416);
    expect(beyond.headers.get("content-range")).toBe(`bytes */${whole.length}`);
    const stale = await fetch(url, { headers: { ...auth, range: "bytes=0-9", "if-range": '"not-the-etag"' } });
    expect(stale.status).toBe(200);
  });

  it("compares a seeded run with the uniform one", async () => {
    const seeds = [{ node: "https://council.kestrel.example/p/3" }, { node: "https://harbour.kestrel.example/p/1", weight: 2 }];
    const unknown = await api.post<{ error: { code: string; details: { unknown: string[] } } }>("/api/runs", {
      graphId,
      teleport: { kind: "seeds", seeds: [...seeds, { node: "https://ferry.kestrel.example/missing" }] },
    });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error).toMatchObject({ code: "unknown_seeds", details: { unknown: ["https://ferry.kestrel.example/missing"] } });

    const submitted = await api.post<{ id: number }>("/api/runs", { graphId, tolerance: 1e-10, topK: 40, teleport: { kind: "seeds", seeds } });
    expect(submitted.status).toBe(202);
    seededRunId = submitted.body.id;
    await waitFor("the seeded run", async () => {
      const detail = RunDetailSchema.parse((await api.get(`/api/runs/${seededRunId}`)).body);
      return detail.status === "converged" ? detail : null;
    });
    const same = ComparisonSchema.parse((await api.get(`/api/compare?a=${runId}&b=${runId}`)).body);
    expect(same).toMatchObject({ matchedNodes: data.nodes, kendallTau: 1, spearmanRho: 1, onlyInACount: 0, topK: { k: 40, overlap: 40 } });
    expect(same.rbo.value).toBeCloseTo(1, 12);
    const res = await api.get(`/api/compare?a=${runId}&b=${seededRunId}&limit=5`);
    expect(res.status).toBe(200);
    const diff = ComparisonSchema.parse(res.body);
    expect(diff.matchedNodes).toBe(data.nodes);
    expect(diff.kendallTau).not.toBeNull();
    expect(diff.kendallTau ?? 1).toBeLessThan(1);
    expect(diff.rbo.value).toBeLessThan(1);
    expect(diff.moversUp.length).toBeGreaterThan(0);
    expect(diff.moversUp.length).toBeLessThanOrEqual(5);
  });
});
