import { and, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { graphs, runs } from "../../api/src/db/schema";
import type { Db, DbPool } from "../../api/src/lib/db";
import { startRunner } from "../../workers/src/runner/main";
import { claimRun, renewRunLease } from "../../workers/src/runner/queue-repo";
import {
  createTeam,
  createUpload,
  eventRows,
  openDb,
  queueGraph,
  queueRun,
  randomEdgeList,
  removeDir,
  runnerConfig,
  runRow,
  tempDataDir,
  unique,
  waitForGraph,
  waitForStatus,
  type TestTeam,
} from "./runner-support";

async function readyGraphRow(db: Db, team: TestTeam): Promise<number> {
  const [row] = await db
    .insert(graphs)
    .values({ teamId: team.teamId, name: unique("claim-graph"), options: {}, status: "ready" })
    .$returningId();
  return row.id;
}

describe("runner claims", () => {
  let a: { db: Db; pool: DbPool };
  let b: { db: Db; pool: DbPool };

  beforeAll(() => {
    a = openDb();
    b = openDb();
  });

  afterAll(async () => {
    await a?.pool.end();
    await b?.pool.end();
  });

  it("never gives one run to two runners, however many claim at once", async () => {
    const team = await createTeam(a.db, "claims");
    const graphId = await readyGraphRow(a.db, team);
    const ids = await Promise.all(Array.from({ length: 24 }, () => queueRun(a.db, team, graphId, {})));
    // Eight claimers on two connection pools, each its own runner (a runner claims one job at a time).
    const claimed = new Map<string, number[]>();
    const claimer = async (runner: string, db: Db) => {
      claimed.set(runner, []);
      for (;;) {
        const c = await claimRun(db, runner, 30_000, [team.teamId]);
        if (!c) {
          // Nothing free right now: rows others are claiming are skipped, so look again until the queue is empty.
          const left = await db.select({ id: runs.id }).from(runs).where(and(inArray(runs.id, ids), eq(runs.status, "queued")));
          if (left.length === 0) return;
          continue;
        }
        expect(c.kind).toBe("start");
        claimed.get(runner)?.push(c.run.id);
        // Done at once (the claim stays on the row), so the claimer is free for the next one, as a runner would be.
        await db.update(runs).set({ status: "converged" }).where(eq(runs.id, c.run.id));
      }
    };
    await Promise.all([0, 1, 2, 3].flatMap((i) => [claimer(`runner-A${i}`, a.db), claimer(`runner-B${i}`, b.db)]));

    const all = [...claimed.values()].flat().sort((x, y) => x - y);
    expect(all).toEqual([...ids].sort((x, y) => x - y));
    const rows = await a.db.select().from(runs).where(inArray(runs.id, ids));
    for (const row of rows) {
      expect(row.status).toBe("converged");
      expect(row.attempts).toBe(1);
      expect(claimed.get(row.claimedBy ?? "")).toContain(row.id);
    }
  });

  it("lets another runner take a run over only after its lease expired, and tells the old holder", async () => {
    const team = await createTeam(a.db, "lease");
    const graphId = await readyGraphRow(a.db, team);
    const runId = await queueRun(a.db, team, graphId, {});
    expect((await claimRun(a.db, "runner-A", 1_000, [team.teamId]))?.run.id).toBe(runId);
    expect(await claimRun(b.db, "runner-B", 1_000, [team.teamId])).toBeNull();

    await a.db.update(runs).set({ heartbeatAt: new Date(Date.now() - 5_000) }).where(eq(runs.id, runId));
    const taken = await claimRun(b.db, "runner-B", 1_000, [team.teamId]);
    expect(taken).toMatchObject({ kind: "reclaim", previousRunner: "runner-A" });
    expect(taken?.run.attempts).toBe(2);
    expect(await renewRunLease(a.db, runId, "runner-A")).toEqual({ held: false, cancelRequested: false });
    expect(await renewRunLease(b.db, runId, "runner-B")).toEqual({ held: true, cancelRequested: false });
  });

  it("two live runners share a queue: every run is done once, by one runner", async () => {
    const dataDir = tempDataDir();
    const team = await createTeam(a.db, "pair");
    const r1 = await startRunner(runnerConfig(dataDir, team.teamId, { threads: 1 }));
    const r2 = await startRunner(runnerConfig(dataDir, team.teamId, { threads: 1 }));
    try {
      const upload = await createUpload(a.db, dataDir, team, "harbour-links.txt", randomEdgeList(3_000, 5));
      const graphId = await queueGraph(a.db, team, upload.id);
      expect((await waitForGraph(a.db, graphId)).status).toBe("ready");
      const ids = await Promise.all(Array.from({ length: 6 }, (_, i) => queueRun(a.db, team, graphId, { damping: 0.5 + i * 0.05 })));
      const runners = new Set<string>();
      for (const id of ids) {
        const run = await waitForStatus(a.db, id, ["converged", "failed"]);
        expect(run.status).toBe("converged");
        expect(run.attempts).toBe(1);
        const started = (await eventRows(a.db, id)).filter((e) => e.kind === "started");
        expect(started).toHaveLength(1);
        runners.add(String((started[0].details as { runner: string }).runner));
        expect((await runRow(a.db, id)).claimedBy).toBeNull();
      }
      expect([...runners].every((r) => r === r1.id || r === r2.id)).toBe(true);
    } finally {
      await Promise.all([r1.stop(), r2.stop()]);
      removeDir(dataDir);
    }
  });
});
