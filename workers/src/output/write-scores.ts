// Score files: CSV (streamed), Arrow IPC file and Parquet (ZSTD), one row per node in rank order, written atomically.
import { tableToIPC } from "apache-arrow";
import { Compression, Table as WasmTable, WriterPropertiesBuilder, writeParquet } from "parquet-wasm/node";
import type { FileHandle } from "node:fs/promises";
import type { NodeIds } from "../core/graph";
import { writeAtomic } from "./atomic-file";
import { rankOrder } from "./rank-order";
import { scoreTable } from "./score-table";

export type ScoreFormat = "csv" | "arrow" | "parquet";

const CSV_CHUNK_ROWS = 16_384;
const utf8 = new TextDecoder("utf-8", { fatal: true });

function csvField(s: string): string {
  return /[",\r\n]/.test(s) ? `"${s.replaceAll('"', '""')}"` : s;
}

function idText(ids: NodeIds, v: number): string {
  if (ids.kind === "integer") return ids.ids[v].toString();
  return csvField(utf8.decode(ids.bytes.subarray(ids.offsets[v], ids.offsets[v + 1])));
}

/** node_id,score,rank rows; the score is JavaScript's shortest round-trip decimal, so it parses back to the same bits. */
async function writeCsv(fh: FileHandle, ids: NodeIds, scores: Float64Array, order: Uint32Array): Promise<void> {
  await fh.writeFile("node_id,score,rank\n");
  for (let i0 = 0; i0 < order.length; i0 += CSV_CHUNK_ROWS) {
    const i1 = Math.min(i0 + CSV_CHUNK_ROWS, order.length);
    let chunk = "";
    for (let i = i0; i < i1; i++) {
      const v = order[i];
      chunk += `${idText(ids, v)},${scores[v]},${i + 1}\n`;
    }
    await fh.writeFile(chunk);
  }
}

function idCount(ids: NodeIds): number {
  return ids.kind === "integer" ? ids.ids.length : ids.offsets.length - 1;
}

/**
 * Writes the score file at `path` (temp file + rename). Rows in rank order: rank 1 = highest score, ties by dense
 * id. Arrow and Parquet carry `meta` as file-level key/value metadata; CSV is the bare three columns.
 * @example await writeScores("out/scores.parquet", "parquet", graph.ids, result.scores, { iterations: "12" })
 */
export async function writeScores(
  path: string,
  format: ScoreFormat,
  ids: NodeIds,
  scores: Float64Array,
  meta: Record<string, string>,
): Promise<void> {
  if (idCount(ids) !== scores.length) {
    throw new RangeError(`ids must name ${scores.length} nodes, one per score. Value: ${idCount(ids)}`);
  }
  const order = rankOrder(scores);
  if (format === "csv") return writeAtomic(path, (fh) => writeCsv(fh, ids, scores, order));
  const table = scoreTable(ids, scores, order, meta);
  if (format === "arrow") {
    const bytes = tableToIPC(table, "file");
    return writeAtomic(path, async (fh) => fh.writeFile(bytes));
  }
  if (format === "parquet") {
    const wasmTable = WasmTable.fromIPCStream(tableToIPC(table, "stream"));
    const props = new WriterPropertiesBuilder()
      .setCompression(Compression.ZSTD)
      .setKeyValueMetadata(new Map(Object.entries(meta)))
      .build();
    const bytes = writeParquet(wasmTable, props);
    return writeAtomic(path, async (fh) => fh.writeFile(bytes));
  }
  throw new RangeError(`format must be csv, arrow or parquet. Value: ${String(format)}`);
}
