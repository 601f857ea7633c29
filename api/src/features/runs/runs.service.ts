import { rm } from "node:fs/promises";
import type { Created } from "../../../contracts/graphs";
import {
  RunParametersSchema,
  type CreateRun,
  type IterationList,
  type RunAction,
  type RunDetail,
  type RunEventList,
  type RunPage,
  type RunParameters,
  type RunQuery,
  type RunSummary,
  type ShardList,
} from "../../../contracts/runs";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { roleAtLeast } from "../../http/require-role";
import { decodeCursor, encodeCursor } from "../../lib/cursor";
import { dataPath, graphRelDir, runRelDir } from "../../lib/data-paths";
import type { Executor } from "../../lib/db";
import { AppError, ERRORS } from "../../lib/errors";
import { byPrincipal, recordActivity } from "../activity/activity.service";
import { requireGraph } from "../graphs/graphs.service";
import { runProgress } from "./run-progress";
import {
  cancelQueuedRun,
  countActiveRuns,
  findRun,
  insertRun,
  insertRunEvent,
  iterationTotals,
  lastIterations,
  listEvents,
  listIterations,
  listRuns,
  listShards,
  requestCancel,
  requestRetry,
  softDeleteRun,
  teamQuotas,
  type RunRow,
} from "./runs.repo";
import { outputsOf } from "./score-files";
import { checkSeeds } from "./seed-check";

type RunJoin = NonNullable<Awaited<ReturnType<typeof findRun>>>;

export function parametersOf(run: RunRow): RunParameters {
  const parsed = RunParametersSchema.safeParse(run.parameters);
  if (parsed.success) return parsed.data;
  // Rows written by older versions may carry extra keys; keep what the contract knows.
  const known = Object.fromEntries(Object.entries(run.parameters).filter(([key]) => key in RunParametersSchema.shape));
  return RunParametersSchema.parse(known);
}

function graphCounts(statistics: Record<string, unknown> | null): { nodes: number | null; edges: number | null } {
  const num = (v: unknown) => (typeof v === "number" && Number.isFinite(v) ? v : null);
  return { nodes: num(statistics?.nodes), edges: num(statistics?.edges) };
}

function toSummary(row: RunJoin): RunSummary {
  const { run } = row;
  return {
    id: run.id,
    graph: { id: run.graphId, name: row.graphName },
    status: run.status,
    parameters: parametersOf(run),
    iterations: run.iterations,
    residual: run.finalResidual,
    errorBound: run.errorBound,
    stopReason: run.stopReason,
    statusReason: run.statusReason,
    notify: run.notify,
    createdBy: run.createdByUserId === null ? null : { userId: run.createdByUserId, name: row.creatorName ?? "" },
    cancelRequested: run.cancelRequestedAt !== null,
    retryRequested: run.retryRequestedAt !== null,
    isDemo: run.isDemo,
    createdAt: run.createdAt.toISOString(),
    startedAt: run.startedAt?.toISOString() ?? null,
    finishedAt: run.finishedAt?.toISOString() ?? null,
  };
}

/** The run if the caller's team owns it (and it is not deleted); 404 otherwise. */
export async function requireRun(db: Executor, principal: Principal, id: number): Promise<RunJoin> {
  const row = await findRun(db, principal.teamId, id);
  if (!row) throw new AppError(ERRORS.notFound, { message: "There is no such run." });
  return row;
}

async function checkConcurrency(deps: AppDeps, teamId: number): Promise<void> {
  const max = (await teamQuotas(deps.db, teamId)).maxConcurrentRuns;
  if (max === undefined) return;
  const active = await countActiveRuns(deps.db, teamId);
  if (active >= max) {
    throw new AppError(ERRORS.conflict, {
      message: `The team may have ${max} run(s) queued or running at once; ${active} are. Wait for one to finish.`,
      details: { maxConcurrentRuns: max, active },
    });
  }
}

export async function createRun(deps: AppDeps, principal: Principal, input: CreateRun, ip: string | null): Promise<Created> {
  const { graph } = await requireGraph(deps.db, principal, input.graphId);
  if (graph.status !== "ready") {
    throw new AppError(ERRORS.graphNotReady, { message: `The graph is ${graph.status}; runs need a ready graph.`, details: { status: graph.status } });
  }
  const { graphId, notify, ...parameters } = input;
  if (parameters.weighted && graph.statistics?.weighted !== true) {
    throw new AppError(ERRORS.validationFailed, {
      message: "The graph has no edge weights; run it unweighted or re-ingest with weighted: true.",
      details: { issues: [{ code: "custom", path: ["weighted"], message: "The graph has no edge weights." }] },
    });
  }
  if (parameters.teleport.kind === "seeds") {
    await checkSeeds(dataPath(deps.config.dataDir, graph.storagePath ?? graphRelDir(graph.id)), parameters.teleport.seeds);
  }
  await checkConcurrency(deps, principal.teamId);
  const id = await insertRun(deps.db, {
    teamId: principal.teamId,
    graphId,
    createdByUserId: principal.userId,
    parameters,
    notify,
    inputFingerprint: graph.fingerprint,
  });
  await insertRunEvent(deps.db, { teamId: principal.teamId, runId: id, kind: "queued", message: `Queued by ${principal.name}.` });
  await recordActivity(deps.db, {
    ...byPrincipal(principal, ip),
    action: "run.created",
    target: `run ${id} of graph ${graph.id} (${graph.name})`,
    details: { damping: parameters.damping, tolerance: parameters.tolerance, teleport: parameters.teleport.kind },
  });
  return { id };
}

export async function getRunPage(deps: AppDeps, principal: Principal, query: RunQuery): Promise<RunPage> {
  const rows = await listRuns(
    deps.db,
    principal.teamId,
    { graphId: query.graphId, status: query.status },
    decodeCursor(query.cursor),
    query.limit + 1,
  );
  const page = rows.slice(0, query.limit);
  const last = page.at(-1);
  return { items: page.map(toSummary), nextCursor: rows.length > query.limit && last ? encodeCursor(last.run.id) : null };
}

const PROGRESS_WINDOW = 11;

export async function getRunDetail(deps: AppDeps, principal: Principal, id: number): Promise<RunDetail> {
  const row = await requireRun(deps.db, principal, id);
  const { run } = row;
  const counts = graphCounts(row.graphStatistics);
  const parameters = parametersOf(run);
  const [recent, totals] = await Promise.all([lastIterations(deps.db, run.id, PROGRESS_WINDOW), iterationTotals(deps.db, run.id)]);
  const active = run.status === "running" || run.status === "queued";
  return {
    ...toSummary(row),
    graph: { id: run.graphId, name: row.graphName, ...counts },
    progress: runProgress(recent, totals, counts.edges, parameters.tolerance, active),
    timings: run.timings,
    inputFingerprint: run.inputFingerprint,
    softwareVersion: run.softwareVersion,
    files: (outputsOf(run)?.files ?? []).map((f) => ({ format: f.format, bytes: f.bytes, url: `/api/runs/${run.id}/scores.${f.format}` })),
    attempts: run.attempts,
    lastCheckpoint: run.lastCheckpointK,
    updatedAt: run.updatedAt.toISOString(),
  };
}

export async function getIterations(deps: AppDeps, principal: Principal, id: number, after: number): Promise<IterationList> {
  const { run } = await requireRun(deps.db, principal, id);
  const parameters = parametersOf(run);
  const items = await listIterations(deps.db, run.id, after);
  return { items, tolerance: parameters.tolerance, boundFactor: parameters.damping / (1 - parameters.damping) };
}

export async function getShards(deps: AppDeps, principal: Principal, id: number): Promise<ShardList> {
  const { run } = await requireRun(deps.db, principal, id);
  const rows = await listShards(deps.db, run.id);
  return {
    items: rows.map((s) => ({
      shard: s.shard,
      vertexStart: s.vertexStart,
      vertexEnd: s.vertexEnd,
      edgeCount: s.edgeCount,
      state: s.state,
      attempts: s.attempts,
      worker: s.worker,
      lastError: s.lastError,
      updatedAt: s.updatedAt.toISOString(),
    })),
  };
}

export async function getEvents(deps: AppDeps, principal: Principal, id: number, after: number, limit: number): Promise<RunEventList> {
  const { run } = await requireRun(deps.db, principal, id);
  const rows = await listEvents(deps.db, run.id, after, limit);
  return {
    items: rows.map((e) => ({ id: e.id, level: e.level, kind: e.kind, message: e.message, details: e.details, createdAt: e.createdAt.toISOString() })),
  };
}

export async function cancelRun(deps: AppDeps, principal: Principal, id: number, ip: string | null): Promise<RunAction> {
  const { run } = await requireRun(deps.db, principal, id);
  let status = run.status;
  if (await cancelQueuedRun(deps.db, run.id)) {
    status = "canceled";
    await insertRunEvent(deps.db, { teamId: run.teamId, runId: run.id, level: "warn", kind: "canceled", message: `Canceled by ${principal.name} before it started.` });
  } else if (await requestCancel(deps.db, run.id)) {
    status = "running";
    await insertRunEvent(deps.db, { teamId: run.teamId, runId: run.id, level: "warn", kind: "cancel-requested", message: `Cancel requested by ${principal.name}.` });
  } else {
    const current = await requireRun(deps.db, principal, id);
    throw new AppError(ERRORS.invalidState, {
      message: `A ${current.run.status} run cannot be canceled.`,
      details: { status: current.run.status },
    });
  }
  await recordActivity(deps.db, { ...byPrincipal(principal, ip), action: "run.canceled", target: `run ${run.id}` });
  return { id: run.id, status };
}

export async function retryRun(deps: AppDeps, principal: Principal, id: number, ip: string | null): Promise<RunAction> {
  const { run } = await requireRun(deps.db, principal, id);
  if (!(await requestRetry(deps.db, run.id))) {
    const why = run.retryRequestedAt ? "A retry is already requested." : `A ${run.status} run cannot be retried; only needs-attention and failed runs can.`;
    throw new AppError(ERRORS.invalidState, { message: why, details: { status: run.status } });
  }
  await insertRunEvent(deps.db, {
    teamId: run.teamId,
    runId: run.id,
    kind: "retry-requested",
    message: `Retry requested by ${principal.name}; the run resumes from its last checkpoint${run.lastCheckpointK === null ? "" : ` (iteration ${run.lastCheckpointK})`}.`,
  });
  await recordActivity(deps.db, { ...byPrincipal(principal, ip), action: "run.retried", target: `run ${run.id}` });
  return { id: run.id, status: run.status };
}

export async function deleteRun(deps: AppDeps, principal: Principal, id: number, ip: string | null): Promise<void> {
  const { run } = await requireRun(deps.db, principal, id);
  if (run.createdByUserId !== principal.userId && !roleAtLeast(principal.role, "admin")) {
    throw new AppError(ERRORS.forbidden, { message: "Only the run's submitter or an admin may delete it." });
  }
  if (run.status === "queued" || run.status === "running") {
    throw new AppError(ERRORS.invalidState, { message: "Cancel the run before deleting it.", details: { status: run.status } });
  }
  await softDeleteRun(deps.db, run.id);
  await rm(dataPath(deps.config.dataDir, outputsOf(run)?.dir || runRelDir(run.id)), { recursive: true, force: true });
  await recordActivity(deps.db, { ...byPrincipal(principal, ip), action: "run.deleted", target: `run ${run.id}` });
}
