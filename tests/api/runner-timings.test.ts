// A run's final "time per iteration" comes from its iterations' own recorded times: a run that needed attention and
// was retried after a pause counts the iterations of both attempts, and neither the pause nor checkpoint writes.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runs } from "../../api/src/db/schema";
import type { Db, DbPool } from "../../api/src/lib/db";
import { RankPool } from "../../workers/src/engine/rank-pool";
import { startRunner } from "../../workers/src/runner/main";
import {
  createTeam,
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

describe("run timings", () => {
  let db: Db;
  let pool: DbPool;
  let rankPool: RankPool;
  let dataDir: string;
  let team: TestTeam;
  let graphId: number;
  const params = { damping: 0.95, tolerance: 1e-10, maxIterations: 1_000, shards: 2 };

  beforeAll(async () => {
    ({ db, pool } = openDb());
    rankPool = new RankPool({ threads: 2 });
    dataDir = tempDataDir();
    team = await createTeam(db, "timings");
    graphId = await readyGraph(db, dataDir, team, rankPool, "ferry-loop.txt", ringEdgeList(9_000));
  });

  afterAll(async () => {
    await pool?.end();
    await rankPool?.close();
    removeDir(dataDir);
  });

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
    await db.update(runs).set({ retryRequestedAt: new Date() }).where(eq(runs.id, runId));
    const second = await startRunner(runnerConfig(dataDir, team.teamId), { pool: rankPool });
    let done;
    try {
      done = await waitFor("the retried run to end", async () => {
        const row = await runRow(db, runId);
        return row.attempts === 2 && ["converged", "needs-attention", "failed"].includes(row.status) ? row : null;
      }, 60_000);
    } finally {
      await second.stop();
    }
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
