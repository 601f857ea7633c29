import { index, json, mediumtext, mysqlEnum, mysqlTable, text, varchar } from "drizzle-orm/mysql-core";
import { apiTokens, teams, users } from "./accounts";
import { createdAt, id, ref } from "./columns";

export const EMAIL_STATES = ["captured", "sent", "failed"] as const;

/** Outgoing mail: every message the development fake SMTP captured, or the delivery record in production. */
export const emails = mysqlTable(
  "emails",
  {
    id: id(),
    teamId: ref("team_id").references(() => teams.id, { onDelete: "set null" }),
    messageId: varchar("message_id", { length: 255 }),
    fromAddress: varchar("from_address", { length: 320 }).notNull(),
    toAddress: varchar("to_address", { length: 1024 }).notNull(),
    subject: varchar("subject", { length: 255 }).notNull(),
    textBody: mediumtext("text_body"),
    htmlBody: mediumtext("html_body"),
    state: mysqlEnum("state", EMAIL_STATES).notNull(),
    error: text("error"),
    createdAt: createdAt(),
  },
  (t) => [index("emails_created_idx").on(t.createdAt)],
);

/** The audit log. `team_id` is empty only for events no team can own (a failed sign-in for an unknown address). */
export const activity = mysqlTable(
  "activity",
  {
    id: id(),
    teamId: ref("team_id").references(() => teams.id, { onDelete: "cascade" }),
    actorUserId: ref("actor_user_id").references(() => users.id, { onDelete: "set null" }),
    actorTokenId: ref("actor_token_id").references(() => apiTokens.id, { onDelete: "set null" }),
    action: varchar("action", { length: 64 }).notNull(),
    target: varchar("target", { length: 255 }),
    details: json("details").$type<Record<string, unknown>>(),
    ip: varchar("ip", { length: 64 }),
    createdAt: createdAt(),
  },
  (t) => [index("activity_team_idx").on(t.teamId, t.id)],
);
