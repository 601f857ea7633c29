import { readFileSync } from "node:fs";
import path from "node:path";
import { asc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { emails, runs, runShards } from "../../api/src/db/schema";
import type { Db, DbPool } from "../../api/src/lib/db";
import { RankPool } from "../../workers/src/engine/rank-pool";
import { startRunner } from "../../workers/src/runner/main";
import {
  createTeam,
  eventRows,
  iterationRows,
  openDb,
  queueRun,
  readyGraph,
  removeDir,
  ringEdgeList,
  runnerConfig,
  runRow,
  tempDataDir,
  waitFor,
  waitForStatus,
  type TestTeam,
} from "./runner-support";

// Shard failures: retried ones leave a trace and change nothing; one past the retry limit pauses the run as needs
// attention, and a retry resumes from the checkpoint with the history intact and the unfaulted result.
describe("shard faults", () => {
  let db: Db;
  let pool: DbPool;
  let rankPool: RankPool;
  let dataDir: string;
  let team: TestTeam;
  let graphId: number;
  const params = { damping: 0.95, tolerance: 1e-10, maxIterations: 1_000, shards: 2 };
  const scores = (runId: number) => readFileSync(path.join(dataDir, "runs", String(runId), "scores.csv"), "utf8");

  beforeAll(async () => {
    ({ db, pool } = openDb());
    rankPool = new RankPool({ threads: 2 });
    dataDir = tempDataDir();
    team = await createTeam(db, "faults");
    graphId = await readyGraph(db, dataDir, team, rankPool, "ferry-loop.txt", ringEdgeList(9_000));
  });

  afterAll(async () => {
    await pool?.end();
    await rankPool?.close();
    removeDir(dataDir);
  });

  /** What POST /api/runs/:id/retry writes, then a runner without faults until the run's second attempt ends. */
  async function retryAndWait(runId: number) {
    await db.update(runs).set({ retryRequestedAt: new Date() }).where(eq(runs.id, runId));
    const runner = await startRunner(runnerConfig(dataDir, team.teamId), { pool: rankPool });
    try {
      // The status stays needs-attention until a runner claims the retry request.
      return await waitFor("the retried run to end", async () => {
        const row = await runRow(db, runId);
        return row.attempts === 2 && ["converged", "needs-attention", "failed"].includes(row.status) ? row : null;
      }, 60_000);
    } finally {
      await runner.stop();
    }
  }

  it("a shard past its retry limit pauses the run as needs attention; retry resumes and matches an unfaulted run", async () => {
    const reference = await queueRun(db, team, graphId, params);
    const faulty = await queueRun(db, team, graphId, params, true);
    const faults = [
      { run: faulty, shard: 0, iteration: 5, attempt: 1, kind: "throw" as const },
      { run: faulty, shard: 1, iteration: 12, attempt: 1, kind: "exit-worker" as const },
      ...[1, 2, 3].map((attempt) => ({ run: faulty, shard: 1, iteration: 45, attempt, kind: "throw" as const })),
    ];
    const first = await startRunner(runnerConfig(dataDir, team.teamId, { faults }), { pool: rankPool });
    let paused;
    try {
      expect((await waitForStatus(db, reference, ["converged", "failed"])).status).toBe("converged");
      paused = await waitForStatus(db, faulty, ["needs-attention", "converged", "failed"]);
    } finally {
      await first.stop();
    }

    expect(paused.status).toBe("needs-attention");
    expect(paused.stopReason).toBe("shard-failed");
    expect(paused.iterations).toBe(44);
    expect(paused.lastCheckpointK).toBe(44);
    expect(paused.statusReason).toMatch(/^Shard 1 failed 3 times at iteration 45: injected fault: task threw/);
    expect(paused.claimedBy).toBeNull();
    const shards = await db.select().from(runShards).where(eq(runShards.runId, faulty)).orderBy(asc(runShards.shard));
    expect(shards[1]).toMatchObject({ state: "failed", attempts: 3, lastError: "injected fault: task threw" });
    const events = await eventRows(db, faulty);
    const retried = events.filter((e) => e.kind === "shard-retried").map((e) => e.details);
    expect(retried).toEqual([
      { shard: 0, iteration: 5, attempts: 2, lastError: "injected fault: task threw" },
      { shard: 1, iteration: 12, attempts: 2, lastError: expect.any(String) },
    ]);
    expect(events.at(-1)).toMatchObject({ level: "error", kind: "needs-attention", details: { shard: 1, attempts: 3, iteration: 45 } });
    const mail = await waitFor("the needs-attention e-mail", async () => (await db.select().from(emails).where(eq(emails.toAddress, team.email)))[0]);
    expect(mail.subject).toContain("needs attention");
    const before = (await iterationRows(db, faulty)).map((r) => [r.k, r.residual]);
    expect(before.map(([k]) => k)).toEqual(Array.from({ length: 44 }, (_, i) => i + 1));

    const done = await retryAndWait(faulty);
    expect(done.status).toBe("converged");
    expect(done.attempts).toBe(2);
    expect(done.retryRequestedAt).toBeNull();
    const after = await iterationRows(db, faulty);
    expect(after.map((r) => r.k)).toEqual(Array.from({ length: done.iterations }, (_, i) => i + 1));
    expect(after.slice(0, 44).map((r) => [r.k, r.residual])).toEqual(before);
    expect(after.map((r) => r.residual)).toEqual((await iterationRows(db, reference)).map((r) => r.residual));
    expect(done.iterations).toBe((await runRow(db, reference)).iterations);
    expect(scores(faulty)).toBe(scores(reference));
    const kinds = (await eventRows(db, faulty)).map((e) => e.kind);
    expect(kinds.slice(-3)).toEqual(["retry", "resumed", "converged"]);
    const shardsAfter = await db.select().from(runShards).where(eq(runShards.runId, faulty));
    expect(shardsAfter.every((s) => s.state === "done")).toBe(true);
  });

  // A run's final "time per iteration" comes from its iterations' own recorded times: over both attempts of a
  // retried run, without the pause before the retry or checkpoint writes.
  it("a retried run's time per iteration is the mean of its iterations' own times, over both attempts", async () => {
    const runId = await queueRun(db, team, graphId, params);
    const faults = [1, 2, 3].map((attempt) => ({ run: runId, shard: 1, iteration: 45, attempt, kind: "throw" as const }));
    const first = await startRunner(runnerConfig(dataDir, team.teamId, { faults }), { pool: rankPool });
    try {
      expect((await waitForStatus(db, runId, ["needs-attention", "converged", "failed"])).status).toBe("needs-attention");
    } finally {
      await first.stop();
    }
    // The run stands paused for a while before someone asks for the retry.
    await new Promise((resolve) => setTimeout(resolve, 1_500));
    const done = await retryAndWait(runId);
    expect(done.status).toBe("converged");

    const rows = await iterationRows(db, runId);
    expect(rows).toHaveLength(done.iterations);
    expect(done.iterations).toBeGreaterThan(44);
    const ownMs = rows.reduce((sum, r) => sum + r.elapsedMs, 0);
    const timings = done.timings as { iterateMs: number; perIterationMs: number };
    expect(timings.iterateMs).toBeCloseTo(ownMs, 6);
    expect(timings.perIterationMs).toBeCloseTo(ownMs / rows.length, 6);
    expect(timings.perIterationMs).toBeGreaterThan(0);
  });
});
