// Score files: CSV (streamed), Arrow IPC file and Parquet (ZSTD), one row per node in rank order, written atomically.
import type { FileHandle } from "node:fs/promises";
import type { NodeIds } from "../core/graph";
import { writeAtomic } from "./atomic-file";
import { assemblyModule } from "../tasks/assembly";
import { csvIds, CSV_HEADER, formatRows, rowBound, ScoreText, type CsvIds, type CsvRowPool } from "./csv-rows";
import { rankOrder } from "./rank-order";
import { scoreTable } from "./score-table";

export type ScoreFormat = "csv" | "arrow" | "parquet";

/** Rows per formatting piece: big enough to amortise a message, small enough to keep threads and disk busy. */
const PIECE_ROWS = 32_768;
const PIECE_BYTES = 4 << 20;
const utf8 = new TextDecoder("utf-8", { fatal: true });

/**
 * node_id,score,rank rows in rank order, formatted into reused buffers in pieces: here and, for string ids with a
 * pool, on its threads as well (one piece here, then one per helper thread, round the pieces), written in order
 * while later pieces are formatted. String ids are checked to be UTF-8 once, up front.
 */
async function writeCsv(fh: FileHandle, nodeIds: NodeIds, scores: Float64Array, order: Uint32Array, pool?: CsvRowPool): Promise<void> {
  if (nodeIds.kind === "string") checkUtf8(nodeIds.offsets, nodeIds.bytes);
  const ids = csvIds(nodeIds);
  const bound = rowBound(ids);
  const pieceRows = Math.max(1, Math.min(PIECE_ROWS, Math.floor(PIECE_BYTES / bound)));
  await writeAll(fh, new TextEncoder().encode(CSV_HEADER));
  const n = order.length;
  const pieces = Math.ceil(n / pieceRows);
  const textModule = assemblyModule("score-text");
  const text = ScoreText.of(textModule);
  // This thread formats too (and issues the writes): the pool lends all its threads but one. Integer-id rows take
  // the score-text module about 0.15 µs each here, and at that pace helpers slowed the whole (scale 20: 145-180 ms
  // with one helper against 90 ms alone; the rows' random reads of scores and ids compete), so they stay here.
  const helpers = pool && pieces >= 2 && ids.kind === "string" ? Math.max(1, pool.threads - 1) : 0;
  const mine = (k: number) => helpers === 0 || k % (helpers + 1) === 0;
  const rowsOf = (k: number): [number, number] => [k * pieceRows, Math.min(n, (k + 1) * pieceRows)];
  const task = pool && helpers > 0 ? { ids: sharedIds(ids), scores: sharedCopy(scores), order: sharedCopy(order), textModule } : null;
  // Two buffers for this thread's pieces: one is being written while the next is formatted.
  const own = [new Uint8Array(Math.min(n, pieceRows) * bound), new Uint8Array(pieces > 1 ? pieceRows * bound : 0)];
  let ownNext = 0;
  // Shared buffers of the helpers' pieces, each reused once its rows are on disk.
  const spare: SharedArrayBuffer[] = [];
  const launched = new Map<number, { out: SharedArrayBuffer; bytes: Promise<number> }>();
  let ahead = 0;
  let writing: Promise<void> = Promise.resolve();
  let written: SharedArrayBuffer | null = null;
  try {
    for (let k = 0; k < pieces; k++) {
      // The helpers' pieces of the next round are in flight.
      for (; pool && task && ahead < Math.min(pieces, k + helpers + 1); ahead++) {
        if (mine(ahead)) continue;
        const [from, to] = rowsOf(ahead);
        const out = spare.pop() ?? new SharedArrayBuffer(pieceRows * bound);
        const bytes = pool.formatCsvRows({ ...task, from, to, out });
        // Awaited in its turn; a failure before then must not count as unhandled.
        bytes.catch(() => {});
        launched.set(ahead, { out, bytes });
      }
      let bytes: Uint8Array;
      let shared: SharedArrayBuffer | null = null;
      if (mine(k)) {
        const out = own[ownNext];
        ownNext ^= 1;
        const [from, to] = rowsOf(k);
        bytes = out.subarray(0, formatRows(ids, scores, order, from, to, out, text));
      } else {
        const piece = launched.get(k) as { out: SharedArrayBuffer; bytes: Promise<number> };
        launched.delete(k);
        shared = piece.out;
        bytes = new Uint8Array(piece.out, 0, await piece.bytes);
      }
      await writing;
      if (written) spare.push(written);
      written = shared;
      writing = writeAll(fh, bytes);
      // Awaited at the next piece; until then a failure must not count as unhandled.
      writing.catch(() => {});
    }
    await writing;
  } catch (error) {
    // Threads may still be reading the order and ids (perhaps borrowed memory the caller gives back next): wait.
    await Promise.allSettled([writing, ...[...launched.values()].map((piece) => piece.bytes)]);
    throw error;
  }
}

/** The ids in shared memory, for the pool's threads. */
function sharedIds(ids: CsvIds): CsvIds {
  return ids.kind === "integer"
    ? { kind: "integer", words: sharedCopy(ids.words) }
    : { kind: "string", bytes: sharedCopy(ids.bytes), offsets: sharedCopy(ids.offsets) };
}

/** Writes every byte (a write may take fewer than asked, e.g. near a full disk: then it says so or throws). */
async function writeAll(fh: FileHandle, bytes: Uint8Array): Promise<void> {
  for (let at = 0; at < bytes.length; ) {
    const { bytesWritten } = await fh.write(bytes, at, bytes.length - at);
    if (bytesWritten <= 0) throw new Error(`score file: a write stored nothing at byte ${at} of ${bytes.length}`);
    at += bytesWritten;
  }
}

/** Throws unless every id is UTF-8; decodes in pieces cut at id boundaries (a string has a length limit). */
function checkUtf8(offsets: Uint32Array, bytes: Uint8Array): void {
  const PIECE = 64 << 20;
  let start = 0;
  for (let v = 1; v < offsets.length; v++) {
    if (offsets[v] - offsets[start] >= PIECE || v === offsets.length - 1) {
      utf8.decode(bytes.subarray(offsets[start], offsets[v]));
      start = v;
    }
  }
}

/** `a` itself when it lives in shared memory, else a copy that does. */
function sharedCopy<T extends Uint8Array | Uint32Array | Float64Array>(a: T): T {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const Ctor = a.constructor as new (buffer: SharedArrayBuffer) => T;
  const copy = new Ctor(new SharedArrayBuffer(a.byteLength));
  copy.set(a);
  return copy;
}

function idCount(ids: NodeIds): number {
  return ids.kind === "integer" ? ids.ids.length : ids.offsets.length - 1;
}

/**
 * Writes the score file at `path` (temp file + rename). Rows in rank order: rank 1 = highest score, ties by dense
 * id. Arrow and Parquet carry `meta` as file-level key/value metadata; CSV is the bare three columns, formatted on
 * `rowPool`'s threads when one is given.
 * @example await writeScores("out/scores.parquet", "parquet", graph.ids, result.scores, { iterations: "12" })
 */
export async function writeScores(
  path: string,
  format: ScoreFormat,
  ids: NodeIds,
  scores: Float64Array,
  meta: Record<string, string>,
  options: {
    rowPool?: CsvRowPool;
    /** The rank order, when the caller made it already (rankOrder(scores), or rankOrderIn on a graph's heap). */
    order?: Uint32Array;
  } = {},
): Promise<void> {
  if (idCount(ids) !== scores.length) {
    throw new RangeError(`ids must name ${scores.length} nodes, one per score. Value: ${idCount(ids)}`);
  }
  const order = options.order ?? rankOrder(scores);
  if (order.length !== scores.length) throw new RangeError(`order must rank ${scores.length} nodes. Value: ${order.length}`);
  if (format === "csv") return writeAtomic(path, (fh) => writeCsv(fh, ids, scores, order, options.rowPool));
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
