import type { ActivityItem, ActivityPage } from "../../../contracts/activity";
import type { PageQuery } from "../../../contracts/common";
import type { Executor } from "../../lib/db";
import type { Principal } from "../../http/principal";
import { decodeCursor, encodeCursor } from "../../lib/cursor";
import { insertActivity, listActivity, type ActivityEntry } from "./activity.repo";

export type { ActivityEntry };

export function recordActivity(db: Executor, entry: ActivityEntry): Promise<void> {
  return insertActivity(db, entry);
}

/** An activity entry made by the given caller in their team. */
export function byPrincipal(principal: Principal, ip: string | null): Pick<ActivityEntry, "teamId" | "actorUserId" | "actorTokenId" | "ip"> {
  return { teamId: principal.teamId, actorUserId: principal.userId, actorTokenId: principal.tokenId, ip };
}

export async function getActivityPage(db: Executor, teamId: number, query: PageQuery): Promise<ActivityPage> {
  const rows = await listActivity(db, teamId, decodeCursor(query.cursor), query.limit + 1);
  const page = rows.slice(0, query.limit);
  const items: ActivityItem[] = page.map((row) => ({
    id: row.id,
    action: row.action,
    actor: row.actorUserId === null ? null : { userId: row.actorUserId, name: row.actorName ?? "", email: row.actorEmail ?? "" },
    viaToken: row.actorTokenId !== null,
    target: row.target,
    details: row.details,
    ip: row.ip,
    createdAt: row.createdAt.toISOString(),
  }));
  const last = page.at(-1);
  return { items, nextCursor: rows.length > query.limit && last ? encodeCursor(last.id) : null };
}
