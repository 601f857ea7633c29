// Demo graphs and runs: writes the two invented edge lists as finished uploads (as the upload endpoint leaves them),
// queues their ingests and three runs. The runner does the work after start-up. Safe to run on every start: nothing
// is created twice, and a demo graph someone deleted stays deleted.
import { createHash, randomBytes } from "node:crypto";
import { mkdir, writeFile } from "node:fs/promises";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import type { RunParameters } from "../api/contracts/runs";
import { graphs, runs, uploads } from "../api/src/db/schema";
import type { Db } from "../api/src/lib/db";
import { kestrelCrawl, TRUSTED_SEEDS, tidalCitations } from "./demo-data";

export const DEMO_CRAWL = "Kestrel Isles crawl (demo)";
export const DEMO_CITATIONS = "Kestrel Review of Tidal Science citations (demo)";

export interface DemoGraphContext {
  db: Db;
  teamId: number;
  userId: number;
  dataDir: string;
  log: (line: string) => void;
}

const DEFAULT_OPTIONS = { directed: true, weighted: false, selfLoops: "drop", duplicates: "merge", header: "auto", delimiter: "auto", maxBadLines: 0 };

function parameters(teleport: RunParameters["teleport"]): RunParameters {
  return { damping: 0.85, tolerance: 1e-9, maxIterations: 200, dangling: "teleport", teleport, weighted: false, shards: "auto", topK: 100 };
}

async function demoGraph(ctx: DemoGraphContext, name: string, filename: string, contentType: string, make: () => Buffer): Promise<number | null> {
  const [existing] = await ctx.db
    .select({ id: graphs.id })
    .from(graphs)
    .where(and(eq(graphs.teamId, ctx.teamId), eq(graphs.name, name), eq(graphs.isDemo, true)));
  if (existing) return null;
  const bytes = make();
  const tusId = randomBytes(16).toString("hex");
  const storagePath = path.posix.join("uploads", tusId);
  await mkdir(path.resolve(ctx.dataDir, "uploads"), { recursive: true });
  await writeFile(path.resolve(ctx.dataDir, storagePath), bytes);
  const checksum = `sha256:${createHash("sha256").update(bytes).digest("hex")}`;
  const [upload] = await ctx.db
    .insert(uploads)
    .values({
      teamId: ctx.teamId,
      userId: ctx.userId,
      tusId,
      filename,
      contentType,
      size: bytes.length,
      offset: bytes.length,
      checksum,
      metadata: { filename, filetype: contentType },
      state: "complete",
      storagePath,
      completedAt: new Date(),
    })
    .$returningId();
  const [graph] = await ctx.db
    .insert(graphs)
    .values({ teamId: ctx.teamId, uploadId: upload.id, createdByUserId: ctx.userId, name, options: DEFAULT_OPTIONS, status: "queued", isDemo: true })
    .$returningId();
  ctx.log(`demo: queued the ingest of "${name}" (${(bytes.length / 2 ** 20).toFixed(1)} MiB)`);
  return graph.id;
}

async function queueDemoRun(ctx: DemoGraphContext, graphId: number, params: RunParameters): Promise<void> {
  await ctx.db.insert(runs).values({ teamId: ctx.teamId, graphId, createdByUserId: ctx.userId, parameters: params, status: "queued", isDemo: true });
}

export async function seedDemoGraphs(ctx: DemoGraphContext): Promise<void> {
  const crawl = await demoGraph(ctx, DEMO_CRAWL, "kestrel-isles-crawl.csv", "text/csv", () => kestrelCrawl().bytes);
  if (crawl !== null) {
    await queueDemoRun(ctx, crawl, parameters({ kind: "uniform" }));
    await queueDemoRun(ctx, crawl, parameters({ kind: "seeds", seeds: TRUSTED_SEEDS.map((node) => ({ node, weight: 1 })) }));
    ctx.log("demo: queued a uniform run and a run seeded on trusted council and harbour pages");
  }
  const citations = await demoGraph(ctx, DEMO_CITATIONS, "tidal-science-citations.tsv", "text/tab-separated-values", () => tidalCitations().bytes);
  if (citations !== null) await queueDemoRun(ctx, citations, parameters({ kind: "uniform" }));
}
