import { z } from "zod";
import { IdSchema, TimestampSchema } from "./common";
import { IngestProgressSchema } from "./graphs";

export const QueuedRunSchema = z.object({
  id: IdSchema,
  graph: z.object({ id: IdSchema, name: z.string() }),
  createdBy: z.string().nullable(),
  createdAt: TimestampSchema,
});

export const QueuedIngestSchema = z.object({
  id: IdSchema,
  name: z.string(),
  status: z.enum(["queued", "ingesting"]),
  progress: IngestProgressSchema.nullable(),
  createdAt: TimestampSchema,
});

export const RunningRunSchema = z.object({
  id: IdSchema,
  graph: z.object({ id: IdSchema, name: z.string() }),
  iteration: z.number().int(),
  maxIterations: z.number().int(),
  residual: z.number().nullable(),
  tolerance: z.number(),
  /** 0..1: progress of log(residual) from the first residual toward the tolerance, or k / cap when larger. */
  fraction: z.number(),
  etaSeconds: z.number().nullable(),
  startedAt: TimestampSchema.nullable(),
});

/** One runner process as its heartbeat row shows it; `healthy` is false when the last beat is too old. */
export const WorkerHealthSchema = z.object({
  runnerId: z.string(),
  host: z.string(),
  pid: z.number().int(),
  threads: z.number().int(),
  busy: z.number().int(),
  rssBytes: z.number(),
  heapBytes: z.number(),
  currentRunId: IdSchema.nullable(),
  currentGraphId: IdSchema.nullable(),
  softwareVersion: z.string().nullable(),
  startedAt: TimestampSchema,
  lastBeatAt: TimestampSchema,
  ageSeconds: z.number(),
  healthy: z.boolean(),
});
export type WorkerHealth = z.infer<typeof WorkerHealthSchema>;

export const RecentItemSchema = z.object({
  id: IdSchema,
  action: z.string(),
  actor: z.string().nullable(),
  target: z.string().nullable(),
  createdAt: TimestampSchema,
});

export const OverviewSchema = z.object({
  queue: z.object({ runs: z.array(QueuedRunSchema), ingests: z.array(QueuedIngestSchema) }),
  running: z.array(RunningRunSchema),
  workers: z.array(WorkerHealthSchema),
  /** Graph, run and upload events of the team, newest first. */
  recent: z.array(RecentItemSchema),
  counts: z.object({ graphs: z.number().int(), runs: z.number().int(), finishedRuns: z.number().int() }),
});
export type Overview = z.infer<typeof OverviewSchema>;
