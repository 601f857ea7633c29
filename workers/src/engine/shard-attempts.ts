// Runs one shard step on the pool with a deadline, bounded retries and backoff.
import { setTimeout as sleep } from "node:timers/promises";
import type { FaultKind, ShardTask } from "../tasks/rank-shard-task";
import type { RankPool } from "./rank-pool";

export interface ShardState {
  index: number;
  start: number;
  end: number;
  edges: number;
  state: "queued" | "running" | "done" | "retrying" | "failed";
  attempts: number;
  worker?: number;
  lastError?: string;
}

/** Test-only: make `shard` fail in the step that produces x_iteration, on attempt `attempt` (1-based). */
export interface FaultPlan {
  shard: number;
  iteration: number;
  attempt: number;
  kind: FaultKind;
}

export interface RetryPolicy {
  attempts: number;
  backoffMs: number;
  taskTimeoutMs: number;
}

export const DEFAULT_RETRY: RetryPolicy = { attempts: 3, backoffMs: 100, taskTimeoutMs: 120_000 };

export type ShardOutcome = "done" | "failed" | "canceled";

class Deadline extends Error {}

/**
 * Attempts the task up to policy.attempts times; attempt a waits backoffMs·2^(a−2) first (a ≥ 2). Safe because the
 * task is a pure function of its inputs: a retry, or a terminated attempt that still writes, writes the same bits.
 */
export async function runShard(
  pool: RankPool,
  task: Omit<ShardTask, "fault">,
  st: ShardState,
  iteration: number,
  policy: RetryPolicy,
  faults: readonly FaultPlan[],
  cancel: AbortSignal | undefined,
): Promise<ShardOutcome> {
  for (let attempt = 1; attempt <= policy.attempts; attempt++) {
    if (cancel?.aborted) return "canceled";
    if (attempt > 1) {
      st.state = "retrying";
      try {
        await sleep(policy.backoffMs * 2 ** (attempt - 2), undefined, { signal: cancel });
      } catch {
        return "canceled";
      }
    }
    st.state = "running";
    st.attempts = attempt;
    const fault = faults.find((f) => f.shard === st.index && f.iteration === iteration && f.attempt === attempt);
    const ac = new AbortController();
    const timer = setTimeout(() => ac.abort(new Deadline(`task passed its ${policy.taskTimeoutMs} ms deadline`)), policy.taskTimeoutMs);
    const onCancel = () => ac.abort(new Error("run canceled"));
    cancel?.addEventListener("abort", onCancel, { once: true });
    try {
      const done = await pool.run(fault ? { ...task, fault: fault.kind } : task, ac.signal);
      st.state = "done";
      st.worker = done.threadId;
      return "done";
    } catch (err) {
      if (cancel?.aborted) return "canceled";
      const reason: unknown = ac.signal.aborted ? ac.signal.reason : err;
      st.lastError = reason instanceof Error ? reason.message : String(reason);
    } finally {
      clearTimeout(timer);
      cancel?.removeEventListener("abort", onCancel);
    }
  }
  st.state = "failed";
  return "failed";
}
