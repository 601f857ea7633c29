// The parse-lane protocol: messages between the ingest driver and a parse worker, and the one function both sides use
// to apply a chunk to a LineParser (so a local lane and a worker lane behave identically).

import type { PassTask } from "../graph-store/build";
import type { CsvRowsTask } from "../output/csv-rows";
import type { ShardDone, ShardTask } from "../tasks/rank-shard-task";
import type { IdMode, LineParser, ParsedPart, ParserConfig } from "./line-parser";

export interface ChunkAck {
  seq: number;
  buffer: ArrayBuffer;
  linesBefore: number;
  linesAfter: number;
  edgesBefore: number;
  edgesAfter: number;
  badLines: number;
  mode: IdMode;
  maxId: number;
  stopped: boolean;
  /** Time spent parsing this chunk. */
  busyMs: number;
}

export type LaneRequest =
  | { type: "init"; cfg: ParserConfig }
  | { type: "chunk"; seq: number; buffer: ArrayBuffer; len: number; first: boolean }
  | { type: "finish"; mode: IdMode }
  | { type: "pass"; pass: PassTask }
  | { type: "shard"; task: ShardTask }
  | { type: "rows"; task: CsvRowsTask };

export type LaneReply =
  | { type: "ready" }
  | { type: "ack"; ack: ChunkAck }
  | { type: "part"; part: ParsedPart }
  | { type: "passed"; result: number }
  | { type: "shardDone"; done: ShardDone }
  | { type: "error"; message: string };

/** Apply one chunk to a parser and describe what it did. */
export function parseChunk(parser: LineParser, seq: number, buffer: ArrayBuffer, len: number, first: boolean): ChunkAck {
  const t0 = performance.now();
  const before = parser.counts;
  const edgesBefore = parser.edgeCount;
  if (first) parser.beginFile();
  parser.feed(new Uint8Array(buffer, 0, len));
  const after = parser.counts;
  return {
    seq,
    buffer,
    linesBefore: before.lines,
    linesAfter: after.lines,
    edgesBefore,
    edgesAfter: parser.edgeCount,
    badLines: after.badLines,
    mode: parser.mode,
    maxId: parser.maxId,
    stopped: parser.stopped,
    busyMs: performance.now() - t0,
  };
}
