import { and, asc, desc, eq, inArray, isNull, like, or, sql, type SQL } from "drizzle-orm";
import type { GraphQuery } from "../../../contracts/graphs";
import { graphProblems, graphs, runs, uploads, users } from "../../db/schema";
import type { Executor } from "../../lib/db";

export type GraphRow = typeof graphs.$inferSelect;

const nodesExpr = sql<number>`coalesce(cast(json_value(${graphs.statistics}, '$.nodes') as unsigned), 0)`;
const edgesExpr = sql<number>`coalesce(cast(json_value(${graphs.statistics}, '$.edges') as unsigned), 0)`;
const sizeExpr = sql<number>`coalesce(${uploads.size}, 0)`;

/** The sort key of each list order; ties are broken by id in the same direction. */
export const SORT_KEYS = {
  created: { expr: graphs.id, numeric: true },
  name: { expr: graphs.name, numeric: false },
  size: { expr: sizeExpr, numeric: true },
  nodes: { expr: nodesExpr, numeric: true },
  edges: { expr: edgesExpr, numeric: true },
  status: { expr: graphs.status, numeric: false },
} as const;

export interface GraphListCursor {
  value: string | number;
  id: number;
}

const listColumns = {
  graph: graphs,
  uploadFilename: uploads.filename,
  uploadSize: uploads.size,
  uploadChecksum: uploads.checksum,
  creatorName: users.name,
};

export async function listGraphs(db: Executor, teamId: number, query: GraphQuery, after: GraphListCursor | null, limit: number) {
  const key = SORT_KEYS[query.sort];
  const desc_ = query.order === "desc";
  const filters: (SQL | undefined)[] = [eq(graphs.teamId, teamId), isNull(graphs.deletedAt)];
  if (query.status) filters.push(eq(graphs.status, query.status));
  if (query.q) {
    const pattern = `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    filters.push(or(like(graphs.name, pattern), like(uploads.filename, pattern)));
  }
  if (after) {
    const op = sql.raw(desc_ ? "<" : ">");
    filters.push(sql`(${key.expr} ${op} ${after.value} or (${key.expr} = ${after.value} and ${graphs.id} ${op} ${after.id}))`);
  }
  const direction = desc_ ? desc : asc;
  return db
    .select({ ...listColumns, sortValue: sql<string | number>`${key.expr}` })
    .from(graphs)
    .leftJoin(uploads, eq(uploads.id, graphs.uploadId))
    .leftJoin(users, eq(users.id, graphs.createdByUserId))
    .where(and(...filters))
    .orderBy(direction(key.expr), direction(graphs.id))
    .limit(limit);
}

export async function findGraph(db: Executor, teamId: number, id: number) {
  const rows = await db
    .select(listColumns)
    .from(graphs)
    .leftJoin(uploads, eq(uploads.id, graphs.uploadId))
    .leftJoin(users, eq(users.id, graphs.createdByUserId))
    .where(and(eq(graphs.teamId, teamId), eq(graphs.id, id), isNull(graphs.deletedAt)))
    .limit(1);
  return rows[0] ?? null;
}

export async function listProblems(db: Executor, graphId: number, limit: number) {
  return db
    .select()
    .from(graphProblems)
    .where(eq(graphProblems.graphId, graphId))
    .orderBy(asc(graphProblems.lineNumber), asc(graphProblems.id))
    .limit(limit);
}

export async function countRuns(db: Executor, graphId: number, statuses?: readonly (typeof runs.$inferSelect)["status"][]) {
  const rows = await db
    .select({ n: sql<number>`count(*)` })
    .from(runs)
    .where(and(eq(runs.graphId, graphId), isNull(runs.deletedAt), statuses ? inArray(runs.status, [...statuses]) : undefined));
  return Number(rows[0]?.n ?? 0);
}

export async function insertGraph(
  db: Executor,
  row: Pick<GraphRow, "teamId" | "uploadId" | "createdByUserId" | "name" | "options">,
): Promise<number> {
  const [inserted] = await db.insert(graphs).values({ ...row, status: "queued" }).$returningId();
  return inserted.id;
}

/** Back to the queue with new options; what the last ingest left behind is cleared. Only from the given statuses. */
export async function requeueGraph(db: Executor, id: number, options: Record<string, unknown>, from: GraphRow["status"][]): Promise<boolean> {
  const [result] = await db
    .update(graphs)
    .set({
      options,
      status: "queued",
      statistics: null,
      progress: null,
      rejection: null,
      rejectReason: null,
      fingerprint: null,
      claimedBy: null,
      heartbeatAt: null,
      ingestStartedAt: null,
      finishedAt: null,
    })
    .where(and(eq(graphs.id, id), inArray(graphs.status, from)));
  if (result.affectedRows === 0) return false;
  await db.delete(graphProblems).where(eq(graphProblems.graphId, id));
  return true;
}

export async function softDeleteGraph(db: Executor, id: number): Promise<void> {
  await db.update(graphs).set({ deletedAt: new Date() }).where(eq(graphs.id, id));
}
