// A pool of worker threads that run shard steps; one pool can serve many runs in turn.
import { Piscina } from "piscina";
import { pathToFileURL } from "node:url";
import type { CsvRowPool, CsvRowsTask } from "../output/csv-rows";
import type { ShardDone, ShardTask } from "../tasks/rank-shard-task";
import { bundledWorker } from "../tasks/ts-worker";

// Workers are .ts under tsx/Vitest and .js once built: load the task file with the same extension as this module.
const EXT = import.meta.url.endsWith(".ts") ? ".ts" : ".js";
const TASK_FILE = new URL(`../tasks/rank-shard${EXT}`, import.meta.url).href;

export class RankPool implements CsvRowPool {
  readonly threads: number;
  #pool: Piscina<ShardTask, ShardDone>;
  #busy = 0;

  constructor(opts: { threads: number }) {
    if (!Number.isInteger(opts.threads) || opts.threads < 1) {
      throw new RangeError(`threads must be a positive integer. Value: ${opts.threads}`);
    }
    this.threads = opts.threads;
    // From TypeScript, workers start from a cached bundle of the task (no tsx loader in each thread) when esbuild is
    // there, else through tsx.
    const bundle = EXT === ".ts" ? bundledWorker(new URL(TASK_FILE)) : null;
    this.#pool = new Piscina<ShardTask, ShardDone>({
      filename: bundle ? pathToFileURL(bundle).href : TASK_FILE,
      minThreads: opts.threads,
      maxThreads: opts.threads,
      idleTimeout: 60_000,
      execArgv: EXT === ".ts" && !bundle ? ["--import", "tsx"] : [],
    });
  }

  async run(task: ShardTask, signal: AbortSignal): Promise<ShardDone> {
    this.#busy++;
    try {
      return await this.#pool.run(task, { signal });
    } finally {
      this.#busy--;
    }
  }

  /** CSV score rows formatted on a pool thread (the pool is idle once a run has ended). */
  async formatCsvRows(task: CsvRowsTask): Promise<number> {
    return this.#pool.run(task as unknown as ShardTask, { name: "formatCsvRows" }) as unknown as Promise<number>;
  }

  stats(): { threads: number; busy: number } {
    return { threads: this.threads, busy: this.#busy };
  }

  async close(): Promise<void> {
    await this.#pool.close();
  }
}
