// A pool of worker threads that run shard steps; one pool can serve many runs in turn.
import { createRequire } from "node:module";
import { pathToFileURL } from "node:url";
import type { Piscina } from "piscina";
import type { CsvRowPool, CsvRowsTask } from "../output/csv-rows";
import type { ShardDone, ShardTask } from "../tasks/rank-shard-task";
import { bundledWorker } from "../tasks/ts-worker";

// Workers are .ts under tsx/Vitest and .js once built: load the task file with the same extension as this module.
const EXT = import.meta.url.endsWith(".ts") ? ".ts" : ".js";
const TASK_FILE = new URL(`../tasks/rank-shard${EXT}`, import.meta.url).href;

// The thread-pool package takes tens of milliseconds to load: it loads with the first pool.
let PoolClass: typeof Piscina | null = null;

function poolClass(): typeof Piscina {
  PoolClass ??= (createRequire(import.meta.url)("piscina") as typeof import("piscina")).Piscina;
  return PoolClass;
}

/** Threads that run shard steps (and CSV rows): a RankPool, or the threads an ingest handed over (LanePool). */
export interface ShardPool extends CsvRowPool {
  readonly threads: number;
  /** One shard step; an abort of `signal` gives up on the attempt (its thread is replaced, not waited for). */
  run(task: ShardTask, signal: AbortSignal): Promise<ShardDone>;
  stats(): { threads: number; busy: number };
  close(): Promise<void>;
}

export class RankPool implements ShardPool {
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
    const Pool = poolClass();
    this.#pool = new Pool<ShardTask, ShardDone>({
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
