import { MAX_TOP_K, type Histogram, type NodeLookup, type TopPage } from "../../../contracts/runs";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { decodeCursor, encodeCursor } from "../../lib/cursor";
import { AppError, ERRORS } from "../../lib/errors";
import { requireRun } from "./runs.service";
import { topByNode, topRows, type RunRow } from "./runs.repo";
import { withScoreIndex } from "./score-index";
import { csvHead, outputsOf, scoreFile } from "./score-files";
import { certainPositions, certainPrefix } from "./top-certainty";

async function scoreBelowTop(deps: AppDeps, run: RunRow, total: number): Promise<number | null | undefined> {
  const nodes = outputsOf(run)?.nodes ?? 0;
  if (total >= nodes) return null;
  try {
    const file = await scoreFile(deps.config.dataDir, run, "csv");
    const rows = await csvHead(file.path, total + 1);
    return rows[total]?.score;
  } catch {
    return undefined;
  }
}

export async function getTop(deps: AppDeps, principal: Principal, id: number, query: { cursor?: string; limit: number }): Promise<TopPage> {
  const { run } = await requireRun(deps.db, principal, id);
  const all = await topRows(deps.db, run.id, 1, MAX_TOP_K);
  const total = all.length;
  const next = total > 0 ? await scoreBelowTop(deps, run, total) : null;
  const certain = certainPositions(
    all.map((r) => r.score),
    run.errorBound,
    next,
  );
  const after = decodeCursor(query.cursor) ?? 0;
  const page = all.filter((r) => r.rank > after).slice(0, query.limit);
  const last = page.at(-1);
  return {
    items: page.map((r) => ({ rank: r.rank, nodeId: r.nodeId, score: r.score, certain: certain[r.rank - 1] ?? false })),
    nextCursor: last && last.rank < total ? encodeCursor(last.rank) : null,
    total,
    errorBound: run.errorBound,
    certainPrefix: certainPrefix(certain),
  };
}

function canonicalId(nodeId: string, idKind: unknown): string {
  if (idKind === "integer" && /^\d{1,20}$/.test(nodeId)) return BigInt(nodeId).toString();
  return nodeId;
}

export async function lookupNode(deps: AppDeps, principal: Principal, id: number, rawNodeId: string): Promise<NodeLookup> {
  const row = await requireRun(deps.db, principal, id);
  const { run } = row;
  const nodes = outputsOf(run)?.nodes ?? 0;
  const nodeId = canonicalId(rawNodeId, row.graphStatistics?.idKind);
  // The top-k rows answer most lookups without touching the index (and without building one for an older run).
  const hit = (await topByNode(deps.db, run.id, nodeId)) ?? (await withScoreIndex(deps.config.dataDir, run, (index) => index.lookup(nodeId)));
  if (!hit) throw new AppError(ERRORS.notFound, { message: `Node ${JSON.stringify(nodeId)} is not in this run's graph.`, details: { nodeId } });
  const of = nodes || hit.rank;
  return { nodeId, rank: hit.rank, score: hit.score, of, percentile: of > 0 ? (hit.rank - 1) / of : 0 };
}

export async function getHistogram(deps: AppDeps, principal: Principal, id: number): Promise<Histogram> {
  const { run } = await requireRun(deps.db, principal, id);
  return withScoreIndex(deps.config.dataDir, run, async (index) => index.histogram);
}
