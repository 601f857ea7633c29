import { and, asc, desc, eq, gt, inArray, isNull, lt, sql } from "drizzle-orm";
import { graphs, runEvents, runIterations, runs, runShards, runTop, teams, users, type TeamQuotas } from "../../db/schema";
import type { Executor } from "../../lib/db";

export type RunRow = typeof runs.$inferSelect;

const runColumns = {
  run: runs,
  graphName: graphs.name,
  graphStatistics: graphs.statistics,
  creatorName: users.name,
};

function runQuery(db: Executor) {
  return db
    .select(runColumns)
    .from(runs)
    .innerJoin(graphs, eq(graphs.id, runs.graphId))
    .leftJoin(users, eq(users.id, runs.createdByUserId));
}

export type RunWithGraph = Awaited<ReturnType<typeof findRun>> & {};

export async function findRun(db: Executor, teamId: number, id: number) {
  const rows = await runQuery(db)
    .where(and(eq(runs.teamId, teamId), eq(runs.id, id), isNull(runs.deletedAt)))
    .limit(1);
  return rows[0] ?? null;
}

export async function listRuns(
  db: Executor,
  teamId: number,
  filter: { graphId?: number; status?: RunRow["status"] },
  beforeId: number | null,
  limit: number,
) {
  return runQuery(db)
    .where(
      and(
        eq(runs.teamId, teamId),
        isNull(runs.deletedAt),
        filter.graphId === undefined ? undefined : eq(runs.graphId, filter.graphId),
        filter.status === undefined ? undefined : eq(runs.status, filter.status),
        beforeId === null ? undefined : lt(runs.id, beforeId),
      ),
    )
    .orderBy(desc(runs.id))
    .limit(limit);
}

export async function insertRun(
  db: Executor,
  row: Pick<RunRow, "teamId" | "graphId" | "createdByUserId" | "parameters" | "notify" | "inputFingerprint">,
): Promise<number> {
  const [inserted] = await db.insert(runs).values({ ...row, status: "queued" }).$returningId();
  return inserted.id;
}

export async function insertRunEvent(
  db: Executor,
  event: { teamId: number; runId: number; level?: "info" | "warn" | "error"; kind: string; message: string; details?: Record<string, unknown> },
): Promise<void> {
  await db.insert(runEvents).values({ level: "info", ...event });
}

/** A queued run nobody has claimed ends canceled at once; false when it is no longer queued. */
export async function cancelQueuedRun(db: Executor, id: number): Promise<boolean> {
  const now = new Date();
  const [result] = await db
    .update(runs)
    .set({ status: "canceled", stopReason: "canceled", statusReason: "Canceled before it started.", cancelRequestedAt: now, finishedAt: now })
    .where(and(eq(runs.id, id), eq(runs.status, "queued")));
  return result.affectedRows > 0;
}

/** A running run is canceled by its runner, which sees the request on its next lease renewal. */
export async function requestCancel(db: Executor, id: number): Promise<boolean> {
  const [result] = await db
    .update(runs)
    .set({ cancelRequestedAt: new Date() })
    .where(and(eq(runs.id, id), eq(runs.status, "running")));
  return result.affectedRows > 0;
}

export async function requestRetry(db: Executor, id: number): Promise<boolean> {
  const [result] = await db
    .update(runs)
    .set({ retryRequestedAt: new Date() })
    .where(and(eq(runs.id, id), inArray(runs.status, ["needs-attention", "failed"]), isNull(runs.retryRequestedAt)));
  return result.affectedRows > 0;
}

export async function listIterations(db: Executor, runId: number, afterK: number) {
  return db
    .select({ k: runIterations.k, residual: runIterations.residual, danglingMass: runIterations.danglingMass, elapsedMs: runIterations.elapsedMs })
    .from(runIterations)
    .where(and(eq(runIterations.runId, runId), gt(runIterations.k, afterK < 0 ? -1 : afterK)))
    .orderBy(asc(runIterations.k));
}

/** The last `count` iterations, oldest first. */
export async function lastIterations(db: Executor, runId: number, count: number) {
  const rows = await db
    .select({ k: runIterations.k, residual: runIterations.residual, elapsedMs: runIterations.elapsedMs })
    .from(runIterations)
    .where(eq(runIterations.runId, runId))
    .orderBy(desc(runIterations.k))
    .limit(count);
  return rows.reverse();
}

export async function iterationTotals(db: Executor, runId: number) {
  const rows = await db
    .select({ n: sql<number>`count(*)`, ms: sql<number | null>`sum(${runIterations.elapsedMs})` })
    .from(runIterations)
    .where(eq(runIterations.runId, runId));
  return { count: Number(rows[0]?.n ?? 0), totalMs: Number(rows[0]?.ms ?? 0) };
}

export async function firstResidual(db: Executor, runId: number): Promise<number | null> {
  const rows = await db
    .select({ residual: runIterations.residual })
    .from(runIterations)
    .where(eq(runIterations.runId, runId))
    .orderBy(asc(runIterations.k))
    .limit(1);
  return rows[0]?.residual ?? null;
}

export async function listShards(db: Executor, runId: number) {
  return db.select().from(runShards).where(eq(runShards.runId, runId)).orderBy(asc(runShards.shard));
}

export async function listEvents(db: Executor, runId: number, afterId: number, limit: number) {
  return db
    .select()
    .from(runEvents)
    .where(and(eq(runEvents.runId, runId), gt(runEvents.id, afterId)))
    .orderBy(asc(runEvents.id))
    .limit(limit);
}

/** Top-k rows with ranks in [fromRank, toRank]. */
export async function topRows(db: Executor, runId: number, fromRank: number, toRank: number) {
  return db
    .select({ rank: runTop.rank, nodeId: runTop.nodeId, score: runTop.score })
    .from(runTop)
    .where(and(eq(runTop.runId, runId), sql`${runTop.rank} between ${fromRank} and ${toRank}`))
    .orderBy(asc(runTop.rank));
}

export async function topCount(db: Executor, runId: number): Promise<number> {
  const rows = await db.select({ n: sql<number>`count(*)` }).from(runTop).where(eq(runTop.runId, runId));
  return Number(rows[0]?.n ?? 0);
}

export async function topByNode(db: Executor, runId: number, nodeId: string) {
  const rows = await db
    .select({ rank: runTop.rank, nodeId: runTop.nodeId, score: runTop.score })
    .from(runTop)
    .where(and(eq(runTop.runId, runId), eq(runTop.nodeId, nodeId)))
    .limit(1);
  return rows[0] ?? null;
}

export async function teamQuotas(db: Executor, teamId: number): Promise<TeamQuotas> {
  const rows = await db.select({ quotas: teams.quotas }).from(teams).where(eq(teams.id, teamId)).limit(1);
  return rows[0]?.quotas ?? {};
}

export async function countActiveRuns(db: Executor, teamId: number): Promise<number> {
  const rows = await db
    .select({ n: sql<number>`count(*)` })
    .from(runs)
    .where(and(eq(runs.teamId, teamId), inArray(runs.status, ["queued", "running"]), isNull(runs.deletedAt)));
  return Number(rows[0]?.n ?? 0);
}

export async function softDeleteRun(db: Executor, id: number): Promise<void> {
  await db.update(runs).set({ deletedAt: new Date() }).where(eq(runs.id, id));
}
