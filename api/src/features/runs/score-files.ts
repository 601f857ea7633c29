import { createReadStream } from "node:fs";
import { stat } from "node:fs/promises";
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
