// The threads an ingest parsed on, kept for the run that follows: a command line ranks one file and exits, and
// starting a second set of threads (a RankPool) costs it about 80 ms of CPU per thread while both cores are busy.
import type { CsvRowsTask } from "../output/csv-rows";
import { WorkerLane, type Lane } from "../ingest/lanes";
import type { ShardDone, ShardTask } from "../tasks/rank-shard-task";
import type { ShardPool } from "./rank-pool";

export class LanePool implements ShardPool {
  readonly threads: number;
  readonly #lanes: Lane[];
  readonly #busy: number[];

  /** `lanes`: worker lanes an ingest handed over (IngestResult.threads); the pool closes them. */
  constructor(lanes: Lane[]) {
    if (lanes.length < 1) throw new RangeError("a lane pool needs at least one lane. Value: 0");
    this.#lanes = [...lanes];
    this.#busy = lanes.map(() => 0);
    this.threads = lanes.length;
  }

  async run(task: ShardTask, signal: AbortSignal): Promise<ShardDone> {
    signal.throwIfAborted();
    const i = this.#idlest();
    const lane = this.#lanes[i];
    this.#busy[i]++;
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
      if (this.#lanes[i] === lane) this.#busy[i]--;
      // A thread that died mid-task (the retry goes to a live one).
      if (!lane.alive) this.#replace(i, lane);
    }
  }

  async formatCsvRows(task: CsvRowsTask): Promise<number> {
    const i = this.#idlest();
    this.#busy[i]++;
    try {
      return await this.#lanes[i].formatCsvRows(task);
    } finally {
      this.#busy[i]--;
    }
  }

  stats(): { threads: number; busy: number } {
    return { threads: this.threads, busy: this.#busy.reduce((a, b) => a + b, 0) };
  }

  async close(): Promise<void> {
    await Promise.all(this.#lanes.map((lane) => lane.close()));
  }

  #replace(i: number, lane: Lane): void {
    if (this.#lanes[i] !== lane) return;
    this.#lanes[i] = new WorkerLane();
    this.#busy[i] = 0;
    lane.close().catch(() => {});
  }

  #idlest(): number {
    let best = 0;
    for (let i = 1; i < this.#busy.length; i++) if (this.#busy[i] < this.#busy[best]) best = i;
    return best;
  }
}
