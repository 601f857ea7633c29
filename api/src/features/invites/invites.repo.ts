import { and, desc, eq, gt, isNull } from "drizzle-orm";
import type { Role } from "../../../contracts/common";
import { invites, teams, users } from "../../db/schema";
import type { Executor } from "../../lib/db";

export async function insertInvite(
  db: Executor,
  invite: { teamId: number; email: string; role: Role; tokenHash: string; invitedByUserId: number; expiresAt: Date },
): Promise<number> {
  const [row] = await db.insert(invites).values(invite).$returningId();
  return row.id;
}

export async function listPendingInvites(db: Executor, teamId: number, now: Date) {
  return db
    .select({
      id: invites.id,
      email: invites.email,
      role: invites.role,
      invitedBy: users.name,
      createdAt: invites.createdAt,
      expiresAt: invites.expiresAt,
    })
    .from(invites)
    .leftJoin(users, eq(users.id, invites.invitedByUserId))
    .where(and(eq(invites.teamId, teamId), isNull(invites.acceptedAt), isNull(invites.revokedAt), gt(invites.expiresAt, now)))
    .orderBy(desc(invites.id));
}

export async function findInvite(db: Executor, teamId: number, id: number) {
  const rows = await db
    .select({ id: invites.id, email: invites.email, acceptedAt: invites.acceptedAt, revokedAt: invites.revokedAt })
    .from(invites)
    .where(and(eq(invites.teamId, teamId), eq(invites.id, id)))
    .limit(1);
  return rows[0] ?? null;
}

export async function findInviteByHash(db: Executor, tokenHash: string) {
  const rows = await db
    .select({
      id: invites.id,
      email: invites.email,
      role: invites.role,
      teamId: teams.id,
      teamName: teams.name,
      expiresAt: invites.expiresAt,
      acceptedAt: invites.acceptedAt,
      revokedAt: invites.revokedAt,
    })
    .from(invites)
    .innerJoin(teams, eq(teams.id, invites.teamId))
    .where(eq(invites.tokenHash, tokenHash))
    .limit(1);
  return rows[0] ?? null;
}

export async function revokeInvite(db: Executor, id: number): Promise<void> {
  await db.update(invites).set({ revokedAt: new Date() }).where(and(eq(invites.id, id), isNull(invites.revokedAt)));
}

/** Marks an open invite as accepted; false when another request used or revoked it first. */
export async function claimInvite(db: Executor, id: number, userId: number): Promise<boolean> {
  const [result] = await db
    .update(invites)
    .set({ acceptedAt: new Date(), acceptedUserId: userId })
    .where(and(eq(invites.id, id), isNull(invites.acceptedAt), isNull(invites.revokedAt)));
  return result.affectedRows === 1;
}
