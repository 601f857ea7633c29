import { bigint, boolean, index, json, mysqlEnum, mysqlTable, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { teams, users } from "./accounts";
import { at, createdAt, id, ref, updatedAt } from "./columns";

export const UPLOAD_STATES = ["uploading", "complete", "aborted", "expired"] as const;
export const GRAPH_STATUSES = ["queued", "ingesting", "ready", "rejected"] as const;

/** One tus upload: its state mirrors the tus store so the portal can list and resume uploads. */
export const uploads = mysqlTable(
  "uploads",
  {
    id: id(),
    teamId: ref("team_id").notNull().references(() => teams.id, { onDelete: "cascade" }),
    userId: ref("user_id").references(() => users.id, { onDelete: "set null" }),
    tusId: varchar("tus_id", { length: 128 }).notNull(),
    filename: varchar("filename", { length: 255 }).notNull(),
    contentType: varchar("content_type", { length: 127 }),
    size: bigint("size", { mode: "number", unsigned: true }),
    offset: bigint("offset", { mode: "number", unsigned: true }).notNull().default(0),
    checksum: varchar("checksum", { length: 128 }),
    metadata: json("metadata").$type<Record<string, string>>().notNull().default({}),
    state: mysqlEnum("state", UPLOAD_STATES).notNull().default("uploading"),
    storagePath: varchar("storage_path", { length: 1024 }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
    completedAt: at("completed_at"),
  },
  (t) => [uniqueIndex("uploads_tus_id_unique").on(t.tusId), index("uploads_team_idx").on(t.teamId, t.createdAt)],
);

export const graphs = mysqlTable(
  "graphs",
  {
    id: id(),
    teamId: ref("team_id").notNull().references(() => teams.id, { onDelete: "cascade" }),
    uploadId: ref("upload_id").references(() => uploads.id, { onDelete: "set null" }),
    createdByUserId: ref("created_by_user_id").references(() => users.id, { onDelete: "set null" }),
    name: varchar("name", { length: 200 }).notNull(),
    options: json("options").$type<Record<string, unknown>>().notNull(),
    status: mysqlEnum("status", GRAPH_STATUSES).notNull().default("queued"),
    statistics: json("statistics").$type<Record<string, unknown>>(),
    storagePath: varchar("storage_path", { length: 1024 }),
    fingerprint: varchar("fingerprint", { length: 128 }),
    rejectReason: text("reject_reason"),
    /** Where and why the ingest refused the file: `{ code, file, line, reason, message }` (see contracts/graphs.ts). */
    rejection: json("rejection").$type<Record<string, unknown>>(),
    /** Live ingest progress, rewritten a few times a second: `{ phase, bytesRead, totalBytes, rows, rowsPerSecond }`. */
    progress: json("progress").$type<Record<string, unknown>>(),
    claimedBy: varchar("claimed_by", { length: 128 }),
    heartbeatAt: at("heartbeat_at"),
    isDemo: boolean("is_demo").notNull().default(false),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
    ingestStartedAt: at("ingest_started_at"),
    finishedAt: at("finished_at"),
    deletedAt: at("deleted_at"),
  },
  (t) => [index("graphs_team_idx").on(t.teamId, t.createdAt), index("graphs_status_idx").on(t.status)],
);

/** A sample of bad input lines found while validating an upload. */
export const graphProblems = mysqlTable(
  "graph_problems",
  {
    id: id(),
    teamId: ref("team_id").notNull().references(() => teams.id, { onDelete: "cascade" }),
    graphId: ref("graph_id").notNull().references(() => graphs.id, { onDelete: "cascade" }),
    lineNumber: bigint("line_number", { mode: "number", unsigned: true }).notNull(),
    /** A stable reason code (e.g. `wrong-column-count`). */
    reason: varchar("reason", { length: 255 }).notNull(),
    /** Human detail, e.g. "expected 2 columns, found 3". */
    detail: varchar("detail", { length: 255 }).notNull().default(""),
    /** The line's text as read (cut to the column size), empty when it could not be kept. */
    line: varchar("line", { length: 1024 }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("graph_problems_graph_idx").on(t.graphId, t.lineNumber)],
);
