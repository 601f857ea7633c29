import { createReadStream } from "node:fs";
import { readFile, stat } from "node:fs/promises";
import { tableFromIPC } from "apache-arrow";
import type { ScoreFormat } from "../../../contracts/runs";
import { dataPath, type RunOutputs } from "../../lib/data-paths";
import { AppError, ERRORS } from "../../lib/errors";
import type { RunRow } from "./runs.repo";

export function outputsOf(run: RunRow): RunOutputs | null {
  const outputs = run.outputs as Partial<RunOutputs> | null;
  if (!outputs || !Array.isArray(outputs.files)) return null;
  return { dir: outputs.dir ?? "", files: outputs.files, nodes: Number(outputs.nodes ?? 0), topK: Number(outputs.topK ?? 0) };
}

export interface ScoreFileOnDisk {
  path: string;
  bytes: number;
  mtime: Date;
}

/** The run's score file in one format, checked on disk; 409 when the run has none. */
export async function scoreFile(dataDir: string, run: RunRow, format: ScoreFormat): Promise<ScoreFileOnDisk> {
  const entry = outputsOf(run)?.files.find((f) => f.format === format);
  if (!entry) {
    throw new AppError(ERRORS.scoresNotAvailable, {
      message: run.status === "queued" || run.status === "running" ? "The run has not finished yet." : `This run has no ${format} score file.`,
      details: { status: run.status },
    });
  }
  const full = dataPath(dataDir, entry.path);
  const info = await stat(full).catch(() => null);
  if (!info) throw new AppError(ERRORS.scoresNotAvailable, { message: "The score file is missing on disk." });
  return { path: full, bytes: info.size, mtime: info.mtime };
}

function csvField(s: string): string {
  return /[",\r\n]/.test(s) ? `"${s.replaceAll('"', '""')}"` : s;
}

/**
 * Finds one node's row in a score CSV (`node_id,score,rank`, one row per node) by scanning bytes for
 * "\n<id>," — no string per line, constant memory. Null when the id is not in the file.
 */
export async function findCsvRow(file: string, nodeId: string): Promise<{ score: number; rank: number } | null> {
  const needle = Buffer.from(`\n${csvField(nodeId)},`, "utf8");
  let carry: Buffer = Buffer.alloc(0);
  for await (const chunk of createReadStream(file, { highWaterMark: 1 << 20 }) as AsyncIterable<Buffer>) {
    const buf = carry.length > 0 ? Buffer.concat([carry, chunk]) : chunk;
    const at = buf.indexOf(needle);
    if (at >= 0) {
      const end = buf.indexOf(10, at + needle.length);
      if (end >= 0) {
        const [score, rank] = buf.subarray(at + needle.length, end).toString("utf8").split(",");
        return { score: Number(score), rank: Number(rank) };
      }
      carry = buf.subarray(at);
      continue;
    }
    carry = buf.subarray(Math.max(0, buf.length - (needle.length - 1)));
  }
  return null;
}

/** The first `rows` data rows of a score CSV (rank order), without reading the rest. */
export async function csvHead(file: string, rows: number): Promise<{ nodeId: string; score: number; rank: number }[]> {
  const out: { nodeId: string; score: number; rank: number }[] = [];
  let pending = "";
  let header = true;
  const stream = createReadStream(file, { encoding: "utf8", highWaterMark: 1 << 16 });
  try {
    for await (const chunk of stream as AsyncIterable<string>) {
      const lines = (pending + chunk).split("\n");
      pending = lines.pop() ?? "";
      for (const line of lines) {
        if (header) {
          header = false;
          continue;
        }
        const rankAt = line.lastIndexOf(",");
        const scoreAt = line.lastIndexOf(",", rankAt - 1);
        let id = line.slice(0, scoreAt);
        if (id.startsWith('"')) id = id.slice(1, -1).replaceAll('""', '"');
        out.push({ nodeId: id, score: Number(line.slice(scoreAt + 1, rankAt)), rank: Number(line.slice(rankAt + 1)) });
        if (out.length >= rows) return out;
      }
    }
  } finally {
    stream.destroy();
  }
  return out;
}

/** Node ids (as text) and scores in rank order: row i has rank i + 1. */
export interface ScoreColumns {
  ids: string[];
  scores: Float64Array;
}

const CACHE_LIMIT = 4;
const CACHE_MAX_NODES = 2_000_000;
const cache = new Map<string, Promise<ScoreColumns>>();

async function readColumns(file: string): Promise<ScoreColumns> {
  const table = tableFromIPC(await readFile(file));
  const idColumn = table.getChild("node_id");
  const scoreColumn = table.getChild("score");
  if (!idColumn || !scoreColumn) throw new Error(`${file}: not a score file (node_id and score columns expected)`);
  const scores = Float64Array.from(scoreColumn.toArray() as Float64Array);
  const rawIds = idColumn.toArray() as ArrayLike<bigint | string>;
  const ids = new Array<string>(rawIds.length);
  for (let i = 0; i < rawIds.length; i++) ids[i] = String(rawIds[i]);
  return { ids, scores };
}

/** Reads a finished run's Arrow score file; score files never change once written, so a few are kept in memory. */
export async function scoreColumns(dataDir: string, run: RunRow): Promise<ScoreColumns> {
  const file = await scoreFile(dataDir, run, "arrow");
  const key = `${file.path}:${file.bytes}:${file.mtime.getTime()}`;
  const hit = cache.get(key);
  if (hit) {
    cache.delete(key);
    cache.set(key, hit);
    return hit;
  }
  const loading = readColumns(file.path);
  if ((outputsOf(run)?.nodes ?? 0) <= CACHE_MAX_NODES) {
    cache.set(key, loading);
    loading.catch(() => cache.delete(key));
    while (cache.size > CACHE_LIMIT) cache.delete(cache.keys().next().value as string);
  }
  return loading;
}
