import { and, eq, isNull } from "drizzle-orm";
import { passwordResets } from "../../db/schema";
import type { Executor } from "../../lib/db";

export async function insertPasswordReset(
  db: Executor,
  reset: { userId: number; tokenHash: string; expiresAt: Date; requestedIp: string | null },
): Promise<void> {
  await db.insert(passwordResets).values(reset);
}

export async function findPasswordReset(db: Executor, tokenHash: string) {
  const rows = await db.select().from(passwordResets).where(eq(passwordResets.tokenHash, tokenHash)).limit(1);
  return rows[0] ?? null;
}

/** Marks a reset as used; false when another request used it first. */
export async function claimPasswordReset(db: Executor, id: number): Promise<boolean> {
  const [result] = await db
    .update(passwordResets)
    .set({ usedAt: new Date() })
    .where(and(eq(passwordResets.id, id), isNull(passwordResets.usedAt)));
  return result.affectedRows === 1;
}

/** Retires every other open reset link of the user once one is used. */
export async function retireOpenResets(db: Executor, userId: number): Promise<void> {
  await db
    .update(passwordResets)
    .set({ usedAt: new Date() })
    .where(and(eq(passwordResets.userId, userId), isNull(passwordResets.usedAt)));
}
