// Write-behind recording of a run's progress: the iteration loop never waits for the database, except when the
// backlog grows past MAX_BACKLOG (a long outage) and before a checkpoint is written. Invariant kept by the caller:
// flush() completes before checkpoint k exists on disk, so every iteration ≤ k is in the database; iterations after
// the checkpoint are recomputed on resume and their rows rewritten (same k, same values).
import type { IterationProgress } from "../engine/rank";
import type { ShardRange } from "../core/shard-plan";
import type { RunnerContext } from "./context";
import { addEvent, updateRunProgress, upsertIterations, upsertShards, type IterationRow, type ShardRow } from "./run-repo";

const FLUSH_DELAY_MS = 100;
const MAX_BACKLOG = 2_000;

interface PendingEvent {
  level: "info" | "warn" | "error";
  kind: string;
  message: string;
  details: Record<string, unknown> | null;
}

export class RunRecorder {
  #rows: IterationRow[] = [];
  #shards = new Map<number, ShardRow>();
  #events: PendingEvent[] = [];
  #progress: { iterations: number; residual: number; errorBound: number } | null = null;
  #checkpointK: number | null = null;
  #chain: Promise<void> = Promise.resolve();
  #timer: NodeJS.Timeout | null = null;

  constructor(
    private readonly ctx: RunnerContext,
    private readonly run: { id: number; teamId: number },
    private readonly boundFactor: number,
  ) {}

  plan(ranges: readonly ShardRange[], state: ShardRow["state"]): void {
    for (const r of ranges) {
      this.#shards.set(r.index, {
        shard: r.index,
        vertexStart: r.start,
        vertexEnd: r.end,
        edgeCount: r.edges,
        state,
        attempts: 0,
        worker: null,
        lastError: null,
      });
    }
    this.#schedule();
  }

  shard(row: ShardRow): void {
    this.#shards.set(row.shard, row);
    this.#schedule();
  }

  event(level: PendingEvent["level"], kind: string, message: string, details: Record<string, unknown> | null = null): void {
    this.#events.push({ level, kind, message, details });
    this.#schedule();
  }

  checkpointAt(k: number): void {
    this.#checkpointK = k;
    this.#schedule();
  }

  /** Records step k; resolves at once unless the backlog is full. */
  iteration(p: IterationProgress): Promise<void> | void {
    this.#rows.push({ k: p.k, residual: p.residual, danglingMass: p.danglingMass, elapsedMs: p.elapsedMs });
    for (const st of p.shards) {
      this.#shards.set(st.index, {
        shard: st.index,
        vertexStart: st.start,
        vertexEnd: st.end,
        edgeCount: st.edges,
        state: st.state,
        attempts: st.attempts,
        worker: st.worker === undefined ? null : `${this.ctx.config.runnerId}#${st.worker}`,
        lastError: st.lastError ?? null,
      });
      if (st.attempts > 1) {
        this.event("warn", "shard-retried", `Shard ${st.index} needed ${st.attempts} attempts at iteration ${p.k}: ${st.lastError ?? "unknown error"}`, {
          shard: st.index,
          iteration: p.k,
          attempts: st.attempts,
          lastError: st.lastError ?? null,
        });
      }
    }
    this.#progress = { iterations: p.k, residual: p.residual, errorBound: this.boundFactor * p.residual };
    if (this.#rows.length >= MAX_BACKLOG) return this.flush();
    this.#schedule();
  }

  /** Resolves once everything recorded so far is in the database. */
  flush(): Promise<void> {
    if (this.#timer) {
      clearTimeout(this.#timer);
      this.#timer = null;
    }
    const next = this.#chain.then(() => this.#drain());
    this.#chain = next.catch(() => undefined);
    return next;
  }

  #schedule(): void {
    if (this.#timer) return;
    this.#timer = setTimeout(() => {
      this.#timer = null;
      this.flush().catch((error: unknown) => this.ctx.logger.error({ err: error, runId: this.run.id }, "run progress not recorded"));
    }, FLUSH_DELAY_MS);
  }

  async #drain(): Promise<void> {
    const { ctx, run } = this;
    while (this.#rows.length > 0 || this.#shards.size > 0 || this.#events.length > 0 || this.#progress || this.#checkpointK !== null) {
      const rows = this.#rows.splice(0, 1_000);
      const shards = [...this.#shards.values()];
      this.#shards.clear();
      const events = this.#events.splice(0);
      const progress = { ...this.#progress, ...(this.#checkpointK === null ? {} : { lastCheckpointK: this.#checkpointK }) };
      this.#progress = null;
      this.#checkpointK = null;
      await ctx.retry("record iterations", async () => {
        await upsertIterations(ctx.db, run.teamId, run.id, rows);
        await upsertShards(ctx.db, run.teamId, run.id, shards);
        if (Object.keys(progress).length > 0) await updateRunProgress(ctx.db, run.id, ctx.config.runnerId, progress);
      });
      for (const e of events) await ctx.retry("record event", () => addEvent(ctx.db, run.teamId, run.id, e.level, e.kind, e.message, e.details));
    }
  }
}
