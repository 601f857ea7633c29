import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { graphs, runs, uploads } from "../../api/src/db/schema";
import type { Db, DbPool } from "../../api/src/lib/db";
import { FARM_TARGET, TRUSTED_SEEDS } from "../../scripts/demo-data";
import { DEMO_CITATIONS, DEMO_CRAWL, seedDemoGraphs } from "../../scripts/demo-seed";
import { createTeam, openDb, removeDir, tempDataDir, type TestTeam } from "./runner-support";

describe("demo graphs seed", () => {
  let db: Db;
  let pool: DbPool;
  let dataDir: string;
  let team: TestTeam;

  beforeAll(async () => {
    ({ db, pool } = openDb());
    dataDir = tempDataDir();
    team = await createTeam(db, "demo");
  });

  afterAll(async () => {
    await pool?.end();
    removeDir(dataDir);
  });

  it("writes the two uploads as finished uploads, queues their ingests and three runs, and does it only once", async () => {
    const lines: string[] = [];
    const ctx = { db, teamId: team.teamId, userId: team.userId, dataDir, log: (line: string) => lines.push(line) };
    await seedDemoGraphs(ctx);
    await seedDemoGraphs(ctx);

    const g = await db.select().from(graphs).where(eq(graphs.teamId, team.teamId));
    expect(g.map((x) => [x.name, x.status, x.isDemo])).toEqual([
      [DEMO_CRAWL, "queued", true],
      [DEMO_CITATIONS, "queued", true],
    ]);
    const u = await db.select().from(uploads).where(eq(uploads.teamId, team.teamId));
    expect(u).toHaveLength(2);
    for (const upload of u) {
      expect(upload).toMatchObject({ state: "complete", storagePath: `uploads/${upload.tusId}` });
      const bytes = readFileSync(path.join(dataDir, upload.storagePath ?? ""));
      expect(bytes.length).toBe(upload.size);
      expect(upload.checksum).toBe(`sha256:${createHash("sha256").update(bytes).digest("hex")}`);
    }
    const crawl = readFileSync(path.join(dataDir, u[0].storagePath ?? ""), "utf8");
    expect(crawl.startsWith("source,target\n")).toBe(true);
    let farmLinks = 0;
    for (let at = crawl.indexOf(`,${FARM_TARGET}\n`); at >= 0; at = crawl.indexOf(`,${FARM_TARGET}\n`, at + 1)) farmLinks++;
    expect(farmLinks).toBeGreaterThan(1_000);
    for (const seed of TRUSTED_SEEDS) expect(crawl).toContain(`\n${seed},`);

    const r = await db.select().from(runs).where(eq(runs.teamId, team.teamId));
    expect(r.map((x) => [x.graphId, (x.parameters as { teleport: { kind: string } }).teleport.kind, x.status])).toEqual([
      [g[0].id, "uniform", "queued"],
      [g[0].id, "seeds", "queued"],
      [g[1].id, "uniform", "queued"],
    ]);
    expect(lines.filter((l) => l.includes("queued the ingest"))).toHaveLength(2);
  });
});
