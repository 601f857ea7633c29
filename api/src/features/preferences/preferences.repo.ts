import { eq } from "drizzle-orm";
import { users } from "../../db/schema";
import type { Executor } from "../../lib/db";

export async function findNotify(db: Executor, userId: number): Promise<boolean> {
  const rows = await db.select({ notify: users.notify }).from(users).where(eq(users.id, userId)).limit(1);
  return rows[0]?.notify ?? true;
}

export async function setNotify(db: Executor, userId: number, notify: boolean): Promise<void> {
  await db.update(users).set({ notify }).where(eq(users.id, userId));
}
