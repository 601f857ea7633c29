import { sql } from "drizzle-orm";
import type { Executor } from "../../lib/db";

export async function pingDatabase(db: Executor): Promise<void> {
  await db.execute(sql`SELECT 1`);
}
