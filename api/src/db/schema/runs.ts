import {
  bigint,
  boolean,
  double,
  index,
  int,
  json,
  mysqlEnum,
  mysqlTable,
  text,
  uniqueIndex,
  varchar,
} from "drizzle-orm/mysql-core";
import { teams, users } from "./accounts";
import { at, createdAt, id, ref, updatedAt } from "./columns";
import { graphs } from "./graphs";

export const RUN_STATUSES = ["queued", "running", "converged", "not-converged", "needs-attention", "canceled", "failed"] as const;
export const SHARD_STATES = ["queued", "running", "done", "retrying", "failed"] as const;
export const EVENT_LEVELS = ["info", "warn", "error"] as const;

export const runs = mysqlTable(
  "runs",
  {
    id: id(),
    teamId: ref("team_id").notNull().references(() => teams.id, { onDelete: "cascade" }),
    graphId: ref("graph_id").notNull().references(() => graphs.id, { onDelete: "cascade" }),
    createdByUserId: ref("created_by_user_id").references(() => users.id, { onDelete: "set null" }),
    parameters: json("parameters").$type<Record<string, unknown>>().notNull(),
    status: mysqlEnum("status", RUN_STATUSES).notNull().default("queued"),
    statusReason: text("status_reason"),
    stopReason: varchar("stop_reason", { length: 64 }),
    iterations: int("iterations", { unsigned: true }).notNull().default(0),
    finalResidual: double("final_residual"),
    errorBound: double("error_bound"),
    timings: json("timings").$type<Record<string, number>>(),
    outputs: json("outputs").$type<Record<string, unknown>>(),
    inputFingerprint: varchar("input_fingerprint", { length: 128 }),
    softwareVersion: varchar("software_version", { length: 64 }),
    notify: boolean("notify").notNull().default(false),
    isDemo: boolean("is_demo").notNull().default(false),
    claimedBy: varchar("claimed_by", { length: 128 }),
    heartbeatAt: at("heartbeat_at"),
    cancelRequestedAt: at("cancel_requested_at"),
    /** Set by `POST /api/runs/:id/retry` on a needs-attention or failed run (status unchanged); the runner claims it,
     *  resumes from the last checkpoint and clears it. */
    retryRequestedAt: at("retry_requested_at"),
    /** How many times the run was (re)started by a runner: claims, reclaims after an expired lease, retries. */
    attempts: int("attempts", { unsigned: true }).notNull().default(0),
    lastCheckpointK: int("last_checkpoint_k", { unsigned: true }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
    startedAt: at("started_at"),
    finishedAt: at("finished_at"),
    deletedAt: at("deleted_at"),
  },
  (t) => [
    index("runs_team_idx").on(t.teamId, t.createdAt),
    index("runs_status_idx").on(t.status, t.createdAt),
    index("runs_graph_idx").on(t.graphId),
  ],
);

export const runIterations = mysqlTable(
  "run_iterations",
  {
    id: id(),
    teamId: ref("team_id").notNull().references(() => teams.id, { onDelete: "cascade" }),
    runId: ref("run_id").notNull().references(() => runs.id, { onDelete: "cascade" }),
    k: int("k", { unsigned: true }).notNull(),
    residual: double("residual").notNull(),
    danglingMass: double("dangling_mass"),
    elapsedMs: double("elapsed_ms").notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("run_iterations_run_k_unique").on(t.runId, t.k)],
);

export const runShards = mysqlTable(
  "run_shards",
  {
    id: id(),
    teamId: ref("team_id").notNull().references(() => teams.id, { onDelete: "cascade" }),
    runId: ref("run_id").notNull().references(() => runs.id, { onDelete: "cascade" }),
    shard: int("shard", { unsigned: true }).notNull(),
    vertexStart: bigint("vertex_start", { mode: "number", unsigned: true }).notNull(),
    vertexEnd: bigint("vertex_end", { mode: "number", unsigned: true }).notNull(),
    edgeCount: bigint("edge_count", { mode: "number", unsigned: true }).notNull().default(0),
    state: mysqlEnum("state", SHARD_STATES).notNull().default("queued"),
    attempts: int("attempts", { unsigned: true }).notNull().default(0),
    worker: varchar("worker", { length: 128 }),
    lastError: text("last_error"),
    nextAttemptAt: at("next_attempt_at"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
    startedAt: at("started_at"),
    finishedAt: at("finished_at"),
  },
  (t) => [uniqueIndex("run_shards_run_shard_unique").on(t.runId, t.shard)],
);

export const runEvents = mysqlTable(
  "run_events",
  {
    id: id(),
    teamId: ref("team_id").notNull().references(() => teams.id, { onDelete: "cascade" }),
    runId: ref("run_id").notNull().references(() => runs.id, { onDelete: "cascade" }),
    level: mysqlEnum("level", EVENT_LEVELS).notNull().default("info"),
    kind: varchar("kind", { length: 64 }).notNull(),
    message: text("message").notNull(),
    details: json("details").$type<Record<string, unknown>>(),
    createdAt: createdAt(),
  },
  (t) => [index("run_events_run_idx").on(t.runId, t.id)],
);

/** The top-k of a finished run, one row per position; the full ranking lives in the score files. */
export const runTop = mysqlTable(
  "run_top",
  {
    id: id(),
    teamId: ref("team_id").notNull().references(() => teams.id, { onDelete: "cascade" }),
    runId: ref("run_id").notNull().references(() => runs.id, { onDelete: "cascade" }),
    rank: int("rank", { unsigned: true }).notNull(),
    /** The original id, as written in the score file. */
    nodeId: varchar("node_id", { length: 1024 }).notNull(),
    score: double("score").notNull(),
  },
  (t) => [uniqueIndex("run_top_run_rank_unique").on(t.runId, t.rank)],
);

/** One row per runner process, rewritten every few seconds; the Overview page reads pool health from it. */
export const runnerHeartbeats = mysqlTable(
  "runner_heartbeats",
  {
    id: id(),
    runnerId: varchar("runner_id", { length: 128 }).notNull(),
    host: varchar("host", { length: 255 }).notNull(),
    pid: int("pid", { unsigned: true }).notNull(),
    threads: int("threads", { unsigned: true }).notNull(),
    busy: int("busy", { unsigned: true }).notNull().default(0),
    rssBytes: bigint("rss_bytes", { mode: "number", unsigned: true }).notNull().default(0),
    heapBytes: bigint("heap_bytes", { mode: "number", unsigned: true }).notNull().default(0),
    currentRunId: ref("current_run_id"),
    currentGraphId: ref("current_graph_id"),
    softwareVersion: varchar("software_version", { length: 64 }),
    startedAt: at("started_at").notNull(),
    beatAt: at("beat_at").notNull(),
    stoppedAt: at("stopped_at"),
  },
  (t) => [uniqueIndex("runner_heartbeats_runner_unique").on(t.runnerId), index("runner_heartbeats_beat_idx").on(t.beatAt)],
);
