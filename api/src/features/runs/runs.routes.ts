import { CreatedSchema } from "../../../contracts/graphs";
import {
  CreateRunSchema,
  HistogramSchema,
  IterationListSchema,
  IterationQuerySchema,
  NodeLookupSchema,
  RunActionSchema,
  RunDetailSchema,
  RunEventListSchema,
  RunEventQuerySchema,
  RunNodeParamsSchema,
  RunPageSchema,
  RunParamsSchema,
  RunQuerySchema,
  SCORE_FORMATS,
  ShardListSchema,
  TopPageSchema,
  TopQuerySchema,
  type ScoreFormat,
} from "../../../contracts/runs";
import { defineRawRoute, defineRoute, type RouteDef } from "../../http/route";
import { safeFileStem, sendFileWithRanges } from "./download";
import { getHistogram, getTop, lookupNode } from "./results.service";
import { cancelRun, createRun, deleteRun, getEvents, getIterations, getRunDetail, getRunPage, getShards, requireRun, retryRun } from "./runs.service";
import { streamRun } from "./run-stream";
import { scoreFile } from "./score-files";

const CONTENT_TYPES: Record<ScoreFormat, string> = {
  csv: "text/csv; charset=utf-8",
  arrow: "application/vnd.apache.arrow.file",
  parquet: "application/vnd.apache.parquet",
};

function downloadRoute(format: ScoreFormat): RouteDef {
  return defineRawRoute({
    method: "get",
    path: `/api/runs/:id/scores.${format}`,
    access: "viewer",
    tag: "results",
    summary: `The ${format} score file (node_id, score, rank in rank order); supports Range requests (206, 416)`,
    params: RunParamsSchema,
    produces: { [CONTENT_TYPES[format].split(";")[0]]: `score file (${format})` },
    handler: async ({ deps, principal, params, req, res }) => {
      const { run, graphName } = await requireRun(deps.db, principal, params.id);
      const file = await scoreFile(deps.config.dataDir, run, format);
      const filename = `${safeFileStem(graphName)}-run${run.id}-scores.${format}`;
      await sendFileWithRanges(req, res, file, { contentType: CONTENT_TYPES[format], filename });
    },
  });
}

export const runsRoutes = [
  defineRoute({
    method: "post",
    path: "/api/runs",
    access: "engineer",
    tag: "runs",
    summary: "Submit a ranking run on a ready graph; it is queued (202) and runs on the worker pool. Unknown seed ids → 400 unknown_seeds",
    body: CreateRunSchema,
    response: CreatedSchema,
    status: 202,
    audit: "by-service",
    handler: ({ deps, principal, body, ip }) => createRun(deps, principal, body, ip),
  }),
  defineRoute({
    method: "get",
    path: "/api/runs",
    access: "viewer",
    tag: "runs",
    summary: "The team's runs, newest first, filtered by graph and status, cursor-paginated",
    query: RunQuerySchema,
    response: RunPageSchema,
    handler: ({ deps, principal, query }) => getRunPage(deps, principal, query),
  }),
  defineRoute({
    method: "get",
    path: "/api/runs/:id",
    access: "viewer",
    tag: "runs",
    summary: "One run: status, iteration, residual, certified error bound, stop reason, live progress and ETA, files",
    params: RunParamsSchema,
    response: RunDetailSchema,
    handler: ({ deps, principal, params }) => getRunDetail(deps, principal, params.id),
  }),
  defineRoute({
    method: "delete",
    path: "/api/runs/:id",
    access: "engineer",
    tag: "runs",
    summary: "Delete a finished run and its score files (submitter or admin)",
    params: RunParamsSchema,
    audit: "by-service",
    handler: ({ deps, principal, params, ip }) => deleteRun(deps, principal, params.id, ip),
  }),
  defineRoute({
    method: "get",
    path: "/api/runs/:id/iterations",
    access: "viewer",
    tag: "runs",
    summary: "Residual history: k, L1 residual, dangling mass and time per iteration (`after` for polling)",
    params: RunParamsSchema,
    query: IterationQuerySchema,
    response: IterationListSchema,
    handler: ({ deps, principal, params, query }) => getIterations(deps, principal, params.id, query.after),
  }),
  defineRoute({
    method: "get",
    path: "/api/runs/:id/shards",
    access: "viewer",
    tag: "runs",
    summary: "Shard states: vertex range, edges, state, attempts, worker, last error",
    params: RunParamsSchema,
    response: ShardListSchema,
    handler: ({ deps, principal, params }) => getShards(deps, principal, params.id),
  }),
  defineRoute({
    method: "get",
    path: "/api/runs/:id/events",
    access: "viewer",
    tag: "runs",
    summary: "The run's event log, oldest first (`after` = last event id seen)",
    params: RunParamsSchema,
    query: RunEventQuerySchema,
    response: RunEventListSchema,
    handler: ({ deps, principal, params, query }) => getEvents(deps, principal, params.id, query.after, query.limit),
  }),
  defineRawRoute({
    method: "get",
    path: "/api/runs/:id/events/stream",
    access: "viewer",
    tag: "runs",
    summary: "Server-sent events: `run` (detail on change), `iteration`, `event`, then `end` when the run has finished",
    params: RunParamsSchema,
    produces: { "text/event-stream": "run progress as server-sent events" },
    handler: ({ deps, principal, params, req, res }) => streamRun(deps, principal, params.id, req, res),
  }),
  defineRoute({
    method: "post",
    path: "/api/runs/:id/cancel",
    access: "engineer",
    tag: "runs",
    summary: "Cancel: a queued run ends canceled at once; a running one stops at its next iteration",
    params: RunParamsSchema,
    response: RunActionSchema,
    status: 202,
    audit: "by-service",
    handler: ({ deps, principal, params, ip }) => cancelRun(deps, principal, params.id, ip),
  }),
  defineRoute({
    method: "post",
    path: "/api/runs/:id/retry",
    access: "engineer",
    tag: "runs",
    summary: "Retry a needs-attention or failed run: it resumes from its last checkpoint, keeping its residual history",
    params: RunParamsSchema,
    response: RunActionSchema,
    status: 202,
    audit: "by-service",
    handler: ({ deps, principal, params, ip }) => retryRun(deps, principal, params.id, ip),
  }),
  defineRoute({
    method: "get",
    path: "/api/runs/:id/top",
    access: "viewer",
    tag: "results",
    summary: "Top-k, paged by rank; each position says whether it is certain given the error bound",
    params: RunParamsSchema,
    query: TopQuerySchema,
    response: TopPageSchema,
    handler: ({ deps, principal, params, query }) => getTop(deps, principal, params.id, query),
  }),
  defineRoute({
    method: "get",
    path: "/api/runs/:id/nodes/:nodeId",
    access: "viewer",
    tag: "results",
    summary: "Rank and score of any node by its original id (URL-encode string ids)",
    params: RunNodeParamsSchema,
    response: NodeLookupSchema,
    handler: ({ deps, principal, params }) => lookupNode(deps, principal, params.id, params.nodeId),
  }),
  defineRoute({
    method: "get",
    path: "/api/runs/:id/histogram",
    access: "viewer",
    tag: "results",
    summary: "Score distribution over logarithmic bins (four per decade)",
    params: RunParamsSchema,
    response: HistogramSchema,
    handler: ({ deps, principal, params }) => getHistogram(deps, principal, params.id),
  }),
  ...SCORE_FORMATS.map(downloadRoute),
];
