// What the runner writes about a run: iteration history, shard states, events, progress, the final record, top-k.
import { and, eq, lte, sql } from "drizzle-orm";
import { runEvents, runIterations, runs, runShards, runTop } from "../../../api/src/db/schema";
import type { Db, Executor } from "../../../api/src/lib/db";

export interface IterationRow {
  k: number;
  residual: number;
  danglingMass: number;
  elapsedMs: number;
}

/** Keyed by (run, k): writing iteration k again (after a resume) replaces it instead of adding a second row. */
export async function upsertIterations(db: Executor, teamId: number, runId: number, rows: IterationRow[]): Promise<void> {
  if (rows.length === 0) return;
  await db
    .insert(runIterations)
    .values(rows.map((r) => ({ teamId, runId, ...r })))
    .onDuplicateKeyUpdate({
      set: {
        residual: sql`VALUES(${runIterations.residual})`,
        danglingMass: sql`VALUES(${runIterations.danglingMass})`,
        elapsedMs: sql`VALUES(${runIterations.elapsedMs})`,
      },
    });
}

/** How many of iterations 1..k are recorded, and the sum of their own times (whichever attempt ran each). */
export async function iterationTimes(db: Executor, runId: number, k: number): Promise<{ count: number; totalMs: number }> {
  const rows = await db
    .select({ n: sql<number>`count(*)`, ms: sql<number | null>`sum(${runIterations.elapsedMs})` })
    .from(runIterations)
    .where(and(eq(runIterations.runId, runId), lte(runIterations.k, k)));
  return { count: Number(rows[0]?.n ?? 0), totalMs: Number(rows[0]?.ms ?? 0) };
}

export interface ShardRow {
  shard: number;
  vertexStart: number;
  vertexEnd: number;
  edgeCount: number;
  state: "queued" | "running" | "done" | "retrying" | "failed";
  attempts: number;
  worker: string | null;
  /** null keeps the error already recorded. */
  lastError: string | null;
}

export async function upsertShards(db: Executor, teamId: number, runId: number, rows: ShardRow[]): Promise<void> {
  if (rows.length === 0) return;
  await db
    .insert(runShards)
    .values(rows.map((r) => ({ teamId, runId, ...r, lastError: r.lastError === null ? null : r.lastError.slice(0, 4000) })))
    .onDuplicateKeyUpdate({
      set: {
        vertexStart: sql`VALUES(${runShards.vertexStart})`,
        vertexEnd: sql`VALUES(${runShards.vertexEnd})`,
        edgeCount: sql`VALUES(${runShards.edgeCount})`,
        state: sql`VALUES(${runShards.state})`,
        attempts: sql`VALUES(${runShards.attempts})`,
        worker: sql`COALESCE(VALUES(${runShards.worker}), ${runShards.worker})`,
        lastError: sql`COALESCE(VALUES(${runShards.lastError}), ${runShards.lastError})`,
        finishedAt: sql`IF(VALUES(${runShards.state}) = 'done', CURRENT_TIMESTAMP(3), NULL)`,
        startedAt: sql`COALESCE(${runShards.startedAt}, CURRENT_TIMESTAMP(3))`,
      },
    });
}

/** A shard plan for another shard count replaces the old rows wholesale. */
export async function deleteShardsFrom(db: Executor, runId: number, firstUnused: number): Promise<void> {
  await db.delete(runShards).where(and(eq(runShards.runId, runId), sql`${runShards.shard} >= ${firstUnused}`));
}

export async function addEvent(
  db: Executor,
  teamId: number,
  runId: number,
  level: "info" | "warn" | "error",
  kind: string,
  message: string,
  details: Record<string, unknown> | null = null,
): Promise<void> {
  await db.insert(runEvents).values({ teamId, runId, level, kind, message, details });
}

/** Live figures on the run row, written only while this runner holds the claim. */
export async function updateRunProgress(
  db: Executor,
  runId: number,
  runnerId: string,
  p: { iterations?: number; residual?: number; errorBound?: number; lastCheckpointK?: number },
): Promise<void> {
  await db
    .update(runs)
    .set({ iterations: p.iterations, finalResidual: p.residual, errorBound: p.errorBound, lastCheckpointK: p.lastCheckpointK })
    .where(and(eq(runs.id, runId), eq(runs.claimedBy, runnerId)));
}

export type FinalStatus = "converged" | "not-converged" | "needs-attention" | "canceled" | "failed";

export interface FinalRecord {
  status: FinalStatus;
  statusReason: string | null;
  stopReason: string;
  iterations?: number;
  finalResidual?: number | null;
  errorBound?: number | null;
  timings?: Record<string, number>;
  outputs?: Record<string, unknown> | null;
  inputFingerprint?: string | null;
  softwareVersion: string;
  lastCheckpointK?: number | null;
}

/** Ends the claim with a final status; false when the run is no longer this runner's (nothing written). */
export async function finishRun(db: Executor, runId: number, runnerId: string, f: FinalRecord): Promise<boolean> {
  const [res] = await db
    .update(runs)
    .set({
      ...f,
      claimedBy: null,
      heartbeatAt: null,
      finishedAt: sql`CURRENT_TIMESTAMP(3)`,
    })
    .where(and(eq(runs.id, runId), eq(runs.claimedBy, runnerId), eq(runs.status, "running")));
  return res.affectedRows > 0;
}

export interface TopRow {
  rank: number;
  nodeId: string;
  score: number;
}

/** Replaces the run's stored top-k in one transaction. */
export async function replaceTop(db: Db, teamId: number, runId: number, rows: TopRow[]): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.delete(runTop).where(eq(runTop.runId, runId));
    for (let i = 0; i < rows.length; i += 1000) {
      await tx.insert(runTop).values(rows.slice(i, i + 1000).map((r) => ({ teamId, runId, ...r })));
    }
  });
}

/** The recorded residual of iteration k, if any. */
export async function iterationResidual(db: Executor, runId: number, k: number): Promise<number | null> {
  const [row] = await db
    .select({ residual: runIterations.residual })
    .from(runIterations)
    .where(and(eq(runIterations.runId, runId), eq(runIterations.k, k)));
  return row?.residual ?? null;
}
