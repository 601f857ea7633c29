// Parse lanes: where chunks of lines get parsed. A worker lane runs a LineParser on its own thread; the local lane runs
// it on the calling thread. Both answer every chunk with an ack (its line and edge ranges, so that line numbers and
// file order can be restored) and hand over one ParsedPart at the end.

import type { Worker } from "node:worker_threads";
import { runPass, type PassTask } from "../graph-store/build";
import type { CsvRowsTask } from "../output/csv-rows";
import type { ShardDone, ShardTask } from "../tasks/rank-shard-task";
import { parseChunk, type ChunkAck, type LaneReply, type LaneRequest } from "./lane-protocol";
import { LineParser, type IdMode, type ParsedPart, type ParserConfig } from "./line-parser";
import type { Chunk } from "./source";
import { startTsWorker } from "../tasks/ts-worker";

export type { ChunkAck } from "./lane-protocol";

export interface Lane {
  /** Chunks sent and not yet acknowledged. */
  inflight: number;
  /** Able to take chunks without delay (a worker lane once its thread has started). */
  readonly ready: boolean;
  init(cfg: ParserConfig): void;
  send(chunk: Chunk, first: boolean): Promise<ChunkAck>;
  finish(mode: IdMode): Promise<ParsedPart>;
  /** Run one slice of a graph-build pass. */
  runPass(task: PassTask): Promise<number>;
  close(): Promise<void>;
}

export class LocalLane implements Lane {
  inflight = 0;
  readonly ready = true;
  private parser: LineParser | null = null;
  init(cfg: ParserConfig): void {
    this.parser = new LineParser(cfg);
  }
  async send(chunk: Chunk, first: boolean): Promise<ChunkAck> {
    return parseChunk(this.spent(), chunk.seq, chunk.buffer, chunk.len, first);
  }
  async finish(mode: IdMode): Promise<ParsedPart> {
    const parser = this.spent();
    parser.promote(mode);
    return parser.finish();
  }
  async runPass(task: PassTask): Promise<number> {
    return runPass(task);
  }
  private spent(): LineParser {
    if (!this.parser) throw new Error("lane used before init");
    return this.parser;
  }
  async close(): Promise<void> {}
}

export class WorkerLane implements Lane {
  inflight = 0;
  ready = false;
  private readonly worker: Worker;
  private readonly waiting: Array<{ resolve: (r: LaneReply) => void; reject: (e: Error) => void }> = [];
  private failure: Error | null = null;

  constructor() {
    this.worker = startTsWorker(new URL("./parse-worker.ts", import.meta.url));
    this.worker.on("message", (r: LaneReply) => {
      if (r.type === "ready") {
        this.ready = true;
        return;
      }
      const w = this.waiting.shift();
      if (!w) return;
      if (r.type === "error") w.reject(new Error(r.message));
      else w.resolve(r);
    });
    this.worker.on("error", (e) => this.fail(e));
    // A lane whose thread exited is dead, idle or not: later requests fail at once instead of waiting for ever.
    this.worker.on("exit", (code) => this.fail(this.failure ?? new Error(`parse worker exited (code ${code})`)));
  }

  /** False once the thread has died (every later request fails). */
  get alive(): boolean {
    return this.failure === null;
  }

  init(cfg: ParserConfig): void {
    this.post({ type: "init", cfg });
  }

  async send(chunk: Chunk, first: boolean): Promise<ChunkAck> {
    this.inflight++;
    const reply = await this.request({ type: "chunk", seq: chunk.seq, buffer: chunk.buffer, len: chunk.len, first }, [chunk.buffer]);
    this.inflight--;
    if (reply.type !== "ack") throw new Error("parse worker: expected an ack");
    return reply.ack;
  }

  async finish(mode: IdMode): Promise<ParsedPart> {
    const reply = await this.request({ type: "finish", mode });
    if (reply.type !== "part") throw new Error("parse worker: expected a part");
    return reply.part;
  }

  async runPass(task: PassTask): Promise<number> {
    const reply = await this.request({ type: "pass", pass: task });
    if (reply.type !== "passed") throw new Error("parse worker: expected a pass result");
    return reply.result;
  }

  /** After the ingest: one shard step of a run (see LanePool). */
  async runShard(task: ShardTask): Promise<ShardDone> {
    const reply = await this.request({ type: "shard", task });
    if (reply.type !== "shardDone") throw new Error("parse worker: expected a shard result");
    return reply.done;
  }

  /** After the ingest: CSV score rows; resolves with the bytes written. */
  async formatCsvRows(task: CsvRowsTask): Promise<number> {
    const reply = await this.request({ type: "rows", task });
    if (reply.type !== "passed") throw new Error("parse worker: expected a byte count");
    return reply.result;
  }

  async close(): Promise<void> {
    await this.worker.terminate();
  }

  private post(msg: LaneRequest, transfer: ArrayBuffer[] = []): void {
    this.worker.postMessage(msg, transfer);
  }

  private request(msg: LaneRequest, transfer: ArrayBuffer[] = []): Promise<LaneReply> {
    if (this.failure) return Promise.reject(this.failure);
    return new Promise((resolve, reject) => {
      this.waiting.push({ resolve, reject });
      this.post(msg, transfer);
    });
  }

  private fail(e: Error): void {
    this.failure = e;
    for (const w of this.waiting.splice(0)) w.reject(e);
  }
}
