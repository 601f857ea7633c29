// The runner process: claims queued ingests and runs from MariaDB one at a time, executes them on a long-lived
// worker pool, keeps its leases and heartbeat row fresh, and stops cleanly. Usable in-process (startRunner) or as
// its own process: `tsx workers/src/runner/main.ts` (SIGTERM/SIGINT: checkpoint, hand the run back, exit 0).
import { hostname } from "node:os";
import path from "node:path";
import { setTimeout as sleep } from "node:timers/promises";
import { pathToFileURL } from "node:url";
import { lt, or, sql } from "drizzle-orm";
import { runnerHeartbeats } from "../../../api/src/db/schema";
import { createDb, createPool } from "../../../api/src/lib/db";
import { createLogger, type Logger } from "../../../api/src/lib/logger";
import { RankPool } from "../engine/rank-pool";
import { loadRunnerConfig, type RunnerConfig } from "./config";
import { newJobControl, stopJob, type JobControl, type RunnerContext } from "./context";
import { isTransientDbError, retryDb } from "./db-retry";
import { executeIngest } from "./ingest-job";
import { claimIngest, claimRun, releaseIngest, renewIngestLease, renewRunLease, writeHeartbeat, type Beat } from "./queue-repo";
import { createRunnerMailer } from "./run-mail";
import { executeRun, forgetCachedGraph } from "./run-job";
import { addEvent } from "./run-repo";

export type { RunnerConfig } from "./config";
export { loadRunnerConfig } from "./config";

export interface Runner {
  readonly id: string;
  /** Checkpoints and hands back the current run (or waits a grace period for an ingest), then closes everything. */
  stop(): Promise<void>;
}

interface CurrentJob {
  kind: "run" | "ingest";
  id: number;
  teamId: number;
  control: JobControl;
}

class RunnerProcess implements Runner {
  readonly id: string;
  #ctx: RunnerContext;
  #closeDb: () => Promise<void>;
  #stopping = false;
  #giveUpDb = false;
  #job: CurrentJob | null = null;
  #loop: Promise<void> = Promise.resolve();
  #wake = new AbortController();
  #beatTimer: NodeJS.Timeout | null = null;
  #beating = false;
  #startedAt = new Date();
  #stopped: Promise<void> | null = null;

  #ownPool: boolean;

  constructor(config: RunnerConfig, logger: Logger, pool: RankPool | undefined) {
    this.id = config.runnerId;
    const dbPool = createPool(config.db, 4);
    const db = createDb(dbPool);
    this.#closeDb = () => dbPool.end();
    this.#ownPool = pool === undefined;
    const log = logger;
    let failing = 0;
    this.#ctx = {
      config,
      db,
      logger: log,
      mailer: createRunnerMailer(config, db, log),
      pool: pool ?? new RankPool({ threads: config.threads }),
      retry: <T>(what: string, fn: () => Promise<T>) =>
        retryDb(what, fn, {
          giveUp: () => this.#giveUpDb,
          onRetry: (attempt, error) => {
            failing++;
            if (attempt === 1 || attempt % 10 === 0) log.warn({ err: error, attempt, what }, "database unavailable; retrying");
          },
          onRecovered: (attempts) => {
            if (failing === 0) return;
            failing = 0;
            log.info({ attempts, what }, "database connection restored");
            const job = this.#job;
            if (job?.kind === "run") {
              addEvent(db, job.teamId, job.id, "warn", "database-reconnected", `The database connection was lost and restored (${attempts} attempts); no progress was lost.`).catch(
                () => undefined,
              );
            }
          },
        }),
    };
  }

  async start(): Promise<void> {
    const ctx = this.#ctx;
    await ctx.retry("clear old heartbeats", () =>
      ctx.db
        .delete(runnerHeartbeats)
        .where(
          or(
            lt(runnerHeartbeats.beatAt, sql`CURRENT_TIMESTAMP(3) - INTERVAL 1 HOUR`),
            lt(runnerHeartbeats.stoppedAt, sql`CURRENT_TIMESTAMP(3) - INTERVAL 10 MINUTE`),
          ),
        ),
    );
    await ctx.retry("heartbeat", () => writeHeartbeat(ctx.db, this.#beatRecord()));
    this.#beatTimer = setInterval(() => void this.#beat(), ctx.config.heartbeatMs);
    this.#loop = this.#work();
    ctx.logger.info({ threads: ctx.config.threads, dataDir: ctx.config.dataDir }, "runner started");
  }

  #beatRecord(): Beat {
    const job = this.#job;
    const mem = process.memoryUsage();
    const { threads, busy: inFlight } = this.#ctx.pool.stats();
    // The pool counts the shard tasks handed to it, queued ones included (a step hands over every shard at once);
    // at most `threads` of them are at work.
    const busy = !job ? 0 : job.kind === "run" ? Math.min(threads, inFlight) : threads;
    return {
      runnerId: this.id,
      host: hostname(),
      pid: process.pid,
      threads,
      busy,
      rssBytes: mem.rss,
      heapBytes: mem.heapUsed,
      currentRunId: job?.kind === "run" ? job.id : null,
      currentGraphId: job?.kind === "ingest" ? job.id : null,
      softwareVersion: this.#ctx.config.softwareVersion,
      startedAt: this.#startedAt,
    };
  }

  /** Renews the current job's lease (noticing cancel requests and takeovers) and rewrites the heartbeat row. */
  async #beat(): Promise<void> {
    if (this.#beating) return;
    this.#beating = true;
    const { db, config, logger } = this.#ctx;
    try {
      const job = this.#job;
      if (job?.kind === "run") {
        const lease = await renewRunLease(db, job.id, config.runnerId);
        if (!lease.held) stopJob(job.control, "lease-lost");
        else if (lease.cancelRequested) stopJob(job.control, "cancel");
      } else if (job?.kind === "ingest") {
        if (!(await renewIngestLease(db, job.id, config.runnerId))) stopJob(job.control, "lease-lost");
      }
      await writeHeartbeat(db, this.#beatRecord());
    } catch (error) {
      // A missed beat is harmless until the lease runs out; the next beat tries again.
      if (!isTransientDbError(error)) logger.error({ err: error }, "heartbeat failed");
    } finally {
      this.#beating = false;
    }
  }

  async #work(): Promise<void> {
    let preferRun = false;
    while (!this.#stopping) {
      let worked = false;
      try {
        worked = await this.#tick(preferRun);
      } catch (error) {
        if (this.#stopping) break;
        this.#ctx.logger.error({ err: error }, "runner loop error");
      }
      preferRun = !preferRun;
      if (!worked && !this.#stopping) await sleep(this.#ctx.config.pollMs, undefined, { signal: this.#wake.signal }).catch(() => undefined);
    }
  }

  /** Claims and executes at most one job; ingests and runs take turns being looked at first. */
  async #tick(preferRun: boolean): Promise<boolean> {
    const ctx = this.#ctx;
    const { runnerId, leaseMs, teams } = ctx.config;
    for (const kind of preferRun ? (["run", "ingest"] as const) : (["ingest", "run"] as const)) {
      if (this.#stopping) return false;
      if (kind === "ingest") {
        const claim = await ctx.retry("claim ingest", () => claimIngest(ctx.db, runnerId, leaseMs, teams));
        if (claim) {
          await this.#execute({ kind, id: claim.graph.id, teamId: claim.graph.teamId }, (control) => executeIngest(ctx, claim, control));
          return true;
        }
      } else {
        const claim = await ctx.retry("claim run", () => claimRun(ctx.db, runnerId, leaseMs, teams));
        if (claim) {
          await this.#execute({ kind, id: claim.run.id, teamId: claim.run.teamId }, (control) => executeRun(ctx, claim, control));
          return true;
        }
      }
    }
    return false;
  }

  async #execute(job: Omit<CurrentJob, "control">, fn: (control: JobControl) => Promise<void>): Promise<void> {
    const control = newJobControl();
    this.#job = { ...job, control };
    void this.#beat();
    try {
      await fn(control);
    } catch (error) {
      this.#ctx.logger.error({ err: error, job }, "job failed unexpectedly");
    } finally {
      this.#job = null;
    }
  }

  stop(): Promise<void> {
    this.#stopped ??= this.#shutdown();
    return this.#stopped;
  }

  async #shutdown(): Promise<void> {
    const ctx = this.#ctx;
    this.#stopping = true;
    this.#wake.abort();
    const job = this.#job;
    if (job?.kind === "run") stopJob(job.control, "shutdown");
    const grace = ctx.config.stopGraceMs;
    const settled = await Promise.race([this.#loop.then(() => true), sleep(grace).then(() => false)]);
    if (!settled) {
      // Still busy: an ingest that cannot be interrupted, or a database that does not answer. Hand the job back.
      this.#giveUpDb = true;
      const current = this.#job;
      if (current) stopJob(current.control, "shutdown");
      if (current?.kind === "ingest") await releaseIngest(ctx.db, current.id, ctx.config.runnerId).catch(() => false);
      await Promise.race([this.#loop, sleep(2_000)]);
    }
    if (this.#beatTimer) clearInterval(this.#beatTimer);
    await writeHeartbeat(ctx.db, { ...this.#beatRecord(), currentRunId: null, currentGraphId: null, busy: 0 }, true).catch(() => undefined);
    forgetCachedGraph();
    ctx.mailer.close();
    if (this.#ownPool) await ctx.pool.close().catch(() => undefined);
    await this.#closeDb().catch(() => undefined);
    ctx.logger.info("runner stopped");
  }
}

/**
 * Starts a runner in this process; it works until stop() is called. A given pool (its worker threads already
 * started) is used and left open; otherwise the runner makes one of config.threads threads and closes it on stop.
 */
export async function startRunner(config: RunnerConfig, options: { logger?: Logger; pool?: RankPool } = {}): Promise<Runner> {
  const logger = (options.logger ?? createLogger(config.logLevel)).child({ runner: config.runnerId });
  const runner = new RunnerProcess(config, logger, options.pool);
  try {
    await runner.start();
  } catch (error) {
    await runner.stop();
    throw error;
  }
  return runner;
}

async function main(): Promise<void> {
  const config = loadRunnerConfig();
  const runner = await startRunner(config);
  let signalled = false;
  const onSignal = (signal: NodeJS.Signals) => {
    if (signalled) return;
    signalled = true;
    runner.stop().then(
      () => process.exit(0),
      (error: unknown) => {
        console.error(`runner: stop after ${signal} failed:`, error);
        process.exit(1);
      },
    );
  };
  process.on("SIGTERM", onSignal);
  process.on("SIGINT", onSignal);
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exit(1);
  });
}
