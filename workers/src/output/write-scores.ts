// Score files: CSV (streamed), Arrow IPC file and Parquet (ZSTD), one row per node in rank order, written atomically.
import type { FileHandle } from "node:fs/promises";
import type { NodeIds } from "../core/graph";
import { writeAtomic } from "./atomic-file";
import { rankOrder } from "./rank-order";
import { scoreTable } from "./score-table";

export type ScoreFormat = "csv" | "arrow" | "parquet";

/** Bytes buffered before a write; a row is at most a field of maxFieldBytes (quoted, doubled) plus 48. */
const CSV_BUFFER_BYTES = 1 << 20;
const utf8 = new TextDecoder("utf-8", { fatal: true });
const QUOTE = 0x22;
const COMMA = 0x2c;
const NEWLINE = 0x0a;

/** Appends text of single-byte characters (digits, '.', 'e', '-', '+') at `at`; returns the new end. */
function putAscii(buf: Uint8Array, at: number, text: string): number {
  for (let i = 0; i < text.length; i++) buf[at++] = text.charCodeAt(i);
  return at;
}

/** Appends the decimal digits of a non-negative integer below 2^53. */
function putUint(buf: Uint8Array, at: number, v: number): number {
  if (v < 10) {
    buf[at] = 48 + v;
    return at + 1;
  }
  let digits = 0;
  for (let t = v; t >= 1; t = Math.floor(t / 10)) digits++;
  for (let i = at + digits - 1; i >= at; i--) {
    const q = Math.floor(v / 10);
    buf[i] = 48 + (v - q * 10);
    v = q;
  }
  return at + digits;
}

/** Appends a node id as a CSV field: integers as digits, strings quoted when they hold '"', ',', CR or LF. */
type CsvIds = { kind: "integer"; ids: BigUint64Array; words: Uint32Array } | Extract<NodeIds, { kind: "string" }>;

function putId(buf: Uint8Array, at: number, ids: CsvIds, v: number): number {
  if (ids.kind === "integer") {
    // Words, not the BigInt element: no allocation per row for ids below 2^53.
    const hi = ids.words[2 * v + 1];
    return hi < 0x200000 ? putUint(buf, at, hi * 4294967296 + ids.words[2 * v]) : putAscii(buf, at, ids.ids[v].toString());
  }
  const bytes = ids.bytes.subarray(ids.offsets[v], ids.offsets[v + 1]);
  let plain = true;
  for (let i = 0; i < bytes.length; i++) {
    const b = bytes[i];
    if (b === QUOTE || b === COMMA || b === NEWLINE || b === 0x0d) {
      plain = false;
      break;
    }
  }
  if (plain) {
    buf.set(bytes, at);
    return at + bytes.length;
  }
  buf[at++] = QUOTE;
  for (let i = 0; i < bytes.length; i++) {
    if (bytes[i] === QUOTE) buf[at++] = QUOTE;
    buf[at++] = bytes[i];
  }
  buf[at++] = QUOTE;
  return at;
}

/**
 * node_id,score,rank rows, formatted straight into bytes; the score is JavaScript's shortest round-trip decimal, so it
 * parses back to the same bits. String ids are checked to be UTF-8 once, up front.
 */
async function writeCsv(fh: FileHandle, nodeIds: NodeIds, scores: Float64Array, order: Uint32Array): Promise<void> {
  const ids: CsvIds =
    nodeIds.kind === "integer"
      ? { ...nodeIds, words: new Uint32Array(nodeIds.ids.buffer, nodeIds.ids.byteOffset, 2 * nodeIds.ids.length) }
      : nodeIds;
  if (ids.kind === "string") utf8.decode(ids.bytes);
  let longest = 0;
  if (ids.kind === "string") for (let v = 0; v + 1 < ids.offsets.length; v++) longest = Math.max(longest, ids.offsets[v + 1] - ids.offsets[v]);
  const rowMax = 2 * longest + 64;
  const buf = new Uint8Array(Math.max(CSV_BUFFER_BYTES, 2 * rowMax));
  let at = putAscii(buf, 0, "node_id,score,rank\n");
  for (let i = 0; i < order.length; i++) {
    if (at + rowMax > buf.length) {
      await fh.write(buf, 0, at);
      at = 0;
    }
    const v = order[i];
    at = putId(buf, at, ids, v);
    buf[at++] = COMMA;
    at = putAscii(buf, at, String(scores[v]));
    buf[at++] = COMMA;
    at = putUint(buf, at, i + 1);
    buf[at++] = NEWLINE;
  }
  if (at > 0) await fh.write(buf, 0, at);
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
  // Arrow and Parquet load on first use: their modules take longer to start than a whole small CSV run.
  const arrow = await import("apache-arrow");
  const { tableToIPC } = arrow;
  const table = scoreTable(arrow, ids, scores, order, meta);
  if (format === "arrow") {
    const bytes = tableToIPC(table, "file");
    return writeAtomic(path, async (fh) => fh.writeFile(bytes));
  }
  if (format === "parquet") {
    const { Compression, Table: WasmTable, WriterPropertiesBuilder, writeParquet } = await import("parquet-wasm/node");
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
