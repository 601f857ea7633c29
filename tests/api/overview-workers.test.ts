// A runner's busy thread count never exceeds its threads: not in the heartbeat a runner writes while it hands a pool
// more shard tasks than it has threads, and not on the overview, whatever a heartbeat row says.
import { randomBytes } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { OverviewSchema } from "../../api/contracts/overview";
import { runnerHeartbeats } from "../../api/src/db/schema";
import type { RunningServer } from "../../api/src/server";
import { BLOCK_NODES } from "../../workers/src/core/graph";
import { startRunner } from "../../workers/src/runner/main";
import {
  createTeam,
  createUpload,
  openDb,
  queueGraph,
  queueRun,
  removeDir,
  ringEdgeList,
  runnerConfig,
  tempDataDir,
  waitForGraph,
  waitForStatus,
} from "./runner-support";
import { createTestTeam, signedIn, startTestServer } from "./support";

describe("busy threads", () => {
  let server: RunningServer;

  beforeAll(async () => {
    server = await startTestServer();
  });
  afterAll(() => server.close());

  it("the overview shows a heartbeat claiming more busy threads than it has as all threads busy", async () => {
    const team = await createTestTeam(server, "overview-busy");
    const runnerId = `kestrel-overbooked-${randomBytes(4).toString("hex")}`;
    const now = new Date();
    await server.deps.db.insert(runnerHeartbeats).values({ runnerId, host: "harbour-01", pid: 4242, threads: 2, busy: 3, startedAt: now, beatAt: now });
    const viewer = await signedIn(server, team.email.viewer);
    const res = await viewer.get("/api/overview");
    expect(res.status).toBe(200);
    const worker = OverviewSchema.parse(res.body).workers.find((w) => w.runnerId === runnerId);
    expect(worker).toMatchObject({ threads: 2, busy: 2 });
    await server.deps.db.delete(runnerHeartbeats).where(eq(runnerHeartbeats.runnerId, runnerId));
  });

  it("a one-thread runner working on four shards at once reports at most one busy thread", async () => {
    const { db, pool } = openDb();
    const dataDir = tempDataDir();
    const team = await createTeam(db, "busy-beat");
    const config = runnerConfig(dataDir, team.teamId, { threads: 1, heartbeatMs: 50 });
    const runner = await startRunner(config);
    try {
      // Shards are whole blocks of nodes: this ring is long enough for four.
      const upload = await createUpload(db, dataDir, team, "ferry-loop.txt", ringEdgeList(5 * BLOCK_NODES));
      const graphId = await queueGraph(db, team, upload.id, {}, "Ferry loop");
      expect((await waitForGraph(db, graphId)).status).toBe("ready");
      const runId = await queueRun(db, team, graphId, { damping: 0.9, tolerance: 1e-9, maxIterations: 1_000, shards: 4 });

      const seen: Array<{ threads: number; busy: number }> = [];
      let finished = false;
      const sampling = (async () => {
        while (!finished) {
          const [beat] = await db.select().from(runnerHeartbeats).where(eq(runnerHeartbeats.runnerId, config.runnerId));
          if (beat?.currentRunId === runId) seen.push({ threads: beat.threads, busy: beat.busy });
          await new Promise((resolve) => setTimeout(resolve, 20));
        }
      })();
      const run = await waitForStatus(db, runId, ["converged", "not-converged", "failed", "needs-attention"]);
      finished = true;
      await sampling;

      expect(run.status).toBe("converged");
      // The run lasted long enough for beats while its shards were at work.
      expect(seen.filter((b) => b.busy > 0).length).toBeGreaterThan(0);
      for (const beat of seen) expect(beat.busy).toBeLessThanOrEqual(beat.threads);
    } finally {
      await runner.stop();
      await pool.end();
      removeDir(dataDir);
    }
  });
});
