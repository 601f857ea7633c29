// Node lookup, compare and the score histogram answer from the runs' score indexes exactly as the score files do,
// whether the runner wrote the index or the API has to build it from the Arrow file first.
import { existsSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import path from "node:path";
import { tableFromIPC } from "apache-arrow";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ComparisonSchema } from "../../api/contracts/compare";
import { HistogramSchema, NodeLookupSchema, RunDetailSchema } from "../../api/contracts/runs";
import { compareColumns, type ScoreColumns } from "../../api/src/features/compare/compare.service";
import type { RunningServer } from "../../api/src/server";
import { mulberry32 as prng } from "../../workers/src/core/prng";
import { SCORE_INDEX_FILE } from "../../workers/src/score-index/format";
import { logHistogram } from "../../workers/src/score-index/histogram";
import { startRunner, type Runner } from "../../workers/src/runner/main";
import { edgeList, tokenClient, waitFor } from "./portal-support";
import { createUpload, removeDir, runnerConfig, tempDataDir } from "./runner-support";
import { createTestTeam, startTestServer, type ApiClient, type TestTeam } from "./support";

const crawlId = (v: number) => `https://mairie-île.kestrel.example/quai/${v}`;
const BIG = 2n ** 60n;

describe("results from the score index", () => {
  let server: RunningServer;
  let runner: Runner;
  let dataDir: string;
  let team: TestTeam;
  let api: ApiClient;
  const run: Record<"uniform" | "seeded" | "intA" | "intB", number> = { uniform: 0, seeded: 0, intA: 0, intB: 0 };
  const savedIndex = new Map<number, Buffer>();

  const runDir = (id: number) => path.join(dataDir, "runs", String(id));
  const indexFile = (id: number) => path.join(runDir(id), SCORE_INDEX_FILE);

  /** The run's score file read the way the portal read it before there was an index. */
  function scoreColumns(id: number): ScoreColumns {
    const table = tableFromIPC(readFileSync(path.join(runDir(id), "scores.arrow")));
    const ids = Array.from(table.getChild("node_id")?.toArray() as ArrayLike<bigint | string>, String);
    return { ids, scores: Float64Array.from(table.getChild("score")?.toArray() as Float64Array) };
  }

  async function graph(name: string, text: string): Promise<number> {
    const upload = await createUpload(server.deps.db, dataDir, { teamId: team.teamId, userId: team.userId.engineer, email: team.email.engineer }, `${name}.csv`, text);
    const created = await api.post<{ id: number }>("/api/graphs", { uploadId: upload.id, name });
    expect(created.status).toBe(202);
    await waitFor(`graph ${name}`, async () => ((await api.get<{ status: string }>(`/api/graphs/${created.body.id}`)).body.status === "ready" ? true : null));
    return created.body.id;
  }

  async function ranked(body: Record<string, unknown>): Promise<number> {
    const submitted = await api.post<{ id: number }>("/api/runs", { tolerance: 1e-10, ...body });
    expect(submitted.status).toBe(202);
    const detail = await waitFor(`run ${submitted.body.id}`, async () => {
      const d = RunDetailSchema.parse((await api.get(`/api/runs/${submitted.body.id}`)).body);
      return ["queued", "running"].includes(d.status) ? null : d;
    });
    expect(detail.status).toBe("converged");
    return submitted.body.id;
  }

  beforeAll(async () => {
    dataDir = tempDataDir();
    server = await startTestServer({ STILLPOINT_DATA_DIR: dataDir });
    team = await createTestTeam(server, "score-index");
    api = await tokenClient(server, team.email.engineer);
    runner = await startRunner(runnerConfig(dataDir, team.teamId));
    const crawl = await graph("Île crawl", edgeList(4000, 9000, 3, crawlId));
    const intA = await graph("Tide gauges A", edgeList(3000, 7000, 5, (v) => String(BIG + BigInt(v * 977))));
    const intB = await graph("Tide gauges B", edgeList(3000, 7000, 6, (v) => String(BIG + BigInt((v + 1000) * 977))));
    run.uniform = await ranked({ graphId: crawl, topK: 30 });
    run.seeded = await ranked({ graphId: crawl, topK: 40, teleport: { kind: "seeds", seeds: [{ node: crawlId(17) }, { node: crawlId(2500), weight: 3 }] } });
    run.intA = await ranked({ graphId: intA, topK: 25 });
    run.intB = await ranked({ graphId: intB, topK: 25 });
  });

  afterAll(async () => {
    await runner?.stop();
    await server?.close();
    removeDir(dataDir);
  });

  async function expectAnswersAsFromScoreFiles(): Promise<void> {
    for (const id of Object.values(run)) {
      const columns = scoreColumns(id);
      const histogram = HistogramSchema.parse((await api.get(`/api/runs/${id}/histogram`)).body);
      expect(histogram).toEqual(logHistogram(columns.scores));

      const rnd = prng(id);
      const rows = [0, 1, columns.ids.length >> 1, columns.ids.length - 1];
      for (let i = 0; i < 15; i++) rows.push(Math.floor(rnd() * columns.ids.length));
      for (const row of rows) {
        const nodeId = columns.ids[row];
        const res = await api.get(`/api/runs/${id}/nodes/${encodeURIComponent(nodeId)}`);
        expect(res.status).toBe(200);
        expect(NodeLookupSchema.parse(res.body)).toEqual({ nodeId, score: columns.scores[row], rank: row + 1, of: columns.ids.length, percentile: row / columns.ids.length });
      }
      for (const missing of ["https://nowhere.kestrel.example/", String(BIG - 1n), "18446744073709551616"]) {
        expect((await api.get(`/api/runs/${id}/nodes/${encodeURIComponent(missing)}`)).status).toBe(404);
      }
    }
    const pairs: Array<[number, number, number | undefined]> = [
      [run.uniform, run.seeded, undefined],
      [run.seeded, run.uniform, 200],
      [run.uniform, run.uniform, undefined],
      [run.intA, run.intB, 100],
      [run.intB, run.uniform, undefined],
    ];
    for (const [a, b, k] of pairs) {
      const res = await api.get(`/api/compare?a=${a}&b=${b}&limit=10${k ? `&k=${k}` : ""}`);
      expect(res.status).toBe(200);
      const { a: refA, b: refB, ...core } = ComparisonSchema.parse(res.body);
      const ca = scoreColumns(a);
      const cb = scoreColumns(b);
      const topK = (id: number) => ({ [run.uniform]: 30, [run.seeded]: 40 })[id] ?? 25;
      expect(core).toEqual(compareColumns(ca, cb, k ?? Math.min(topK(a), topK(b)), 10));
      expect([refA.nodes, refB.nodes]).toEqual([ca.ids.length, cb.ids.length]);
    }
  }

  it("writes an index beside every run's score files", () => {
    for (const id of Object.values(run)) {
      expect(existsSync(indexFile(id))).toBe(true);
      savedIndex.set(id, readFileSync(indexFile(id)));
    }
  });

  it("answers lookups, comparisons and histograms as the score files do", async () => {
    await expectAnswersAsFromScoreFiles();
    const same = ComparisonSchema.parse((await api.get(`/api/compare?a=${run.intA}&b=${run.intB}`)).body);
    expect(same.matchedNodes).toBe(2000);
  });

  it("builds a missing index from the Arrow file, to the same bytes, and answers the same", async () => {
    for (const id of Object.values(run)) rmSync(indexFile(id));
    await expectAnswersAsFromScoreFiles();
    for (const id of Object.values(run)) expect(readFileSync(indexFile(id)).equals(savedIndex.get(id) ?? Buffer.alloc(0))).toBe(true);
  });

  it("replaces an unreadable index", async () => {
    writeFileSync(indexFile(run.seeded), "not an index");
    const columns = scoreColumns(run.seeded);
    const res = await api.get(`/api/runs/${run.seeded}/nodes/${encodeURIComponent(columns.ids[2000])}`);
    expect(NodeLookupSchema.parse(res.body)).toMatchObject({ rank: 2001, score: columns.scores[2000] });
    expect(readFileSync(indexFile(run.seeded)).equals(savedIndex.get(run.seeded) ?? Buffer.alloc(0))).toBe(true);
  });
});
