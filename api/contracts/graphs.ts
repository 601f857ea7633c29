import { z } from "zod";
import { IdParamSchema, IdSchema, plainNameSchema, TimestampSchema } from "./common";

export const GRAPH_STATUSES = ["queued", "ingesting", "ready", "rejected"] as const;
export const GraphStatusSchema = z.enum(GRAPH_STATUSES);
export type GraphStatus = z.infer<typeof GraphStatusSchema>;

/**
 * How to read an edge list. Defaults: directed, unweighted, self-loops dropped, duplicate edges merged (weights
 * summed), header and delimiter detected, no bad line tolerated. `directed: false` adds both arcs of every line.
 * @example { "directed": true, "weighted": false, "selfLoops": "drop", "duplicates": "merge", "header": "auto",
 *            "delimiter": "auto", "maxBadLines": 0 }
 */
export const GraphOptionsSchema = z.strictObject({
  directed: z.boolean().default(true),
  weighted: z.boolean().default(false),
  selfLoops: z.enum(["drop", "keep"]).default("drop"),
  duplicates: z.enum(["merge", "keep"]).default("merge"),
  header: z.union([z.literal("auto"), z.boolean()]).default("auto"),
  delimiter: z.enum(["auto", ",", "\t", " "]).default("auto"),
  /** Bad lines skipped before the graph is rejected. */
  maxBadLines: z.number().int().min(0).max(1_000_000_000).default(0),
});
export type GraphOptions = z.infer<typeof GraphOptionsSchema>;
export type GraphOptionsInput = z.input<typeof GraphOptionsSchema>;

export const GraphNameSchema = plainNameSchema("graph name", 200, "Name the graph.");

/** `POST /api/graphs` → 202 `{ id }`: the ingest is queued and runs on the worker pool. */
export const CreateGraphSchema = z.strictObject({
  uploadId: IdSchema,
  name: GraphNameSchema,
  options: GraphOptionsSchema.default(GraphOptionsSchema.parse({})),
});
export type CreateGraph = z.infer<typeof CreateGraphSchema>;
export type CreateGraphInput = z.input<typeof CreateGraphSchema>;

/** `POST /api/graphs/:id/retry`: ingest the same upload again, with new options when given. */
export const RetryGraphSchema = z.strictObject({ options: GraphOptionsSchema.optional() });
export type RetryGraph = z.infer<typeof RetryGraphSchema>;

export const CreatedSchema = z.object({ id: IdSchema });
export type Created = z.infer<typeof CreatedSchema>;

export const GraphParamsSchema = z.strictObject({ id: IdParamSchema });

/** Log-binned: bin 0 holds degree 0, bin k ≥ 1 holds degrees in [2^(k−1), 2^k − 1]. */
export const DegreeBinSchema = z.object({ min: z.number().int(), max: z.number().int(), count: z.number().int() });
export type DegreeBin = z.infer<typeof DegreeBinSchema>;

/** The validation report of a ready graph. Extra fields written by newer runners are passed through. */
export const GraphStatisticsSchema = z.looseObject({
  /** Physical lines read; data rows (good edge lines); comment, blank, header and bad lines. */
  lines: z.number().int(),
  rows: z.number().int(),
  commentLines: z.number().int(),
  blankLines: z.number().int(),
  headerLines: z.number().int(),
  badLines: z.number().int(),
  nodes: z.number().int(),
  edges: z.number().int(),
  selfLoops: z.number().int(),
  selfLoopsDropped: z.number().int(),
  duplicates: z.number().int(),
  danglingNodes: z.number().int(),
  idKind: z.enum(["integer", "string"]),
  weight: z.object({ min: z.number(), max: z.number() }).nullable(),
  weighted: z.boolean(),
  inDegree: z.array(DegreeBinSchema),
  outDegree: z.array(DegreeBinSchema),
  maxInDegree: z.number().int(),
  maxOutDegree: z.number().int(),
  format: z
    .object({ delimiter: z.string(), header: z.boolean(), columns: z.number().int(), gzip: z.boolean() })
    .partial()
    .optional(),
  bytesRead: z.number().optional(),
  warnings: z.array(z.string()).optional(),
});
export type GraphStatistics = z.infer<typeof GraphStatisticsSchema>;

/** Written by the runner a few times a second while the status is `ingesting`. */
export const IngestProgressSchema = z.object({
  phase: z.enum(["parse", "build", "store"]),
  bytesRead: z.number().nonnegative(),
  totalBytes: z.number().nonnegative(),
  rows: z.number().int().nonnegative(),
  rowsPerSecond: z.number().nonnegative(),
  updatedAt: TimestampSchema.optional(),
});
export type IngestProgress = z.infer<typeof IngestProgressSchema>;

/**
 * Why a graph was rejected: the file (its upload name), the first offending line when there is one, and the reason.
 * `code` is the ingest's stable code (`too-many-bad-lines`, `empty-file`, `no-edges`, `gzip-corrupt`, …).
 */
export const RejectionSchema = z.object({
  code: z.string(),
  file: z.string(),
  line: z.number().int().positive().nullable(),
  reason: z.string(),
  message: z.string(),
});
export type Rejection = z.infer<typeof RejectionSchema>;

/** One sampled bad line: 1-based physical line number, stable reason code, human detail, the text when kept. */
export const GraphProblemSchema = z.object({
  line: z.number().int().positive(),
  reason: z.string(),
  detail: z.string(),
  text: z.string(),
});
export type GraphProblem = z.infer<typeof GraphProblemSchema>;

export const GraphUploadRefSchema = z.object({
  id: IdSchema,
  filename: z.string(),
  size: z.number().int().nullable(),
  checksum: z.string().nullable(),
});

export const GraphSummarySchema = z.object({
  id: IdSchema,
  name: z.string(),
  status: GraphStatusSchema,
  upload: GraphUploadRefSchema.nullable(),
  nodes: z.number().int().nullable(),
  edges: z.number().int().nullable(),
  /** Bytes of the uploaded file. */
  size: z.number().int().nullable(),
  idKind: z.enum(["integer", "string"]).nullable(),
  createdBy: z.object({ userId: IdSchema, name: z.string() }).nullable(),
  isDemo: z.boolean(),
  createdAt: TimestampSchema,
  finishedAt: TimestampSchema.nullable(),
});
export type GraphSummary = z.infer<typeof GraphSummarySchema>;

export const GraphDetailSchema = GraphSummarySchema.extend({
  options: GraphOptionsSchema,
  statistics: GraphStatisticsSchema.nullable(),
  progress: IngestProgressSchema.nullable(),
  rejection: RejectionSchema.nullable(),
  /** The first sampled bad lines (at most 100), by line number. */
  problems: z.array(GraphProblemSchema),
  /** sha256 of the uploaded bytes, as `sha256:<hex>`. */
  fingerprint: z.string().nullable(),
  runCount: z.number().int().nonnegative(),
  ingestStartedAt: TimestampSchema.nullable(),
  updatedAt: TimestampSchema,
});
export type GraphDetail = z.infer<typeof GraphDetailSchema>;

export const GRAPH_SORTS = ["created", "name", "size", "nodes", "edges", "status"] as const;

/** Sorted by `sort` (default newest first); `q` matches the name or the file name; cursors are opaque. */
export const GraphQuerySchema = z.strictObject({
  cursor: z.string().max(400).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  sort: z.enum(GRAPH_SORTS).default("created"),
  order: z.enum(["asc", "desc"]).default("desc"),
  status: GraphStatusSchema.optional(),
  q: z.string().trim().max(200).optional(),
});
export type GraphQuery = z.infer<typeof GraphQuerySchema>;

export const GraphPageSchema = z.object({ items: z.array(GraphSummarySchema), nextCursor: z.string().nullable() });
export type GraphPage = z.infer<typeof GraphPageSchema>;
