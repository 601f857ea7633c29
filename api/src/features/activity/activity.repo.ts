import { and, desc, eq, lt } from "drizzle-orm";
import { activity, users } from "../../db/schema";
import type { Executor } from "../../lib/db";

export interface ActivityEntry {
  teamId: number | null;
  actorUserId: number | null;
  actorTokenId?: number | null;
  action: string;
  target?: string | null;
  details?: Record<string, unknown> | null;
  ip?: string | null;
}

export async function insertActivity(db: Executor, entry: ActivityEntry): Promise<void> {
  await db.insert(activity).values({
    teamId: entry.teamId,
    actorUserId: entry.actorUserId,
    actorTokenId: entry.actorTokenId ?? null,
    action: entry.action,
    target: entry.target?.slice(0, 255) ?? null,
    details: entry.details ?? null,
    ip: entry.ip?.slice(0, 64) ?? null,
  });
}

/** Newest first; `beforeId` is the cursor (the last id of the previous page). */
export async function listActivity(db: Executor, teamId: number, beforeId: number | null, limit: number) {
  return db
    .select({
      id: activity.id,
      action: activity.action,
      target: activity.target,
      details: activity.details,
      ip: activity.ip,
      createdAt: activity.createdAt,
      actorTokenId: activity.actorTokenId,
      actorUserId: users.id,
      actorName: users.name,
      actorEmail: users.email,
    })
    .from(activity)
    .leftJoin(users, eq(users.id, activity.actorUserId))
    .where(beforeId === null ? eq(activity.teamId, teamId) : and(eq(activity.teamId, teamId), lt(activity.id, beforeId)))
    .orderBy(desc(activity.id))
    .limit(limit);
}
