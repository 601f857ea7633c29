// Worker thread entry of a parse lane (see lanes.ts); after the ingest, the same thread can run shard steps and CSV
// rows for a run (see LanePool).

import { parentPort } from "node:worker_threads";
import { runPass } from "../graph-store/build";
import rankShard, { formatCsvRows } from "../tasks/rank-shard";
import { parseChunk, type LaneReply, type LaneRequest } from "./lane-protocol";
import { LineParser } from "./line-parser";

const port = parentPort;
if (!port) throw new Error("parse-worker must run as a worker thread");
let parser: LineParser | null = null;

port.on("message", (msg: LaneRequest) => {
  try {
    if (msg.type === "pass") {
      reply({ type: "passed", result: runPass(msg.pass) });
      return;
    }
    if (msg.type === "shard") {
      reply({ type: "shardDone", done: rankShard(msg.task) });
      return;
    }
    if (msg.type === "rows") {
      reply({ type: "passed", result: formatCsvRows(msg.task) });
      return;
    }
    if (msg.type === "init") {
      parser = new LineParser(msg.cfg);
      return;
    }
    if (!parser) throw new Error("parse worker used before init");
    if (msg.type === "chunk") {
      const ack = parseChunk(parser, msg.seq, msg.buffer, msg.len, msg.first);
      reply({ type: "ack", ack }, [ack.buffer]);
      return;
    }
    parser.promote(msg.mode);
    const part = parser.finish();
    const transfer = [part.src, part.dst, part.weight, part.keysLo, part.keysHi, part.keyBytes, part.keyOffsets]
      .filter((a): a is NonNullable<typeof a> => a !== null)
      .map((a) => a.buffer)
      .filter((b): b is ArrayBuffer => b instanceof ArrayBuffer);
    reply({ type: "part", part }, [...new Set(transfer)]);
  } catch (e) {
    reply({ type: "error", message: e instanceof Error ? (e.stack ?? e.message) : String(e) });
  }
});

reply({ type: "ready" });

function reply(r: LaneReply, transfer: ArrayBuffer[] = []): void {
  (port as NonNullable<typeof port>).postMessage(r, transfer);
}
