import { and, asc, desc, eq, gt, inArray, isNull, like, or, sql } from "drizzle-orm";
import { activity, graphs, runnerHeartbeats, runs, users } from "../../db/schema";
import type { Executor } from "../../lib/db";

export async function queuedRuns(db: Executor, teamId: number, limit: number) {
  return db
    .select({ id: runs.id, graphId: runs.graphId, graphName: graphs.name, creatorName: users.name, createdAt: runs.createdAt })
    .from(runs)
    .innerJoin(graphs, eq(graphs.id, runs.graphId))
    .leftJoin(users, eq(users.id, runs.createdByUserId))
    .where(and(eq(runs.teamId, teamId), eq(runs.status, "queued"), isNull(runs.deletedAt)))
    .orderBy(asc(runs.id))
    .limit(limit);
}

export async function pendingIngests(db: Executor, teamId: number, limit: number) {
  return db
    .select({ id: graphs.id, name: graphs.name, status: graphs.status, progress: graphs.progress, createdAt: graphs.createdAt })
    .from(graphs)
    .where(and(eq(graphs.teamId, teamId), inArray(graphs.status, ["queued", "ingesting"]), isNull(graphs.deletedAt)))
    .orderBy(asc(graphs.id))
    .limit(limit);
}

export async function runningRuns(db: Executor, teamId: number) {
  return db
    .select({ run: runs, graphName: graphs.name, graphStatistics: graphs.statistics })
    .from(runs)
    .innerJoin(graphs, eq(graphs.id, runs.graphId))
    .where(and(eq(runs.teamId, teamId), eq(runs.status, "running"), isNull(runs.deletedAt)))
    .orderBy(asc(runs.id));
}

/** Runners that beat within the window and have not said they stopped. */
export async function liveRunners(db: Executor, windowSeconds: number) {
  return db
    .select({ beat: runnerHeartbeats, ageMs: sql<number>`timestampdiff(microsecond, ${runnerHeartbeats.beatAt}, current_timestamp(3)) / 1000` })
    .from(runnerHeartbeats)
    .where(and(isNull(runnerHeartbeats.stoppedAt), gt(runnerHeartbeats.beatAt, sql`current_timestamp(3) - interval ${windowSeconds} second`)))
    .orderBy(asc(runnerHeartbeats.runnerId));
}

export async function teamRunIds(db: Executor, teamId: number, ids: number[]): Promise<Set<number>> {
  if (ids.length === 0) return new Set();
  const rows = await db.select({ id: runs.id }).from(runs).where(and(eq(runs.teamId, teamId), inArray(runs.id, ids)));
  return new Set(rows.map((r) => r.id));
}

export async function teamGraphIds(db: Executor, teamId: number, ids: number[]): Promise<Set<number>> {
  if (ids.length === 0) return new Set();
  const rows = await db.select({ id: graphs.id }).from(graphs).where(and(eq(graphs.teamId, teamId), inArray(graphs.id, ids)));
  return new Set(rows.map((r) => r.id));
}

/** Work events only (graphs, runs, uploads): the full audit log stays admin-only. */
export async function recentWork(db: Executor, teamId: number, limit: number) {
  return db
    .select({ id: activity.id, action: activity.action, target: activity.target, actorName: users.name, createdAt: activity.createdAt })
    .from(activity)
    .leftJoin(users, eq(users.id, activity.actorUserId))
    .where(and(eq(activity.teamId, teamId), or(like(activity.action, "graph.%"), like(activity.action, "run.%"), like(activity.action, "upload.%"))))
    .orderBy(desc(activity.id))
    .limit(limit);
}

export async function teamCounts(db: Executor, teamId: number) {
  const [g] = await db.select({ n: sql<number>`count(*)` }).from(graphs).where(and(eq(graphs.teamId, teamId), isNull(graphs.deletedAt)));
  const [r] = await db
    .select({
      n: sql<number>`count(*)`,
      finished: sql<number>`coalesce(sum(${runs.status} in ('converged', 'not-converged')), 0)`,
    })
    .from(runs)
    .where(and(eq(runs.teamId, teamId), isNull(runs.deletedAt)));
  return { graphs: Number(g?.n ?? 0), runs: Number(r?.n ?? 0), finishedRuns: Number(r?.finished ?? 0) };
}
