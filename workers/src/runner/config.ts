// The runner's settings: the shared environment (database, data directory, mail) plus its own STILLPOINT_RUNNER_*.
import { randomBytes } from "node:crypto";
import { readFileSync } from "node:fs";
import { availableParallelism, hostname } from "node:os";
import path from "node:path";
import { z } from "zod";
import { loadConfig, type Config } from "../../../api/src/config";
import type { DbSettings } from "../../../api/src/lib/db";
import { DEFAULT_RETRY, type RetryPolicy } from "../engine/shard-attempts";
import type { FaultKind } from "../tasks/rank-shard-task";

/** A test-only fault: the engine's plan, optionally limited to one run id. */
export interface RunnerFault {
  run?: number;
  shard: number;
  iteration: number;
  attempt: number;
  kind: FaultKind;
}

export interface RunnerConfig {
  env: Config["env"];
  db: DbSettings;
  /** Absolute data directory: uploads/, graphs/<id>/, runs/<id>/. */
  dataDir: string;
  /** Unique among live runners; a restarted runner with the same id takes its own stale claims back at once. */
  runnerId: string;
  threads: number;
  /** Idle wait between looks at the queue. */
  pollMs: number;
  heartbeatMs: number;
  /** A claim whose heartbeat is older than this may be taken over by another runner. */
  leaseMs: number;
  checkpointEvery: number;
  retry: RetryPolicy;
  faults: RunnerFault[];
  /** Work only for these teams (a dedicated runner); empty means every team. */
  teams: number[];
  /** How long stop() waits for an ingest in progress before handing it back to the queue. */
  stopGraceMs: number;
  mail: Config["mail"];
  /** Base of links in e-mails, e.g. http://localhost:8080. */
  publicUrl: string;
  logLevel: string;
  softwareVersion: string;
}

const FaultSchema = z.strictObject({
  run: z.number().int().positive().optional(),
  shard: z.number().int().min(0),
  iteration: z.number().int().min(1),
  attempt: z.number().int().min(1),
  kind: z.enum(["throw", "exit-worker", "hang"]),
});

const RetrySchema = z.strictObject({
  attempts: z.number().int().min(1).default(DEFAULT_RETRY.attempts),
  backoffMs: z.number().min(0).default(DEFAULT_RETRY.backoffMs),
  taskTimeoutMs: z.number().positive().default(DEFAULT_RETRY.taskTimeoutMs),
});

const jsonText = <T extends z.ZodType>(schema: T) =>
  z
    .string()
    .transform((text, ctx) => {
      try {
        return JSON.parse(text) as unknown;
      } catch {
        ctx.addIssue({ code: "custom", message: "must be JSON" });
        return z.NEVER;
      }
    })
    .pipe(schema);

const RunnerEnvSchema = z.object({
  STILLPOINT_RUNNER_ID: z.string().trim().min(1).max(128).optional(),
  STILLPOINT_RUNNER_THREADS: z.coerce.number().int().min(1).max(256).optional(),
  STILLPOINT_RUNNER_POLL_MS: z.coerce.number().int().min(10).default(500),
  STILLPOINT_RUNNER_HEARTBEAT_MS: z.coerce.number().int().min(50).default(2_000),
  STILLPOINT_RUNNER_LEASE_MS: z.coerce.number().int().min(200).default(30_000),
  STILLPOINT_RUNNER_CHECKPOINT_EVERY: z.coerce.number().int().min(1).default(10),
  STILLPOINT_RUNNER_STOP_GRACE_MS: z.coerce.number().int().min(0).default(10_000),
  STILLPOINT_RUNNER_RETRY: jsonText(RetrySchema).optional(),
  STILLPOINT_FAULTS: jsonText(z.array(FaultSchema)).optional(),
  STILLPOINT_TEST_FAULTS: z.enum(["0", "1"]).optional(),
  STILLPOINT_RUNNER_TEAMS: z
    .string()
    .regex(/^\d+(,\d+)*$/, "must be a comma-separated list of team ids")
    .transform((text) => text.split(",").map(Number))
    .optional(),
});

export function softwareVersion(): string {
  const file = path.resolve(import.meta.dirname, "../../../package.json");
  const pkg = JSON.parse(readFileSync(file, "utf8")) as { version?: string };
  return pkg.version ?? "0.0.0";
}

export function defaultRunnerId(): string {
  return `${hostname()}-${process.pid}-${randomBytes(3).toString("hex")}`;
}

/** Parses the environment once; invalid runner variables are listed together, like the API's settings. */
export function loadRunnerConfig(env: NodeJS.ProcessEnv = process.env): RunnerConfig {
  const base = loadConfig(env);
  const present = Object.fromEntries(Object.entries(env).filter(([, v]) => v !== undefined && v !== ""));
  const parsed = RunnerEnvSchema.safeParse(present);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Invalid runner environment:\n${lines.join("\n")}`);
  }
  const e = parsed.data;
  // Fault injection exists for the reliability tests only; a production runner ignores the variable.
  const faultsAllowed = base.env === "test" || e.STILLPOINT_TEST_FAULTS === "1";
  if (e.STILLPOINT_RUNNER_HEARTBEAT_MS * 2 > e.STILLPOINT_RUNNER_LEASE_MS) {
    throw new Error("Invalid runner environment:\n  STILLPOINT_RUNNER_LEASE_MS: must be at least twice the heartbeat interval");
  }
  return {
    env: base.env,
    db: base.db,
    dataDir: path.resolve(base.dataDir),
    runnerId: e.STILLPOINT_RUNNER_ID ?? defaultRunnerId(),
    threads: e.STILLPOINT_RUNNER_THREADS ?? availableParallelism(),
    pollMs: e.STILLPOINT_RUNNER_POLL_MS,
    heartbeatMs: e.STILLPOINT_RUNNER_HEARTBEAT_MS,
    leaseMs: e.STILLPOINT_RUNNER_LEASE_MS,
    checkpointEvery: e.STILLPOINT_RUNNER_CHECKPOINT_EVERY,
    retry: e.STILLPOINT_RUNNER_RETRY ?? DEFAULT_RETRY,
    faults: faultsAllowed ? (e.STILLPOINT_FAULTS ?? []) : [],
    teams: e.STILLPOINT_RUNNER_TEAMS ?? [],
    stopGraceMs: e.STILLPOINT_RUNNER_STOP_GRACE_MS,
    mail: base.mail,
    publicUrl: base.publicUrl ?? `http://localhost:${base.port}`,
    logLevel: base.logLevel,
    softwareVersion: softwareVersion(),
  };
}
