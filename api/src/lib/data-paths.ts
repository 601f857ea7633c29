import path from "node:path";
import type { ScoreFormat } from "../../contracts/runs";

/**
 * Layout of the data directory, shared by the HTTP server and the runner. Paths stored in the database
 * (`uploads.storage_path`, `graphs.storage_path`, `runs.outputs`) are relative to the data directory, so the
 * directory can move.
 *
 *   uploads/<tusId>              the uploaded bytes (tus file store), plus uploads/<tusId>.json (tus metadata)
 *   graphs/<graphId>/            the prepared graph store
 *   runs/<runId>/scores.csv      score files: node_id,score,rank in rank order; also scores.arrow and scores.parquet
 *   runs/<runId>/scores.index    the score index (ids sorted, scores, ranks, histogram) for lookup and compare
 *   runs/<runId>/checkpoint-*    checkpoints (runner-owned)
 */
export const DATA_LAYOUT = {
  uploads: "uploads",
  graphs: "graphs",
  runs: "runs",
} as const;

export const SCORE_FILE_NAMES: Record<ScoreFormat, string> = {
  csv: "scores.csv",
  arrow: "scores.arrow",
  parquet: "scores.parquet",
};

/** What the runner writes into `runs.outputs` when a run ends with scores. Paths are relative to the data dir. */
export interface RunOutputs {
  dir: string;
  files: { format: ScoreFormat; path: string; bytes: number }[];
  /** Number of ranked nodes (rows of each score file) and of top-k rows stored in `run_top`. */
  nodes: number;
  topK: number;
}

export function dataPath(dataDir: string, relative: string): string {
  const root = path.resolve(dataDir);
  const full = path.resolve(root, relative);
  // Stored paths come from our own rows; still refuse anything that leaves the data directory.
  if (full !== root && !full.startsWith(root + path.sep)) throw new Error(`path ${relative} leaves the data directory`);
  return full;
}

export const uploadsDir = (dataDir: string) => path.resolve(dataDir, DATA_LAYOUT.uploads);
export const uploadRelPath = (tusId: string) => `${DATA_LAYOUT.uploads}/${tusId}`;
export const graphRelDir = (graphId: number) => `${DATA_LAYOUT.graphs}/${graphId}`;
export const runRelDir = (runId: number) => `${DATA_LAYOUT.runs}/${runId}`;
export const scoreRelPath = (runId: number, format: ScoreFormat) => `${runRelDir(runId)}/${SCORE_FILE_NAMES[format]}`;
