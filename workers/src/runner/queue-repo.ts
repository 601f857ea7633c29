// Claims and leases. A claim is a row lock taken with SKIP LOCKED (two runners never pick the same row) followed by
// writing the runner id and a heartbeat; the heartbeat is renewed while the job runs. Times come from the database
// clock (CURRENT_TIMESTAMP), so runners with skewed clocks still agree on when a lease has expired.
import { and, asc, eq, inArray, isNotNull, isNull, or, sql, type SQL } from "drizzle-orm";
import { graphs, runnerHeartbeats, runs, uploads, users } from "../../../api/src/db/schema";
import type { Db, Executor } from "../../../api/src/lib/db";

export type RunRow = typeof runs.$inferSelect;
export type GraphRow = typeof graphs.$inferSelect;
export type UploadRow = typeof uploads.$inferSelect;

const NOW = sql`CURRENT_TIMESTAMP(3)`;

function expired(column: typeof runs.heartbeatAt | typeof graphs.heartbeatAt, leaseMs: number): SQL {
  return sql`${column} < CURRENT_TIMESTAMP(3) - INTERVAL ${Math.round(leaseMs * 1000)} MICROSECOND`;
}

/** How a run came to this runner: first start, a retry request, or a takeover of a claim whose runner went silent. */
export type RunClaimKind = "start" | "retry" | "reclaim";

export interface ClaimedRun {
  run: RunRow;
  graph: GraphRow;
  kind: RunClaimKind;
  previousRunner: string | null;
}

// Two steps, so that claiming locks one row: a plain read lists candidates, then each is locked by primary key
// (SKIP LOCKED: a row another runner is claiming right now is passed over) and checked again before it is taken.
const CANDIDATES = 8;

function claimableRun(runnerId: string, leaseMs: number): SQL | undefined {
  return and(
    isNull(runs.deletedAt),
    or(
      eq(runs.status, "queued"),
      and(eq(runs.status, "running"), or(isNull(runs.heartbeatAt), expired(runs.heartbeatAt, leaseMs), eq(runs.claimedBy, runnerId))),
      and(inArray(runs.status, ["needs-attention", "failed"]), isNotNull(runs.retryRequestedAt)),
    ),
  );
}

/**
 * Claims the oldest run that is queued, retry-requested, or running under an expired lease (or under this runner's
 * own id: a runner only looks for work when it holds none, so such a claim is left over from its previous life).
 * Runs wait until their graph's ingest has ended.
 */
export async function claimRun(db: Db, runnerId: string, leaseMs: number, teams: readonly number[] = []): Promise<ClaimedRun | null> {
  const candidates = await db
    .select({ id: runs.id })
    .from(runs)
    .innerJoin(graphs, eq(graphs.id, runs.graphId))
    .where(and(claimableRun(runnerId, leaseMs), teams.length > 0 ? inArray(runs.teamId, [...teams]) : undefined, inArray(graphs.status, ["ready", "rejected"])))
    .orderBy(asc(runs.id))
    .limit(CANDIDATES);
  for (const { id } of candidates) {
    const claimed = await db.transaction(
      async (tx) => {
        const [hit] = await tx
          .select({ id: runs.id, status: runs.status, claimedBy: runs.claimedBy, retry: runs.retryRequestedAt })
          .from(runs)
          .where(and(eq(runs.id, id), claimableRun(runnerId, leaseMs)))
          .for("update", { skipLocked: true });
        if (!hit) return null;
        const kind: RunClaimKind = hit.status === "running" ? "reclaim" : hit.retry ? "retry" : "start";
        await tx
          .update(runs)
          .set({
            status: "running",
            claimedBy: runnerId,
            heartbeatAt: NOW,
            attempts: sql`${runs.attempts} + 1`,
            retryRequestedAt: null,
            statusReason: null,
            finishedAt: null,
            startedAt: sql`COALESCE(${runs.startedAt}, CURRENT_TIMESTAMP(3))`,
          })
          .where(eq(runs.id, id));
        const [run] = await tx.select().from(runs).where(eq(runs.id, id));
        const [graph] = await tx.select().from(graphs).where(eq(graphs.id, run.graphId));
        return { run, graph, kind, previousRunner: hit.status === "running" ? hit.claimedBy : null };
      },
      { isolationLevel: "read committed" },
    );
    if (claimed) return claimed;
  }
  return null;
}

export interface ClaimedIngest {
  graph: GraphRow;
  upload: UploadRow | null;
  reclaimed: boolean;
}

function claimableGraph(runnerId: string, leaseMs: number): SQL | undefined {
  return and(
    isNull(graphs.deletedAt),
    or(
      eq(graphs.status, "queued"),
      and(eq(graphs.status, "ingesting"), or(isNull(graphs.heartbeatAt), expired(graphs.heartbeatAt, leaseMs), eq(graphs.claimedBy, runnerId))),
    ),
  );
}

/** Claims the oldest queued graph, or one whose ingest lease expired; marks it ingesting. */
export async function claimIngest(db: Db, runnerId: string, leaseMs: number, teams: readonly number[] = []): Promise<ClaimedIngest | null> {
  const candidates = await db
    .select({ id: graphs.id })
    .from(graphs)
    .where(and(claimableGraph(runnerId, leaseMs), teams.length > 0 ? inArray(graphs.teamId, [...teams]) : undefined))
    .orderBy(asc(graphs.id))
    .limit(CANDIDATES);
  for (const { id } of candidates) {
    const claimed = await db.transaction(
      async (tx) => {
        const [hit] = await tx
          .select({ id: graphs.id, status: graphs.status })
          .from(graphs)
          .where(and(eq(graphs.id, id), claimableGraph(runnerId, leaseMs)))
          .for("update", { skipLocked: true });
        if (!hit) return null;
        await tx
          .update(graphs)
          .set({
            status: "ingesting",
            claimedBy: runnerId,
            heartbeatAt: NOW,
            ingestStartedAt: NOW,
            progress: null,
            rejection: null,
            rejectReason: null,
            finishedAt: null,
          })
          .where(eq(graphs.id, id));
        const [graph] = await tx.select().from(graphs).where(eq(graphs.id, id));
        const upload = graph.uploadId ? ((await tx.select().from(uploads).where(eq(uploads.id, graph.uploadId)))[0] ?? null) : null;
        return { graph, upload, reclaimed: hit.status === "ingesting" };
      },
      { isolationLevel: "read committed" },
    );
    if (claimed) return claimed;
  }
  return null;
}

/** Renews the run's lease; `held` is false when another runner took the run over (or it left `running`). */
export async function renewRunLease(db: Executor, runId: number, runnerId: string): Promise<{ held: boolean; cancelRequested: boolean }> {
  const [res] = await db
    .update(runs)
    .set({ heartbeatAt: NOW })
    .where(and(eq(runs.id, runId), eq(runs.claimedBy, runnerId), eq(runs.status, "running")));
  const [row] = await db.select({ cancel: runs.cancelRequestedAt, deleted: runs.deletedAt }).from(runs).where(eq(runs.id, runId));
  return { held: res.affectedRows > 0, cancelRequested: Boolean(row?.cancel || row?.deleted) };
}

export async function renewIngestLease(db: Executor, graphId: number, runnerId: string): Promise<boolean> {
  const [res] = await db
    .update(graphs)
    .set({ heartbeatAt: NOW })
    .where(and(eq(graphs.id, graphId), eq(graphs.claimedBy, runnerId), eq(graphs.status, "ingesting")));
  return res.affectedRows > 0;
}

/** Hands a run back to the queue (runner shutting down): the next runner resumes it from its checkpoint. */
export async function releaseRun(db: Executor, runId: number, runnerId: string): Promise<boolean> {
  const [res] = await db
    .update(runs)
    .set({ status: "queued", claimedBy: null, heartbeatAt: null })
    .where(and(eq(runs.id, runId), eq(runs.claimedBy, runnerId), eq(runs.status, "running")));
  return res.affectedRows > 0;
}

export async function releaseIngest(db: Executor, graphId: number, runnerId: string): Promise<boolean> {
  const [res] = await db
    .update(graphs)
    .set({ status: "queued", claimedBy: null, heartbeatAt: null, progress: null })
    .where(and(eq(graphs.id, graphId), eq(graphs.claimedBy, runnerId), eq(graphs.status, "ingesting")));
  return res.affectedRows > 0;
}

export interface Beat {
  runnerId: string;
  host: string;
  pid: number;
  threads: number;
  busy: number;
  rssBytes: number;
  heapBytes: number;
  currentRunId: number | null;
  currentGraphId: number | null;
  softwareVersion: string;
  startedAt: Date;
}

export async function writeHeartbeat(db: Executor, beat: Beat, stopped = false): Promise<void> {
  const live = {
    pid: beat.pid,
    host: beat.host,
    threads: beat.threads,
    busy: beat.busy,
    rssBytes: beat.rssBytes,
    heapBytes: beat.heapBytes,
    currentRunId: beat.currentRunId,
    currentGraphId: beat.currentGraphId,
    softwareVersion: beat.softwareVersion,
    beatAt: NOW,
    stoppedAt: stopped ? NOW : null,
  };
  await db
    .insert(runnerHeartbeats)
    .values({ runnerId: beat.runnerId, startedAt: beat.startedAt, ...live })
    .onDuplicateKeyUpdate({ set: { ...live, startedAt: beat.startedAt } });
}

/** The submitter's address when both the run and the user want run e-mails. */
export async function notifyAddress(db: Executor, run: RunRow): Promise<string | null> {
  if (!run.notify || !run.createdByUserId) return null;
  const [user] = await db
    .select({ email: users.email, notify: users.notify, disabledAt: users.disabledAt })
    .from(users)
    .where(eq(users.id, run.createdByUserId));
  return user && user.notify && !user.disabledAt ? user.email : null;
}
