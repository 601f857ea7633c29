import { and, asc, desc, eq, gt, inArray, isNull, lt, notInArray, sql } from "drizzle-orm";
import { graphs, teams, uploads, users } from "../../db/schema";
import type { Executor } from "../../lib/db";

export type UploadRow = typeof uploads.$inferSelect;

export async function teamQuotaBytes(db: Executor, teamId: number): Promise<number | null> {
  const rows = await db.select({ quotas: teams.quotas }).from(teams).where(eq(teams.id, teamId)).limit(1);
  return rows[0]?.quotas.maxStorageBytes ?? null;
}

/** Uploads whose bytes are gone from disk: they no longer count against the quota. */
export const REMOVED_STATES = ["aborted", "expired"] as const satisfies readonly UploadRow["state"][];

/** Declared bytes of the team's uploads that still hold data. */
export async function teamUsedBytes(db: Executor, teamId: number): Promise<number> {
  const rows = await db
    .select({ used: sql<string | null>`sum(coalesce(${uploads.size}, ${uploads.offset}))` })
    .from(uploads)
    .where(and(eq(uploads.teamId, teamId), notInArray(uploads.state, [...REMOVED_STATES])));
  return Number(rows[0]?.used ?? 0);
}

/** Serializes quota checks per team: the team row stays locked until the transaction ends. */
export async function lockTeam(db: Executor, teamId: number): Promise<void> {
  await db.select({ id: teams.id }).from(teams).where(eq(teams.id, teamId)).for("update");
}

export async function insertUpload(
  db: Executor,
  row: Pick<UploadRow, "teamId" | "userId" | "tusId" | "filename" | "contentType" | "size" | "metadata" | "storagePath">,
): Promise<number> {
  const [inserted] = await db.insert(uploads).values({ ...row, offset: 0, state: "uploading" }).$returningId();
  return inserted.id;
}

export async function findUploadByTusId(db: Executor, tusId: string): Promise<UploadRow | null> {
  const rows = await db.select().from(uploads).where(eq(uploads.tusId, tusId)).limit(1);
  return rows[0] ?? null;
}

export async function findUpload(db: Executor, teamId: number, id: number): Promise<UploadRow | null> {
  const rows = await db.select().from(uploads).where(and(eq(uploads.teamId, teamId), eq(uploads.id, id))).limit(1);
  return rows[0] ?? null;
}

export async function setUploadOffset(db: Executor, id: number, offset: number): Promise<void> {
  await db.update(uploads).set({ offset }).where(and(eq(uploads.id, id), eq(uploads.state, "uploading")));
}

export async function completeUpload(db: Executor, id: number, offset: number, checksum: string): Promise<void> {
  await db.update(uploads).set({ offset, checksum, state: "complete", completedAt: new Date() }).where(eq(uploads.id, id));
}

export async function abortUpload(db: Executor, id: number): Promise<void> {
  await db.update(uploads).set({ state: "aborted" }).where(eq(uploads.id, id));
}

/** Unfinished uploads created before `cutoff`, in id order after `afterId`. */
export async function findStaleUploads(db: Executor, cutoff: Date, afterId: number, limit: number): Promise<UploadRow[]> {
  return db
    .select()
    .from(uploads)
    .where(and(eq(uploads.state, "uploading"), lt(uploads.createdAt, cutoff), gt(uploads.id, afterId)))
    .orderBy(asc(uploads.id))
    .limit(limit);
}

/** Marks one unfinished upload expired; false when it finished, was deleted or is not old enough any more. */
export async function markUploadExpired(db: Executor, id: number, cutoff: Date): Promise<boolean> {
  const [result] = await db
    .update(uploads)
    .set({ state: "expired" })
    .where(and(eq(uploads.id, id), eq(uploads.state, "uploading"), lt(uploads.createdAt, cutoff)));
  return result.affectedRows === 1;
}

/** Graphs that still use the upload (deleted graphs do not count). */
export async function countGraphsUsing(db: Executor, uploadId: number): Promise<number> {
  const rows = await db
    .select({ n: sql<number>`count(*)` })
    .from(graphs)
    .where(and(eq(graphs.uploadId, uploadId), isNull(graphs.deletedAt)));
  return Number(rows[0]?.n ?? 0);
}

export async function listUploads(
  db: Executor,
  teamId: number,
  states: readonly UploadRow["state"][],
  beforeId: number | null,
  limit: number,
) {
  return db
    .select({ upload: uploads, uploaderName: users.name })
    .from(uploads)
    .leftJoin(users, eq(users.id, uploads.userId))
    .where(
      and(
        eq(uploads.teamId, teamId),
        inArray(uploads.state, [...states]),
        beforeId === null ? undefined : lt(uploads.id, beforeId),
      ),
    )
    .orderBy(desc(uploads.id))
    .limit(limit);
}
