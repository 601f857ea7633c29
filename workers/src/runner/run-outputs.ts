// A finished run's results: score files (CSV, Arrow IPC, Parquet) in the run's folder and the top-k in MariaDB.
import { mkdir, stat } from "node:fs/promises";
import path from "node:path";
import { SCORE_FILE_NAMES, scoreRelPath, type RunOutputs } from "../../../api/src/lib/data-paths";
import type { NodeIds } from "../core/graph";
import { topK } from "../output/rank-order";
import { writeScores, type ScoreFormat } from "../output/write-scores";
import { SCORE_INDEX_FILE } from "../score-index/format";
import { writeScoreIndex } from "../score-index/write";
import { runDirPath, type RunnerContext } from "./context";
import { replaceTop } from "./run-repo";
import { idText } from "./seeds";

export const SCORE_FORMATS: readonly ScoreFormat[] = ["csv", "arrow", "parquet"];

export type { RunOutputs };

export async function writeRunOutputs(
  ctx: RunnerContext,
  run: { id: number; teamId: number },
  ids: NodeIds,
  scores: Float64Array,
  k: number,
  meta: Record<string, string>,
): Promise<RunOutputs> {
  const dir = runDirPath(run.id);
  const abs = path.resolve(ctx.config.dataDir, dir);
  await mkdir(abs, { recursive: true });
  const files: RunOutputs["files"] = [];
  for (const format of SCORE_FORMATS) {
    const file = path.join(abs, SCORE_FILE_NAMES[format]);
    await writeScores(file, format, ids, scores, meta, { rowPool: ctx.pool });
    files.push({ format, path: scoreRelPath(run.id, format), bytes: (await stat(file)).size });
  }
  // Lookup, compare and the histogram read this; the API rebuilds it from the Arrow file if it is ever missing.
  await writeScoreIndex(path.join(abs, SCORE_INDEX_FILE), { ids, scores });
  const order = topK(scores, Math.min(k, scores.length));
  const rows = Array.from(order, (v, i) => ({ rank: i + 1, nodeId: idText(ids, v), score: scores[v] }));
  await ctx.retry("store top-k", () => replaceTop(ctx.db, run.teamId, run.id, rows));
  return { dir, files, nodes: scores.length, topK: rows.length };
}
