import { and, desc, eq, isNull } from "drizzle-orm";
import { apiTokens, memberships, teams, users } from "../../db/schema";
import type { Executor } from "../../lib/db";
import type { PrincipalRow } from "../team/team.repo";

export async function insertToken(
  db: Executor,
  token: { teamId: number; userId: number; name: string; tokenHash: string; tokenHint: string },
): Promise<number> {
  const [row] = await db.insert(apiTokens).values(token).$returningId();
  return row.id;
}

export async function listTokens(db: Executor, teamId: number, userId: number) {
  return db
    .select({
      id: apiTokens.id,
      name: apiTokens.name,
      hint: apiTokens.tokenHint,
      createdAt: apiTokens.createdAt,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
    })
    .from(apiTokens)
    .where(and(eq(apiTokens.teamId, teamId), eq(apiTokens.userId, userId)))
    .orderBy(desc(apiTokens.id));
}

export async function findToken(db: Executor, teamId: number, id: number) {
  const rows = await db
    .select({ id: apiTokens.id, userId: apiTokens.userId, name: apiTokens.name, revokedAt: apiTokens.revokedAt })
    .from(apiTokens)
    .where(and(eq(apiTokens.teamId, teamId), eq(apiTokens.id, id)))
    .limit(1);
  return rows[0] ?? null;
}

export async function revokeToken(db: Executor, id: number): Promise<void> {
  await db.update(apiTokens).set({ revokedAt: new Date() }).where(and(eq(apiTokens.id, id), isNull(apiTokens.revokedAt)));
}

/** The caller behind a live token: its user's current role in the token's team. */
export async function findTokenPrincipal(db: Executor, tokenHash: string): Promise<(PrincipalRow & { tokenId: number }) | null> {
  const rows = await db
    .select({
      tokenId: apiTokens.id,
      userId: users.id,
      email: users.email,
      name: users.name,
      teamId: teams.id,
      teamName: teams.name,
      role: memberships.role,
    })
    .from(apiTokens)
    .innerJoin(memberships, and(eq(memberships.teamId, apiTokens.teamId), eq(memberships.userId, apiTokens.userId)))
    .innerJoin(users, eq(users.id, apiTokens.userId))
    .innerJoin(teams, eq(teams.id, apiTokens.teamId))
    .where(and(eq(apiTokens.tokenHash, tokenHash), isNull(apiTokens.revokedAt), isNull(users.disabledAt)))
    .limit(1);
  return rows[0] ?? null;
}

export async function touchToken(db: Executor, id: number): Promise<void> {
  await db.update(apiTokens).set({ lastUsedAt: new Date() }).where(eq(apiTokens.id, id));
}
