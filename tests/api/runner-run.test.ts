import { existsSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { asc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { emails, runs, runShards, runTop, users } from "../../api/src/db/schema";
import type { Db, DbPool } from "../../api/src/lib/db";
import { rank } from "../../workers/src/engine/rank";
import { loadGraphStore } from "../../workers/src/graph-store/load";
import { startRunner, type Runner } from "../../workers/src/runner/main";
import {
  createTeam,
  createUpload,
  eventRows,
  graphRow,
  iterationRows,
  openDb,
  queueGraph,
  queueRun,
  randomEdgeList,
  removeDir,
  ringEdgeList,
  runnerConfig,
  runRow,
  SLOW_RUN,
  tempDataDir,
  waitFor,
  waitForGraph,
  waitForStatus,
  type TestTeam,
} from "./runner-support";

function readCsv(file: string): Array<{ id: string; score: number; rank: number }> {
  const [header, ...lines] = readFileSync(file, "utf8").trimEnd().split("\n");
  expect(header).toBe("node_id,score,rank");
  return lines.map((line) => {
    const [id, score, r] = line.split(",");
    return { id, score: Number(score), rank: Number(r) };
  });
}

describe("runner runs", () => {
  let db: Db;
  let pool: DbPool;
  let dataDir: string;
  let team: TestTeam;
  let runner: Runner;
  let graphId: number;
  let ringId: number;
  const N = 10_000;
  const edges = randomEdgeList(N, 11);

  beforeAll(async () => {
    ({ db, pool } = openDb());
    dataDir = tempDataDir();
    team = await createTeam(db, "runs");
    runner = await startRunner(runnerConfig(dataDir, team.teamId));
    const upload = await createUpload(db, dataDir, team, "kestrel-crawl.txt", edges);
    graphId = await queueGraph(db, team, upload.id, {}, "Kestrel crawl sample");
    const ring = await createUpload(db, dataDir, team, "ferry-loop.txt", ringEdgeList(4_000));
    ringId = await queueGraph(db, team, ring.id, {}, "Ferry loop");
    expect((await waitForGraph(db, graphId)).status).toBe("ready");
    expect((await waitForGraph(db, ringId)).status).toBe("ready");
  });

  afterAll(async () => {
    await runner?.stop();
    await pool?.end();
    removeDir(dataDir);
  });

  it("converges and records iterations 1..k, shard states, score files, top-k and an e-mail", async () => {
    const runId = await queueRun(db, team, graphId, { tolerance: 1e-10, shards: 3, topK: 25 }, true);
    const run = await waitForStatus(db, runId, ["converged", "not-converged", "failed", "needs-attention"]);
    const graph = await graphRow(db, graphId);

    expect(run.status).toBe("converged");
    expect(run.stopReason).toBe("converged");
    expect(run.claimedBy).toBeNull();
    expect(run.finalResidual).toBeLessThan(1e-10);
    expect(run.errorBound).toBeCloseTo((0.85 / 0.15) * (run.finalResidual ?? 0), 20);
    expect(run.inputFingerprint).toBe(graph.fingerprint);
    expect(run.softwareVersion).toBe("0.0.0-test");
    expect(run.timings).toMatchObject({ iterateMs: expect.any(Number), totalMs: expect.any(Number), writeMs: expect.any(Number) });

    const rows = await iterationRows(db, runId);
    expect(rows.map((r) => r.k)).toEqual(Array.from({ length: run.iterations }, (_, i) => i + 1));
    expect(rows.at(-1)?.residual).toBe(run.finalResidual);
    expect(rows.slice(0, -1).every((r) => r.residual >= 1e-10)).toBe(true);
    expect(rows.every((r) => r.danglingMass !== null && r.danglingMass > 0)).toBe(true);

    const shards = await db.select().from(runShards).where(eq(runShards.runId, runId)).orderBy(asc(runShards.shard));
    expect(shards.map((s) => s.shard)).toEqual([0, 1, 2]);
    expect(shards.every((s) => s.state === "done" && s.attempts === 1 && s.worker !== null)).toBe(true);
    expect(shards[0].vertexStart).toBe(0);
    expect(shards[1].vertexStart).toBe(shards[0].vertexEnd);
    expect(shards[2].vertexEnd).toBe((graph.statistics as { nodes: number }).nodes);
    expect(shards.reduce((s, x) => s + x.edgeCount, 0)).toBe((graph.statistics as { edges: number }).edges);

    const files = (run.outputs as { files: Array<{ format: string; path: string; bytes: number }> }).files;
    expect(files.map((f) => f.format)).toEqual(["csv", "arrow", "parquet"]);
    for (const f of files) expect(statSync(path.join(dataDir, f.path)).size).toBe(f.bytes);
    const csv = readCsv(path.join(dataDir, files[0].path));
    const n = (graph.statistics as { nodes: number }).nodes;
    expect(csv).toHaveLength(n);
    expect(csv.map((r) => r.rank)).toEqual(Array.from({ length: n }, (_, i) => i + 1));
    expect(Math.abs(csv.reduce((s, r) => s + r.score, 0) - 1)).toBeLessThan(1e-9);

    // The runner's scores are exactly the engine's on the stored graph (merged duplicates count at their
    // multiplicity, stored as repeated sources).
    const { graph: stored } = await loadGraphStore(path.join(dataDir, graph.storagePath ?? ""));
    const direct = await rank(
      stored,
      { damping: 0.85, tolerance: 1e-10, maxIterations: 200, dangling: "teleport", teleport: { kind: "uniform" }, weighted: stored.weights !== null || stored.mergedEdges !== undefined, threads: 1 },
    );
    expect(direct.iterations).toBe(run.iterations);
    const byId = new Map(csv.map((r) => [r.id, r.score]));
    const ids = stored.ids.kind === "integer" ? stored.ids.ids : null;
    const differing = Array.from({ length: stored.n }, (_, v) => v).filter((v) => byId.get(String(ids?.[v])) !== direct.scores[v]);
    expect(differing).toEqual([]);

    const top = await db.select().from(runTop).where(eq(runTop.runId, runId)).orderBy(asc(runTop.rank));
    expect(top.map((t) => [t.rank, t.nodeId, t.score])).toEqual(csv.slice(0, 25).map((r) => [r.rank, r.id, r.score]));

    const mail = await waitFor("the run e-mail", async () => (await db.select().from(emails).where(eq(emails.toAddress, team.email)))[0]);
    expect(mail.subject).toContain(`run ${runId}`);
    expect(mail.subject).toContain("converged");
    expect(mail.textBody).toContain(`/runs/${runId}`);
    expect(mail.teamId).toBe(team.teamId);
    expect(existsSync(path.join(dataDir, "runs", String(runId), "checkpoint.f64"))).toBe(false);

    const kinds = (await eventRows(db, runId)).map((e) => e.kind);
    expect(kinds[0]).toBe("started");
    expect(kinds.at(-1)).toBe("converged");
  });

  it("puts all teleport mass on the seeds: nodes no one links to and no seed score exactly 0", async () => {
    const seeds = [{ node: "1", weight: 3 }, { node: "2", weight: 1 }];
    const runId = await queueRun(db, team, graphId, { teleport: { kind: "seeds", seeds }, dangling: "teleport" });
    const run = await waitForStatus(db, runId, ["converged", "failed"]);
    expect(run.status).toBe("converged");
    const csv = readCsv(path.join(dataDir, "runs", String(runId), "scores.csv"));
    const score = new Map(csv.map((r) => [r.id, r.score]));
    const linked = new Set(edges.trimEnd().split("\n").map((line) => line.split(" ")[1]));
    const lonely = csv.filter((r) => !linked.has(r.id) && r.id !== "1" && r.id !== "2");
    expect(lonely.length).toBeGreaterThan(100);
    expect(lonely.every((r) => r.score === 0)).toBe(true);
    expect(score.get("1")).toBeGreaterThan(0.05);
  });

  it("fails a run whose seeds are not in the graph, naming them", async () => {
    const runId = await queueRun(db, team, graphId, { teleport: { kind: "seeds", seeds: [{ node: "999999", weight: 1 }] } });
    const run = await waitForStatus(db, runId, ["failed", "converged"]);
    expect(run.status).toBe("failed");
    expect(run.statusReason).toContain('"999999"');
  });

  it("ends at the iteration cap as not converged, with scores, and respects the user's e-mail opt-out", async () => {
    await db.update(users).set({ notify: false }).where(eq(users.id, team.userId));
    const before = (await db.select().from(emails).where(eq(emails.toAddress, team.email))).length;
    const runId = await queueRun(db, team, graphId, { maxIterations: 5 }, true);
    const run = await waitForStatus(db, runId, ["not-converged", "converged", "failed"]);
    expect(run.status).toBe("not-converged");
    expect(run.stopReason).toBe("iteration-cap");
    expect(run.iterations).toBe(5);
    expect((await iterationRows(db, runId)).map((r) => r.k)).toEqual([1, 2, 3, 4, 5]);
    expect(existsSync(path.join(dataDir, "runs", String(runId), "scores.parquet"))).toBe(true);
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect((await db.select().from(emails).where(eq(emails.toAddress, team.email))).length).toBe(before);
    await db.update(users).set({ notify: true }).where(eq(users.id, team.userId));
  });

  it("honours a cancel request while iterating", async () => {
    const runId = await queueRun(db, team, ringId, SLOW_RUN);
    await waitFor("some iterations", async () => (await runRow(db, runId)).iterations >= 20);
    await db.update(runs).set({ cancelRequestedAt: new Date() }).where(eq(runs.id, runId));
    const run = await waitForStatus(db, runId, ["canceled", "converged"]);
    expect(run.status).toBe("canceled");
    expect(run.stopReason).toBe("canceled");
    expect(run.iterations).toBeLessThan(900);
    expect(run.outputs).toBeNull();
    expect((await iterationRows(db, runId)).map((r) => r.k)).toEqual(Array.from({ length: run.iterations }, (_, i) => i + 1));
  });
});
