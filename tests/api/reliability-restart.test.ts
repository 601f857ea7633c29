import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db, DbPool } from "../../api/src/lib/db";
import { RankPool } from "../../workers/src/engine/rank-pool";
import { startRunner, type Runner } from "../../workers/src/runner/main";
import {
  createTeam,
  createUpload,
  eventRows,
  iterationRows,
  openDb,
  queueGraph,
  queueRun,
  removeDir,
  ringEdgeList,
  runnerConfig,
  runnerEnv,
  runRow,
  SLOW_RUN,
  spawnRunner,
  tempDataDir,
  waitFor,
  waitForGraph,
  waitForStatus,
  type TestTeam,
} from "./runner-support";

// A runner process stopped mid-run (SIGTERM) or killed (SIGKILL) must not cost the run anything: another runner
// resumes from the checkpoint and the result, score file and residual history are those of an uninterrupted run.
describe("runner restarts", () => {
  let db: Db;
  let pool: DbPool;
  let dataDir: string;
  let team: TestTeam;
  let graphId: number;
  let reference: { csv: string; residuals: number[] };
  // One warm pool for every in-process runner of this file: a new pool spends seconds starting its threads.
  let rankPool: RankPool;

  const scores = (runId: number) => readFileSync(path.join(dataDir, "runs", String(runId), "scores.csv"), "utf8");

  async function finishWith(runner: Runner, runId: number) {
    try {
      return await waitForStatus(db, runId, ["converged", "not-converged", "failed", "needs-attention"]);
    } finally {
      await runner.stop();
    }
  }

  async function expectSameAsReference(runId: number) {
    const run = await runRow(db, runId);
    expect(run.status).toBe("converged");
    const rows = await iterationRows(db, runId);
    expect(rows.map((r) => r.k)).toEqual(Array.from({ length: run.iterations }, (_, i) => i + 1));
    expect(rows.map((r) => r.residual)).toEqual(reference.residuals);
    expect(scores(runId)).toBe(reference.csv);
  }

  /** Starts a runner process on a new run and waits until it has written a checkpoint past iteration 20. */
  async function childMidRun() {
    const runId = await queueRun(db, team, graphId, SLOW_RUN);
    const child = spawnRunner(runnerEnv(dataDir, team.teamId));
    const early = await waitFor(
      "the child runner to pass a checkpoint",
      async () => {
        const run = await runRow(db, runId);
        if (run.status !== "running" && run.status !== "queued") throw new Error(`run ended early: ${run.status}\n${child.output()}`);
        return (run.lastCheckpointK ?? 0) >= 20 ? run : null;
      },
      60_000,
      20,
    );
    return { runId, child, claimedBy: early.claimedBy };
  }

  beforeAll(async () => {
    ({ db, pool } = openDb());
    dataDir = tempDataDir();
    team = await createTeam(db, "restarts");
    rankPool = new RankPool({ threads: 2 });
    const runner = await startRunner(runnerConfig(dataDir, team.teamId), { pool: rankPool });
    const upload = await createUpload(db, dataDir, team, "ferry-loop.txt", ringEdgeList(4_000));
    graphId = await queueGraph(db, team, upload.id);
    expect((await waitForGraph(db, graphId)).status).toBe("ready");
    const refId = await queueRun(db, team, graphId, SLOW_RUN);
    const ref = await finishWith(runner, refId);
    expect(ref.status).toBe("converged");
    expect(ref.iterations).toBeGreaterThan(200);
    reference = { csv: scores(refId), residuals: (await iterationRows(db, refId)).map((r) => r.residual) };
  });

  afterAll(async () => {
    await pool?.end();
    await rankPool?.close();
    removeDir(dataDir);
  });

  it("SIGTERM: the runner checkpoints, hands the run back and exits 0; the next runner finishes it bit for bit", async () => {
    const { runId, child } = await childMidRun();
    child.child.kill("SIGTERM");
    const exit = await child.exited;
    expect(exit, child.output()).toEqual({ code: 0, signal: null });

    const released = await runRow(db, runId);
    expect(released.status).toBe("queued");
    expect(released.claimedBy).toBeNull();
    expect(released.lastCheckpointK).toBeGreaterThanOrEqual(20);
    expect(released.lastCheckpointK).toBe(released.iterations);
    expect(existsSync(path.join(dataDir, "runs", String(runId), "checkpoint.f64"))).toBe(true);
    const releasedEvent = (await eventRows(db, runId)).find((e) => e.kind === "released");
    expect(releasedEvent?.details).toEqual({ k: released.lastCheckpointK });

    const next = await startRunner(runnerConfig(dataDir, team.teamId), { pool: rankPool });
    const done = await finishWith(next, runId);
    expect(done.attempts).toBe(2);
    const resumed = (await eventRows(db, runId)).find((e) => e.kind === "resumed");
    expect(resumed?.details).toEqual({ k: released.lastCheckpointK });
    await expectSameAsReference(runId);
  });

  it("SIGKILL: after the lease expires another runner reclaims the run and finishes it bit for bit", async () => {
    const { runId, child, claimedBy } = await childMidRun();
    child.child.kill("SIGKILL");
    expect((await child.exited).signal).toBe("SIGKILL");
    const orphan = await runRow(db, runId);
    expect(orphan.status).toBe("running");
    expect(orphan.claimedBy).toBe(claimedBy);

    const next = await startRunner(runnerConfig(dataDir, team.teamId), { pool: rankPool });
    const done = await finishWith(next, runId);
    expect(done.attempts).toBe(2);
    const events = await eventRows(db, runId);
    expect(events.find((e) => e.kind === "reclaimed")?.details).toMatchObject({ previous: claimedBy, runner: next.id });
    const resumedAt = (events.find((e) => e.kind === "resumed")?.details as { k: number }).k;
    expect(resumedAt).toBeGreaterThanOrEqual(orphan.lastCheckpointK ?? 0);
    await expectSameAsReference(runId);
  });
});
