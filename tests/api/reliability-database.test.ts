import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { setTimeout as sleep } from "node:timers/promises";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb, createPool, migrateDatabase, type Db, type DbPool, type DbSettings } from "../../api/src/lib/db";
import { RankPool } from "../../workers/src/engine/rank-pool";
import { startRunner } from "../../workers/src/runner/main";
import { startMariadb, stopMariadb } from "../../scripts/db";
import {
  createTeam,
  createUpload,
  eventRows,
  iterationRows,
  queueGraph,
  queueRun,
  removeDir,
  ringEdgeList,
  runnerConfig,
  runRow,
  tempDataDir,
  waitFor,
  waitForGraph,
  waitForStatus,
  type TestTeam,
} from "./runner-support";

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      server.close(() => (address && typeof address === "object" ? resolve(address.port) : reject(new Error("no port"))));
    });
  });
}

// The database goes away in the middle of a run (its server is stopped and started again): the runner waits, reconnects
// and finishes, and the iteration history has every k exactly once. This file runs its own MariaDB so that restarting
// it cannot disturb the other test files.
describe("database restart during a run", () => {
  let dbDir: string;
  let port: number;
  let settings: DbSettings;
  let pool: DbPool;
  let db: Db;
  let rankPool: RankPool;
  let dataDir: string;
  let team: TestTeam;
  const DATABASE = "stillpoint_restart";

  const connect = () => {
    pool = createPool(settings, 4);
    db = createDb(pool);
  };

  beforeAll(async () => {
    // The test database setup's prefix and owner file: an abandoned instance is reaped by the next test run.
    dbDir = mkdtempSync(path.join(tmpdir(), "stillpoint-test-"));
    writeFileSync(path.join(dbDir, "owner.pid"), String(process.pid));
    port = await freePort();
    const instance = await startMariadb({ dataDir: dbDir, port, database: DATABASE, log: () => {} });
    settings = { host: instance.host, port, user: instance.user, password: instance.password, database: DATABASE };
    await migrateDatabase(settings);
    connect();
    rankPool = new RankPool({ threads: 2 });
    dataDir = tempDataDir();
    team = await createTeam(db, "db-restart");
  });

  afterAll(async () => {
    await pool?.end().catch(() => undefined);
    await rankPool?.close();
    await stopMariadb(dbDir).catch(() => false);
    rmSync(dbDir, { recursive: true, force: true });
    removeDir(dataDir);
  });

  it("reconnects with backoff and finishes without missing or duplicated iterations", async () => {
    const params = { damping: 0.995, tolerance: 1e-11, maxIterations: 10_000 };
    const runner = await startRunner(runnerConfig(dataDir, team.teamId, { db: settings }), { pool: rankPool });
    try {
      const upload = await createUpload(db, dataDir, team, "ferry-loop.txt", ringEdgeList(4_000));
      const graphId = await queueGraph(db, team, upload.id);
      expect((await waitForGraph(db, graphId)).status).toBe("ready");
      const reference = await queueRun(db, team, graphId, params);
      expect((await waitForStatus(db, reference, ["converged", "failed"])).status).toBe("converged");
      const refResiduals = (await iterationRows(db, reference)).map((r) => r.residual);
      const refScores = readFileSync(path.join(dataDir, "runs", String(reference), "scores.csv"), "utf8");
      const runId = await queueRun(db, team, graphId, params);
      const before = await waitFor("the run to be under way", async () => {
        const row = await runRow(db, runId);
        return row.iterations >= 30 ? row : null;
      });
      expect(before.status).toBe("running");
      await pool.end();
      expect(await stopMariadb(dbDir)).toBe(true);
      await sleep(1_500);
      await startMariadb({ dataDir: dbDir, port, database: DATABASE, log: () => {} });
      connect();

      const run = await waitForStatus(db, runId, ["converged", "not-converged", "failed", "needs-attention"], 90_000);
      expect(run.status).toBe("converged");
      expect(run.attempts).toBe(1);
      const rows = await iterationRows(db, runId);
      expect(rows.map((r) => r.k)).toEqual(Array.from({ length: run.iterations }, (_, i) => i + 1));
      expect(rows.map((r) => r.residual)).toEqual(refResiduals);
      expect(readFileSync(path.join(dataDir, "runs", String(runId), "scores.csv"), "utf8")).toBe(refScores);
      const reconnected = (await eventRows(db, runId)).filter((e) => e.kind === "database-reconnected");
      expect(reconnected.length).toBeGreaterThan(0);
    } finally {
      await runner.stop();
    }
  }, 120_000);
});
