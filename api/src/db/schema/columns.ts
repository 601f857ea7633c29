import { sql } from "drizzle-orm";
import { bigint, timestamp } from "drizzle-orm/mysql-core";

// `serial()` emits SQL that MariaDB rejects; every key is an explicit unsigned bigint.
export const id = () => bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey();

export const ref = (name: string) => bigint(name, { mode: "number", unsigned: true });

export const at = (name: string) => timestamp(name, { fsp: 3, mode: "date" });

const NOW_MS = sql`CURRENT_TIMESTAMP(3)`;

export const createdAt = () => at("created_at").notNull().default(NOW_MS);

export const updatedAt = () => at("updated_at").notNull().default(NOW_MS).onUpdateNow();

export const ROLES = ["admin", "engineer", "viewer"] as const;
