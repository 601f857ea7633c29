import { rm } from "node:fs/promises";
import {
  GraphOptionsSchema,
  GraphStatisticsSchema,
  IngestProgressSchema,
  RejectionSchema,
  type CreateGraph,
  type Created,
  type GraphDetail,
  type GraphOptions,
  type GraphPage,
  type GraphQuery,
  type GraphStatistics,
  type GraphSummary,
  type Rejection,
} from "../../../contracts/graphs";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { roleAtLeast } from "../../http/require-role";
import { dataPath, graphRelDir } from "../../lib/data-paths";
import { AppError, ERRORS } from "../../lib/errors";
import type { Executor } from "../../lib/db";
import { byPrincipal, recordActivity } from "../activity/activity.service";
import { findUpload } from "../uploads/uploads.repo";
import {
  countRuns,
  findGraph,
  insertGraph,
  listGraphs,
  listProblems,
  requeueGraph,
  softDeleteGraph,
  SORT_KEYS,
  type GraphListCursor,
  type GraphRow,
} from "./graphs.repo";

const PROBLEM_SAMPLE = 100;

type ListRow = Awaited<ReturnType<typeof listGraphs>>[number];

function encodeListCursor(cursor: GraphListCursor): string {
  return Buffer.from(JSON.stringify([cursor.value, cursor.id]), "utf8").toString("base64url");
}

function decodeListCursor(cursor: string | undefined, numeric: boolean): GraphListCursor | null {
  if (!cursor) return null;
  try {
    const parsed: unknown = JSON.parse(Buffer.from(cursor, "base64url").toString("utf8"));
    if (Array.isArray(parsed) && parsed.length === 2 && Number.isSafeInteger(parsed[1])) {
      const [value, id] = parsed as [unknown, number];
      if (numeric ? typeof value === "number" : typeof value === "string") return { value: value as string | number, id };
    }
  } catch {
    // falls through to the validation error
  }
  throw new AppError(ERRORS.validationFailed, { message: "The cursor is not valid for this sort order.", details: { field: "cursor" } });
}

function statisticsOf(graph: GraphRow): GraphStatistics | null {
  if (!graph.statistics) return null;
  const parsed = GraphStatisticsSchema.safeParse(graph.statistics);
  return parsed.success ? parsed.data : null;
}

export function graphOptionsOf(graph: GraphRow): GraphOptions {
  const parsed = GraphOptionsSchema.safeParse(graph.options);
  return parsed.success ? parsed.data : GraphOptionsSchema.parse({});
}

function rejectionOf(graph: GraphRow, filename: string | null): Rejection | null {
  if (graph.status !== "rejected") return null;
  const parsed = RejectionSchema.safeParse(graph.rejection);
  if (parsed.success) return parsed.data;
  const reason = graph.rejectReason ?? "The ingest refused the file.";
  return { code: "rejected", file: filename ?? "upload", line: null, reason, message: reason };
}

function toSummary(row: Omit<ListRow, "sortValue">): GraphSummary {
  const { graph } = row;
  const stats = statisticsOf(graph);
  return {
    id: graph.id,
    name: graph.name,
    status: graph.status,
    upload:
      graph.uploadId === null || row.uploadFilename === null
        ? null
        : { id: graph.uploadId, filename: row.uploadFilename, size: row.uploadSize, checksum: row.uploadChecksum },
    nodes: stats?.nodes ?? null,
    edges: stats?.edges ?? null,
    size: row.uploadSize,
    idKind: stats?.idKind ?? null,
    createdBy: graph.createdByUserId === null ? null : { userId: graph.createdByUserId, name: row.creatorName ?? "" },
    isDemo: graph.isDemo,
    createdAt: graph.createdAt.toISOString(),
    finishedAt: graph.finishedAt?.toISOString() ?? null,
  };
}

export async function getGraphPage(deps: AppDeps, principal: Principal, query: GraphQuery): Promise<GraphPage> {
  const key = SORT_KEYS[query.sort];
  const rows = await listGraphs(deps.db, principal.teamId, query, decodeListCursor(query.cursor, key.numeric), query.limit + 1);
  const page = rows.slice(0, query.limit);
  const last = page.at(-1);
  const nextCursor =
    rows.length > query.limit && last
      ? encodeListCursor({ value: key.numeric ? Number(last.sortValue) : String(last.sortValue), id: last.graph.id })
      : null;
  return { items: page.map(toSummary), nextCursor };
}

/** The graph if the caller's team owns it (and it is not deleted); 404 otherwise. */
export async function requireGraph(db: Executor, principal: Principal, id: number) {
  const row = await findGraph(db, principal.teamId, id);
  if (!row) throw new AppError(ERRORS.notFound, { message: "There is no such graph." });
  return row;
}

export async function getGraphDetail(deps: AppDeps, principal: Principal, id: number): Promise<GraphDetail> {
  const row = await requireGraph(deps.db, principal, id);
  const { graph } = row;
  const problems = await listProblems(deps.db, graph.id, PROBLEM_SAMPLE);
  const progress = IngestProgressSchema.safeParse(graph.progress);
  return {
    ...toSummary(row),
    options: graphOptionsOf(graph),
    statistics: statisticsOf(graph),
    progress: graph.status === "ingesting" && progress.success ? progress.data : null,
    rejection: rejectionOf(graph, row.uploadFilename),
    problems: problems.map((p) => ({ line: p.lineNumber, reason: p.reason, detail: p.detail, text: p.line })),
    fingerprint: graph.fingerprint ? (graph.fingerprint.includes(":") ? graph.fingerprint : `sha256:${graph.fingerprint}`) : null,
    runCount: await countRuns(deps.db, graph.id),
    ingestStartedAt: graph.ingestStartedAt?.toISOString() ?? null,
    updatedAt: graph.updatedAt.toISOString(),
  };
}

export async function createGraph(deps: AppDeps, principal: Principal, input: CreateGraph, ip: string | null): Promise<Created> {
  const upload = await findUpload(deps.db, principal.teamId, input.uploadId);
  if (!upload || upload.state === "aborted") throw new AppError(ERRORS.notFound, { message: "There is no such upload." });
  if (upload.state === "expired") {
    throw new AppError(ERRORS.uploadExpired, { message: "This upload was never finished and has been removed; upload the file again." });
  }
  if (upload.state !== "complete") {
    throw new AppError(ERRORS.uploadNotComplete, {
      message: `The upload has ${upload.offset} of ${upload.size ?? "?"} bytes; finish it first.`,
      details: { offset: upload.offset, size: upload.size },
    });
  }
  const id = await insertGraph(deps.db, {
    teamId: principal.teamId,
    uploadId: upload.id,
    createdByUserId: principal.userId,
    name: input.name,
    options: input.options,
  });
  await recordActivity(deps.db, {
    ...byPrincipal(principal, ip),
    action: "graph.created",
    target: `graph ${id} (${input.name})`,
    details: { uploadId: upload.id, options: input.options },
  });
  return { id };
}

function requireOwnerOrAdmin(principal: Principal, graph: GraphRow, what: string): void {
  if (graph.createdByUserId !== principal.userId && !roleAtLeast(principal.role, "admin")) {
    throw new AppError(ERRORS.forbidden, { message: `Only the graph's creator or an admin may ${what} it.` });
  }
}

/** Re-ingests the same upload: a rejected graph, or a ready one that no run uses yet. */
export async function retryGraph(
  deps: AppDeps,
  principal: Principal,
  id: number,
  options: GraphOptions | undefined,
  ip: string | null,
): Promise<Created> {
  const { graph } = await requireGraph(deps.db, principal, id);
  if (graph.uploadId === null) throw new AppError(ERRORS.invalidState, { message: "The graph's upload is gone; upload the file again." });
  if (graph.status === "ready" && (await countRuns(deps.db, graph.id)) > 0) {
    throw new AppError(ERRORS.invalidState, { message: "Runs use this graph; create a new graph from the upload instead." });
  }
  const next = options ?? graphOptionsOf(graph);
  const ok = await requeueGraph(deps.db, graph.id, next, ["rejected", "ready"]);
  if (!ok) {
    throw new AppError(ERRORS.invalidState, {
      message: `A ${graph.status} graph cannot be ingested again; wait until it is ready or rejected.`,
      details: { status: graph.status },
    });
  }
  if (graph.storagePath) await rm(dataPath(deps.config.dataDir, graph.storagePath), { recursive: true, force: true });
  await recordActivity(deps.db, {
    ...byPrincipal(principal, ip),
    action: "graph.retried",
    target: `graph ${graph.id} (${graph.name})`,
    details: { options: next },
  });
  return { id: graph.id };
}

export async function deleteGraph(deps: AppDeps, principal: Principal, id: number, ip: string | null): Promise<void> {
  const { graph } = await requireGraph(deps.db, principal, id);
  requireOwnerOrAdmin(principal, graph, "delete");
  if (graph.status === "ingesting") throw new AppError(ERRORS.invalidState, { message: "The graph is being ingested; wait until it is done." });
  const active = await countRuns(deps.db, graph.id, ["queued", "running"]);
  if (active > 0) throw new AppError(ERRORS.invalidState, { message: `${active} run(s) of this graph are queued or running; cancel them first.` });
  await softDeleteGraph(deps.db, graph.id);
  await rm(dataPath(deps.config.dataDir, graph.storagePath ?? graphRelDir(graph.id)), { recursive: true, force: true });
  await recordActivity(deps.db, { ...byPrincipal(principal, ip), action: "graph.deleted", target: `graph ${graph.id} (${graph.name})` });
}
