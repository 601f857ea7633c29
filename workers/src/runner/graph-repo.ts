// What the runner writes about an ingest: progress, the validation report, sampled bad lines, the outcome.
import { and, eq } from "drizzle-orm";
import { graphProblems, graphs } from "../../../api/src/db/schema";
import type { Db, Executor } from "../../../api/src/lib/db";

export interface IngestProgressRecord {
  phase: "parse" | "build" | "store";
  bytesRead: number;
  totalBytes: number;
  rows: number;
  rowsPerSecond: number;
  updatedAt: string;
}

export async function writeIngestProgress(db: Executor, graphId: number, runnerId: string, progress: IngestProgressRecord): Promise<void> {
  await db
    .update(graphs)
    .set({ progress: { ...progress } })
    .where(and(eq(graphs.id, graphId), eq(graphs.claimedBy, runnerId), eq(graphs.status, "ingesting")));
}

export interface ProblemRecord {
  lineNumber: number;
  reason: string;
  detail: string;
  line: string;
}

export interface Rejection {
  code: string;
  file: string;
  line: number | null;
  reason: string;
  message: string;
}

/** The sampled bad lines replace those of any earlier ingest of the same graph. */
async function replaceProblems(tx: Executor, teamId: number, graphId: number, problems: ProblemRecord[]): Promise<void> {
  await tx.delete(graphProblems).where(eq(graphProblems.graphId, graphId));
  for (let i = 0; i < problems.length; i += 500) {
    await tx.insert(graphProblems).values(
      problems.slice(i, i + 500).map((p) => ({ teamId, graphId, ...p, detail: p.detail.slice(0, 255), line: p.line.slice(0, 1024) })),
    );
  }
}

const owned = (graphId: number, runnerId: string) =>
  and(eq(graphs.id, graphId), eq(graphs.claimedBy, runnerId), eq(graphs.status, "ingesting"));

/** Marks the graph ready; false (nothing written) when the claim was lost meanwhile. */
export async function markGraphReady(
  db: Db,
  graph: { id: number; teamId: number },
  runnerId: string,
  ready: { statistics: Record<string, unknown>; storagePath: string; fingerprint: string; problems: ProblemRecord[] },
): Promise<boolean> {
  return db.transaction(async (tx) => {
    const [res] = await tx
      .update(graphs)
      .set({
        status: "ready",
        statistics: ready.statistics,
        storagePath: ready.storagePath,
        fingerprint: ready.fingerprint,
        progress: null,
        claimedBy: null,
        heartbeatAt: null,
        finishedAt: new Date(),
      })
      .where(owned(graph.id, runnerId));
    if (res.affectedRows === 0) return false;
    await replaceProblems(tx, graph.teamId, graph.id, ready.problems);
    return true;
  });
}

export async function markGraphRejected(
  db: Db,
  graph: { id: number; teamId: number },
  runnerId: string,
  rejected: { rejection: Rejection; fingerprint: string | null; problems: ProblemRecord[] },
): Promise<boolean> {
  return db.transaction(async (tx) => {
    const [res] = await tx
      .update(graphs)
      .set({
        status: "rejected",
        rejection: { ...rejected.rejection },
        rejectReason: rejected.rejection.message,
        fingerprint: rejected.fingerprint,
        statistics: null,
        storagePath: null,
        progress: null,
        claimedBy: null,
        heartbeatAt: null,
        finishedAt: new Date(),
      })
      .where(owned(graph.id, runnerId));
    if (res.affectedRows === 0) return false;
    await replaceProblems(tx, graph.teamId, graph.id, rejected.problems);
    return true;
  });
}
