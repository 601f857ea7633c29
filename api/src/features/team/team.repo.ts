import { and, asc, eq, isNull, sql } from "drizzle-orm";
import type { Role } from "../../../contracts/common";
import { memberships, teams, users } from "../../db/schema";
import type { Executor } from "../../lib/db";

export type UserRow = typeof users.$inferSelect;

export interface PrincipalRow {
  userId: number;
  email: string;
  name: string;
  teamId: number;
  teamName: string;
  role: Role;
}

export async function findUserByEmail(db: Executor, email: string): Promise<UserRow | null> {
  const rows = await db.select().from(users).where(eq(users.email, email)).limit(1);
  return rows[0] ?? null;
}

export async function findUserById(db: Executor, id: number): Promise<UserRow | null> {
  const rows = await db.select().from(users).where(eq(users.id, id)).limit(1);
  return rows[0] ?? null;
}

export async function insertUser(db: Executor, user: { email: string; name: string; passwordHash: string }): Promise<number> {
  const [row] = await db.insert(users).values(user).$returningId();
  return row.id;
}

export async function updateUserPassword(db: Executor, userId: number, passwordHash: string): Promise<void> {
  await db.update(users).set({ passwordHash }).where(eq(users.id, userId));
}

export async function findTeamByName(db: Executor, name: string): Promise<{ id: number; name: string } | null> {
  const rows = await db.select({ id: teams.id, name: teams.name }).from(teams).where(eq(teams.name, name)).limit(1);
  return rows[0] ?? null;
}

export async function insertTeam(db: Executor, name: string): Promise<number> {
  const [row] = await db.insert(teams).values({ name }).$returningId();
  return row.id;
}

const principalColumns = {
  userId: users.id,
  email: users.email,
  name: users.name,
  teamId: teams.id,
  teamName: teams.name,
  role: memberships.role,
};

/** The user's membership in one team, or null when the user is disabled or not (any more) a member. */
export async function findPrincipalRow(db: Executor, userId: number, teamId: number): Promise<PrincipalRow | null> {
  const rows = await db
    .select(principalColumns)
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .innerJoin(teams, eq(teams.id, memberships.teamId))
    .where(and(eq(memberships.userId, userId), eq(memberships.teamId, teamId), isNull(users.disabledAt)))
    .limit(1);
  return rows[0] ?? null;
}

/** The team a user lands in at sign-in: their oldest membership. */
export async function findFirstMembership(db: Executor, userId: number): Promise<PrincipalRow | null> {
  const rows = await db
    .select(principalColumns)
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .innerJoin(teams, eq(teams.id, memberships.teamId))
    .where(and(eq(memberships.userId, userId), isNull(users.disabledAt)))
    .orderBy(asc(memberships.id))
    .limit(1);
  return rows[0] ?? null;
}

export async function listMembers(db: Executor, teamId: number) {
  return db
    .select({ userId: users.id, email: users.email, name: users.name, role: memberships.role, joinedAt: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.teamId, teamId))
    .orderBy(asc(users.name), asc(users.id));
}

export async function findRole(db: Executor, teamId: number, userId: number): Promise<Role | null> {
  const rows = await db
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)))
    .limit(1);
  return rows[0]?.role ?? null;
}

/** Adds the user to the team, or sets the role when they are already a member. */
export async function upsertMembership(db: Executor, teamId: number, userId: number, role: Role): Promise<void> {
  await db.insert(memberships).values({ teamId, userId, role }).onDuplicateKeyUpdate({ set: { role } });
}

/** Locks the team's admin rows (for a last-admin check inside a transaction) and counts them. */
export async function lockAdminCount(tx: Executor, teamId: number): Promise<number> {
  const rows = await tx
    .select({ userId: memberships.userId })
    .from(memberships)
    .where(and(eq(memberships.teamId, teamId), eq(memberships.role, "admin")))
    .for("update");
  return rows.length;
}

export async function setRole(db: Executor, teamId: number, userId: number, role: Role): Promise<void> {
  await db
    .update(memberships)
    .set({ role })
    .where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
}

export async function deleteMembership(db: Executor, teamId: number, userId: number): Promise<void> {
  await db.delete(memberships).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
}

/** Ends every stored session of a user (the store keeps the session as JSON text). */
export async function deleteSessionsOfUser(db: Executor, userId: number): Promise<void> {
  await db.execute(sql`DELETE FROM sessions WHERE JSON_VALUE(data, '$.userId') = ${userId}`);
}
