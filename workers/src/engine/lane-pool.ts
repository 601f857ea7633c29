// The threads an ingest parsed on, kept for the run that follows: a command line ranks one file and exits, and
// starting a second set of threads (a RankPool) costs it about 80 ms of CPU per thread while both cores are busy.
import type { CsvRowsTask } from "../output/csv-rows";
import { WorkerLane } from "../ingest/lanes";
import type { ShardDone, ShardTask } from "../tasks/rank-shard-task";
import type { ShardPool } from "./rank-pool";

export class LanePool implements ShardPool {
  readonly threads: number;
  readonly #lanes: WorkerLane[];
  readonly #busy: boolean[];
  /** Tasks waiting for a free lane, first come first served. */
  readonly #queue: Array<() => void> = [];

  /** `lanes`: worker lanes an ingest handed over (IngestResult.threads); the pool closes them. */
  constructor(lanes: WorkerLane[]) {
    if (lanes.length < 1) throw new RangeError("a lane pool needs at least one lane. Value: 0");
    this.#lanes = [...lanes];
    this.#busy = lanes.map(() => false);
    this.threads = lanes.length;
  }

  async run(task: ShardTask, signal: AbortSignal): Promise<ShardDone> {
    signal.throwIfAborted();
    const i = await this.#acquire(signal);
    const lane = this.#lanes[i];
    let onAbort = () => {};
    const aborted = new Promise<never>((_, reject) => {
      onAbort = () => {
        // Like a pool that terminates a thread whose task it gives up on: the lane is replaced by a fresh one.
        this.#replace(i, lane);
        reject(signal.reason);
      };
      signal.addEventListener("abort", onAbort, { once: true });
    });
    try {
      return await Promise.race([lane.runShard(task), aborted]);
    } finally {
      signal.removeEventListener("abort", onAbort);
      // A thread that died mid-task is replaced (the retry goes to a live one).
      if (!lane.alive) this.#replace(i, lane);
      this.#release(i);
    }
  }

  async formatCsvRows(task: CsvRowsTask): Promise<number> {
    const i = await this.#acquire();
    const lane = this.#lanes[i];
    try {
      return await lane.formatCsvRows(task);
    } finally {
      if (!lane.alive) this.#replace(i, lane);
      this.#release(i);
    }
  }

  stats(): { threads: number; busy: number } {
    return { threads: this.threads, busy: this.#busy.filter(Boolean).length };
  }

  async close(): Promise<void> {
    await Promise.all(this.#lanes.map((lane) => lane.close()));
  }

  /**
   * A free lane, marked busy: one task a lane at a time, so that a lane that dies takes only its own task with it.
   * Rejects when `signal` aborts first.
   */
  async #acquire(signal?: AbortSignal): Promise<number> {
    for (;;) {
      const i = this.#busy.indexOf(false);
      if (i >= 0) {
        this.#busy[i] = true;
        if (!this.#lanes[i].alive) this.#replace(i, this.#lanes[i]);
        return i;
      }
      await new Promise<void>((resolve, reject) => {
        const wake = () => {
          signal?.removeEventListener("abort", onAbort);
          resolve();
        };
        const onAbort = () => {
          const at = this.#queue.indexOf(wake);
          if (at >= 0) this.#queue.splice(at, 1);
          reject(signal?.reason);
        };
        signal?.addEventListener("abort", onAbort, { once: true });
        this.#queue.push(wake);
      });
    }
  }

  #release(i: number): void {
    this.#busy[i] = false;
    this.#queue.shift()?.();
  }

  #replace(i: number, lane: WorkerLane): void {
    if (this.#lanes[i] !== lane) return;
    this.#lanes[i] = new WorkerLane();
    lane.close().catch(() => {});
  }
}
