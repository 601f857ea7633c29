import { boolean, customType, index, int, mediumtext, mysqlEnum, mysqlTable, char, json, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { at, createdAt, id, ref, ROLES, updatedAt } from "./columns";

export const users = mysqlTable(
  "users",
  {
    id: id(),
    email: varchar("email", { length: 254 }).notNull(),
    name: varchar("name", { length: 120 }).notNull(),
    passwordHash: varchar("password_hash", { length: 255 }).notNull(),
    /** Run e-mails (finished, failed, needs attention); each run also has its own flag. */
    notify: boolean("notify").notNull().default(true),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
    disabledAt: at("disabled_at"),
  },
  (t) => [uniqueIndex("users_email_unique").on(t.email)],
);

export interface TeamQuotas {
  maxStorageBytes?: number;
  maxConcurrentRuns?: number;
}

export const teams = mysqlTable("teams", {
  id: id(),
  name: varchar("name", { length: 120 }).notNull(),
  quotas: json("quotas").$type<TeamQuotas>().notNull().default({}),
  createdAt: createdAt(),
  updatedAt: updatedAt(),
});

export const memberships = mysqlTable(
  "memberships",
  {
    id: id(),
    teamId: ref("team_id").notNull().references(() => teams.id, { onDelete: "cascade" }),
    userId: ref("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    role: mysqlEnum("role", ROLES).notNull(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("memberships_team_user_unique").on(t.teamId, t.userId), index("memberships_user_idx").on(t.userId)],
);

// Session ids are case-sensitive; the column keeps a binary collation like the session store expects.
const sessionId = customType<{ data: string }>({
  dataType: () => "varchar(128) COLLATE utf8mb4_bin",
});

/** Owned by the express-mysql-session store (fixed column names); created here so migrations own the DDL. */
export const sessions = mysqlTable("sessions", {
  sessionId: sessionId("session_id").primaryKey(),
  expires: int("expires", { unsigned: true }).notNull(),
  data: mediumtext("data"),
});

export const apiTokens = mysqlTable(
  "api_tokens",
  {
    id: id(),
    teamId: ref("team_id").notNull().references(() => teams.id, { onDelete: "cascade" }),
    userId: ref("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    name: varchar("name", { length: 80 }).notNull(),
    tokenHash: char("token_hash", { length: 64 }).notNull(),
    tokenHint: varchar("token_hint", { length: 16 }).notNull(),
    createdAt: createdAt(),
    lastUsedAt: at("last_used_at"),
    revokedAt: at("revoked_at"),
  },
  (t) => [uniqueIndex("api_tokens_hash_unique").on(t.tokenHash), index("api_tokens_team_user_idx").on(t.teamId, t.userId)],
);

export const invites = mysqlTable(
  "invites",
  {
    id: id(),
    teamId: ref("team_id").notNull().references(() => teams.id, { onDelete: "cascade" }),
    email: varchar("email", { length: 254 }).notNull(),
    role: mysqlEnum("role", ROLES).notNull(),
    tokenHash: char("token_hash", { length: 64 }).notNull(),
    invitedByUserId: ref("invited_by_user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    expiresAt: at("expires_at").notNull(),
    acceptedAt: at("accepted_at"),
    acceptedUserId: ref("accepted_user_id").references(() => users.id, { onDelete: "set null" }),
    revokedAt: at("revoked_at"),
  },
  (t) => [uniqueIndex("invites_hash_unique").on(t.tokenHash), index("invites_team_idx").on(t.teamId)],
);

export const passwordResets = mysqlTable(
  "password_resets",
  {
    id: id(),
    userId: ref("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    tokenHash: char("token_hash", { length: 64 }).notNull(),
    createdAt: createdAt(),
    expiresAt: at("expires_at").notNull(),
    usedAt: at("used_at"),
    requestedIp: varchar("requested_ip", { length: 64 }),
  },
  (t) => [uniqueIndex("password_resets_hash_unique").on(t.tokenHash), index("password_resets_user_idx").on(t.userId)],
);
