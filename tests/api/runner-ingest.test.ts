import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { asc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { graphProblems } from "../../api/src/db/schema";
import type { Db, DbPool } from "../../api/src/lib/db";
import { loadGraphStore } from "../../workers/src/graph-store/load";
import { startRunner, type Runner } from "../../workers/src/runner/main";
import { createTeam, createUpload, openDb, queueGraph, removeDir, runnerConfig, tempDataDir, waitForGraph, type TestTeam } from "./runner-support";

describe("runner ingests", () => {
  let db: Db;
  let pool: DbPool;
  let dataDir: string;
  let team: TestTeam;
  let runner: Runner;

  beforeAll(async () => {
    ({ db, pool } = openDb());
    dataDir = tempDataDir();
    team = await createTeam(db, "ingest");
    runner = await startRunner(runnerConfig(dataDir, team.teamId));
  });

  afterAll(async () => {
    await runner?.stop();
    await pool?.end();
    removeDir(dataDir);
  });

  it("turns a small edge list into a ready graph with the right statistics and a prepared graph on disk", async () => {
    // 6 data lines: a duplicate (1→2 twice), a self-loop (3→3), node 4 only receives (dangling).
    const text = "# harbour ferry links\nsource,target\n1,2\n2,3\n1,2\n3,3\n3,1\n2,4\n";
    const upload = await createUpload(db, dataDir, team, "ferry-links.csv", text);
    const graphId = await queueGraph(db, team, upload.id);
    const graph = await waitForGraph(db, graphId);

    expect(graph.status).toBe("ready");
    expect(graph.rejection).toBeNull();
    expect(graph.progress).toBeNull();
    expect(graph.claimedBy).toBeNull();
    const stats = graph.statistics as Record<string, unknown>;
    expect(stats).toMatchObject({
      rows: 6,
      commentLines: 1,
      headerLines: 1,
      badLines: 0,
      nodes: 4,
      edges: 4,
      selfLoops: 1,
      selfLoopsDropped: 1,
      duplicates: 1,
      danglingNodes: 1,
      idKind: "integer",
    });
    const inDegree = stats.inDegree as Array<{ count: number }>;
    expect(inDegree.reduce((s, b) => s + b.count, 0)).toBe(4);
    expect(graph.fingerprint).toMatch(/^sha256:[0-9a-f]{64}$/);
    expect(graph.storagePath).toBe(path.join("graphs", String(graphId)));

    const { graph: stored, meta } = await loadGraphStore(path.join(dataDir, graph.storagePath ?? ""));
    expect(stored.n).toBe(4);
    // The duplicate stays a repeated source: five arcs in the in-lists, four edges.
    expect(stored.m).toBe(5);
    expect(stored.mergedEdges).toBe(4);
    expect(meta.mergedEdges).toBe(4);
    expect(meta.fingerprint).toBe(graph.fingerprint);
    expect(readFileSync(upload.file, "utf8")).toBe(text);
  });

  it("rejects a bad file with the file name, line and reason, keeps the upload and samples the bad line", async () => {
    const text = "1 2\n2 3\n3 4 5 6\n4 1\n";
    const upload = await createUpload(db, dataDir, team, "tidal-citations.txt", text);
    const graphId = await queueGraph(db, team, upload.id);
    const graph = await waitForGraph(db, graphId);

    expect(graph.status).toBe("rejected");
    expect(graph.rejection).toMatchObject({ code: "too-many-bad-lines", file: "tidal-citations.txt", line: 3 });
    expect(String((graph.rejection as Record<string, unknown>).reason)).toMatch(/columns/);
    expect(graph.rejectReason).toContain("tidal-citations.txt");
    expect(graph.rejectReason).not.toContain(dataDir);
    expect(graph.storagePath).toBeNull();
    expect(existsSync(upload.file)).toBe(true);
    expect(readFileSync(upload.file, "utf8")).toBe(text);

    const problems = await db.select().from(graphProblems).where(eq(graphProblems.graphId, graphId)).orderBy(asc(graphProblems.lineNumber));
    expect(problems.map((p) => [p.lineNumber, p.reason, p.line])).toEqual([[3, "wrong-column-count", "3 4 5 6"]]);
  });

  it("keeps skipped bad lines in the report when the options allow them", async () => {
    const text = "a,b\nb,c\nc\nc,a\n,d\n";
    const upload = await createUpload(db, dataDir, team, "council-links.csv", text);
    const graphId = await queueGraph(db, team, upload.id, { maxBadLines: 5 });
    const graph = await waitForGraph(db, graphId);

    expect(graph.status).toBe("ready");
    expect(graph.statistics).toMatchObject({ rows: 3, badLines: 2, nodes: 3, edges: 3, idKind: "string" });
    const problems = await db.select().from(graphProblems).where(eq(graphProblems.graphId, graphId)).orderBy(asc(graphProblems.lineNumber));
    expect(problems.map((p) => [p.lineNumber, p.line])).toEqual([
      [3, "c"],
      [5, ",d"],
    ]);
  });

  it("rejects a graph whose upload file is gone, saying so", async () => {
    const upload = await createUpload(db, dataDir, team, "museum-links.csv", "1,2\n");
    removeDir(upload.file);
    const graphId = await queueGraph(db, team, upload.id);
    const graph = await waitForGraph(db, graphId);
    expect(graph.status).toBe("rejected");
    expect(graph.rejection).toMatchObject({ code: "upload-missing", file: "museum-links.csv", line: null });
  });
});
