import { z } from "zod";
import { IdParamSchema, IdSchema, TimestampSchema } from "./common";

export const RUN_STATUSES = ["queued", "running", "converged", "not-converged", "needs-attention", "canceled", "failed"] as const;
export const RunStatusSchema = z.enum(RUN_STATUSES);
export type RunStatus = z.infer<typeof RunStatusSchema>;

/** Statuses a run never leaves on its own (a retry takes needs-attention and failed runs back to queued). */
export const FINISHED_RUN_STATUSES: readonly RunStatus[] = ["converged", "not-converged", "needs-attention", "canceled", "failed"];
export const RETRYABLE_RUN_STATUSES: readonly RunStatus[] = ["needs-attention", "failed"];

export const SHARD_STATES = ["queued", "running", "done", "retrying", "failed"] as const;
export const ShardStateSchema = z.enum(SHARD_STATES);

export const MAX_ITERATIONS_LIMIT = 10_000;
export const MAX_SHARDS = 256;
export const MAX_TOP_K = 10_000;
export const MAX_SEEDS = 100_000;

/** An original node id as it appears in the edge list; integers may be given as JSON numbers. */
export const NodeIdSchema = z
  .union([z.string().trim().min(1, "Enter a node id.").max(1024), z.number().int().nonnegative()])
  .transform((value) => String(value));

export const SeedSchema = z.strictObject({
  node: NodeIdSchema,
  weight: z.number().positive("Seed weights must be positive.").finite().default(1),
});
export type Seed = z.infer<typeof SeedSchema>;

/** Uniform teleport (1/n each), or personalized: the seeds' weights normalized to sum 1, zero elsewhere. */
export const TeleportSchema = z.discriminatedUnion("kind", [
  z.strictObject({ kind: z.literal("uniform") }),
  z.strictObject({ kind: z.literal("seeds"), seeds: z.array(SeedSchema).min(1, "Give at least one seed.").max(MAX_SEEDS) }),
]);
export type Teleport = z.infer<typeof TeleportSchema>;

/**
 * Everything that defines a run besides its graph. Damping α (teleport probability 1 − α), tolerance on the L1
 * residual ‖x_{k+1} − x_k‖₁, iteration cap; dangling mass goes to the teleport vector (default) or uniformly.
 * `shards: "auto"` lets the runner choose.
 */
export const RunParametersSchema = z.strictObject({
  damping: z.number().gt(0, "Damping must be above 0.").lt(1, "Damping must be below 1.").default(0.85),
  tolerance: z.number().positive("Tolerance must be above 0.").lt(1).default(1e-9),
  maxIterations: z.number().int().min(1).max(MAX_ITERATIONS_LIMIT).default(200),
  dangling: z.enum(["teleport", "uniform"]).default("teleport"),
  teleport: TeleportSchema.default({ kind: "uniform" }),
  weighted: z.boolean().default(false),
  shards: z.union([z.literal("auto"), z.number().int().min(1).max(MAX_SHARDS)]).default("auto"),
  topK: z.number().int().min(1).max(MAX_TOP_K).default(100),
});
export type RunParameters = z.infer<typeof RunParametersSchema>;

/**
 * `POST /api/runs` → 202 `{ id }`. Seed ids unknown to the graph give 400 `unknown_seeds` with
 * `details.unknown` listing them.
 * @example { "graphId": 4, "damping": 0.85, "tolerance": 1e-9, "maxIterations": 200, "dangling": "teleport",
 *            "teleport": { "kind": "seeds", "seeds": [{ "node": "https://council.kestrel.example/", "weight": 1 }] },
 *            "weighted": false, "shards": "auto", "topK": 100, "notify": true }
 */
export const CreateRunSchema = RunParametersSchema.extend({
  graphId: IdSchema,
  notify: z.boolean().default(false),
});
export type CreateRun = z.infer<typeof CreateRunSchema>;
export type CreateRunInput = z.input<typeof CreateRunSchema>;

export const RunParamsSchema = z.strictObject({ id: IdParamSchema });
export const RunNodeParamsSchema = z.strictObject({ id: IdParamSchema, nodeId: z.string().min(1).max(1024) });

export const RunTimingsSchema = z.looseObject({
  queuedMs: z.number().optional(),
  loadMs: z.number().optional(),
  setupMs: z.number().optional(),
  /** The iterations' own times summed (every attempt of a retried run), and their mean. */
  iterateMs: z.number().optional(),
  perIterationMs: z.number().optional(),
  writeMs: z.number().optional(),
  totalMs: z.number().optional(),
});

export const ScoreFileSchema = z.object({ format: z.enum(["csv", "arrow", "parquet"]), bytes: z.number().int(), url: z.string() });

export const RunSummarySchema = z.object({
  id: IdSchema,
  graph: z.object({ id: IdSchema, name: z.string() }),
  status: RunStatusSchema,
  parameters: RunParametersSchema,
  /** Iterations done so far (the last k with a residual). */
  iterations: z.number().int().nonnegative(),
  /** The last L1 residual, and the certified bound α/(1−α)·r on ‖x − π‖₁. */
  residual: z.number().nullable(),
  errorBound: z.number().nullable(),
  stopReason: z.string().nullable(),
  /** A sentence for people: why the run failed, needs attention or was canceled. */
  statusReason: z.string().nullable(),
  notify: z.boolean(),
  createdBy: z.object({ userId: IdSchema, name: z.string() }).nullable(),
  cancelRequested: z.boolean(),
  retryRequested: z.boolean(),
  isDemo: z.boolean(),
  createdAt: TimestampSchema,
  startedAt: TimestampSchema.nullable(),
  finishedAt: TimestampSchema.nullable(),
});
export type RunSummary = z.infer<typeof RunSummarySchema>;

/** Live figures derived from the iteration history (null until two iterations exist). */
export const RunProgressSchema = z.object({
  /** Mean ms per iteration over the recorded history. */
  perIterationMs: z.number().nullable(),
  edgesPerSecond: z.number().nullable(),
  /** Observed contraction rate: geometric mean of r_k / r_{k−1} over the last iterations (≤ α in theory). */
  contractionRate: z.number().nullable(),
  /** Iterations still needed to reach the tolerance at that rate, and the time they take. */
  iterationsLeft: z.number().int().nullable(),
  etaSeconds: z.number().nullable(),
});
export type RunProgress = z.infer<typeof RunProgressSchema>;

export const RunDetailSchema = RunSummarySchema.extend({
  graph: z.object({ id: IdSchema, name: z.string(), nodes: z.number().int().nullable(), edges: z.number().int().nullable() }),
  progress: RunProgressSchema,
  timings: RunTimingsSchema.nullable(),
  inputFingerprint: z.string().nullable(),
  softwareVersion: z.string().nullable(),
  /** Score files available for download (empty until the run finishes with scores). */
  files: z.array(ScoreFileSchema),
  /** Restarts by a runner (first claim, reclaims after a lost lease, retries). */
  attempts: z.number().int().nonnegative(),
  lastCheckpoint: z.number().int().nullable(),
  updatedAt: TimestampSchema,
});
export type RunDetail = z.infer<typeof RunDetailSchema>;

export const RunQuerySchema = z.strictObject({
  cursor: z.string().max(200).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  graphId: z.coerce.number().int().positive().optional(),
  status: RunStatusSchema.optional(),
});
export type RunQuery = z.infer<typeof RunQuerySchema>;

export const RunPageSchema = z.object({ items: z.array(RunSummarySchema), nextCursor: z.string().nullable() });
export type RunPage = z.infer<typeof RunPageSchema>;

/** Iteration k: residual r_k = ‖x_k − x_{k−1}‖₁, dangling mass D_k, wall time of that step. */
export const IterationSchema = z.object({
  k: z.number().int(),
  residual: z.number(),
  danglingMass: z.number().nullable(),
  elapsedMs: z.number(),
});
export type Iteration = z.infer<typeof IterationSchema>;

/** `after`: only iterations with k > after (for polling). */
export const IterationQuerySchema = z.strictObject({ after: z.coerce.number().int().min(-1).default(-1) });

export const IterationListSchema = z.object({
  items: z.array(IterationSchema),
  tolerance: z.number(),
  /** α/(1−α): multiply a residual to get its certified error bound. */
  boundFactor: z.number(),
});
export type IterationList = z.infer<typeof IterationListSchema>;

export const ShardSchema = z.object({
  shard: z.number().int().nonnegative(),
  vertexStart: z.number().int(),
  vertexEnd: z.number().int(),
  edgeCount: z.number().int(),
  state: ShardStateSchema,
  attempts: z.number().int(),
  worker: z.string().nullable(),
  lastError: z.string().nullable(),
  updatedAt: TimestampSchema,
});
export type Shard = z.infer<typeof ShardSchema>;
export const ShardListSchema = z.object({ items: z.array(ShardSchema) });
export type ShardList = z.infer<typeof ShardListSchema>;

export const RunEventSchema = z.object({
  id: IdSchema,
  level: z.enum(["info", "warn", "error"]),
  kind: z.string(),
  message: z.string(),
  details: z.record(z.string(), z.unknown()).nullable(),
  createdAt: TimestampSchema,
});
export type RunEvent = z.infer<typeof RunEventSchema>;

/** Oldest first; `after` is the last event id already seen (for polling). */
export const RunEventQuerySchema = z.strictObject({
  after: z.coerce.number().int().min(0).default(0),
  limit: z.coerce.number().int().min(1).max(500).default(200),
});
export const RunEventListSchema = z.object({ items: z.array(RunEventSchema) });
export type RunEventList = z.infer<typeof RunEventListSchema>;

export const TopQuerySchema = z.strictObject({
  cursor: z.string().max(200).optional(),
  limit: z.coerce.number().int().min(1).max(1000).default(50),
});

/**
 * One top-k position. `certain`: the scores on both sides are farther than twice the error bound away, so no
 * position swap with a neighbour is possible within the bound.
 */
export const TopEntrySchema = z.object({
  rank: z.number().int().positive(),
  nodeId: z.string(),
  score: z.number(),
  certain: z.boolean(),
});
export type TopEntry = z.infer<typeof TopEntrySchema>;

export const TopPageSchema = z.object({
  items: z.array(TopEntrySchema),
  nextCursor: z.string().nullable(),
  /** Positions stored (min of topK and the node count). */
  total: z.number().int(),
  errorBound: z.number().nullable(),
  /** Ranks 1..certainPrefix are all certain. */
  certainPrefix: z.number().int(),
});
export type TopPage = z.infer<typeof TopPageSchema>;

export const NodeLookupSchema = z.object({
  nodeId: z.string(),
  rank: z.number().int().positive(),
  score: z.number(),
  /** Number of nodes ranked. */
  of: z.number().int(),
  /** Fraction of nodes with a strictly lower rank number (0 = top). */
  percentile: z.number(),
});
export type NodeLookup = z.infer<typeof NodeLookupSchema>;

/** Score distribution over log10 bins [10^e, 10^(e+step)); exact zeros are counted apart. */
export const HistogramSchema = z.object({
  bins: z.array(z.object({ min: z.number(), max: z.number(), count: z.number().int() })),
  zeros: z.number().int(),
  nodes: z.number().int(),
  minScore: z.number().nullable(),
  maxScore: z.number().nullable(),
});
export type Histogram = z.infer<typeof HistogramSchema>;

export const RunActionSchema = z.object({ id: IdSchema, status: RunStatusSchema });
export type RunAction = z.infer<typeof RunActionSchema>;

export const SCORE_FORMATS = ["csv", "arrow", "parquet"] as const;
export type ScoreFormat = (typeof SCORE_FORMATS)[number];
