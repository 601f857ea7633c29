// Runs one shard step on the pool with a deadline, bounded retries and backoff.
import { setTimeout as sleep } from "node:timers/promises";
import type { FaultKind, ShardTask } from "../tasks/rank-shard-task";
import type { ShardPool } from "./rank-pool";

export interface ShardState {
  index: number;
  start: number;
  end: number;
  edges: number;
  state: "queued" | "running" | "done" | "retrying" | "failed";
  attempts: number;
  worker?: number;
  lastError?: string;
  /** Kernel time of the attempt that succeeded. */
  kernelMs?: number;
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

let attemptCounter = 0;
const START_POLL_MS = 250;
const MAX_START_WAIT_MS = 60_000;

/**
 * Aborts `ac` once the task has run `ms` after a worker picked it up (the worker sets started[shard] = attempt).
 * Time spent queued or waiting for a worker to boot does not count, up to `maxWaitMs`.
 */
function armDeadline(ac: AbortController, started: Int32Array, shard: number, attempt: number, ms: number, maxWaitMs: number) {
  const poll = Math.min(ms, START_POLL_MS);
  let waited = 0;
  let timer: ReturnType<typeof setTimeout>;
  const tick = () => {
    if (Atomics.load(started, shard) === attempt) {
      timer = setTimeout(() => ac.abort(new Deadline(`task passed its ${ms} ms deadline`)), ms);
    } else if ((waited += poll) >= maxWaitMs) {
      ac.abort(new Deadline(`task did not start within ${waited} ms`));
    } else {
      timer = setTimeout(tick, poll);
    }
  };
  timer = setTimeout(tick, poll);
  return () => clearTimeout(timer);
}

/**
 * Attempts the task up to policy.attempts times; attempt a waits backoffMs·2^(a−2) first (a ≥ 2). Safe because the
 * task is a pure function of its inputs: a retry, or a terminated attempt that still writes, writes the same bits.
 */
export async function runShard(
  pool: ShardPool,
  task: Omit<ShardTask, "fault" | "shard" | "attempt">,
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
    attemptCounter = (attemptCounter % 0x7fffffff) + 1;
    const id = attemptCounter;
    const started = new Int32Array(task.started);
    const ms = policy.taskTimeoutMs;
    const disarm = armDeadline(ac, started, st.index, id, ms, Math.max(MAX_START_WAIT_MS, 10 * ms));
    const onCancel = () => ac.abort(new Error("run canceled"));
    cancel?.addEventListener("abort", onCancel, { once: true });
    try {
      const attemptTask: ShardTask = { ...task, shard: st.index, attempt: id, ...(fault ? { fault: fault.kind } : {}) };
      const done = await pool.run(attemptTask, ac.signal);
      st.state = "done";
      st.worker = done.threadId;
      st.kernelMs = done.kernelMs;
      return "done";
    } catch (err) {
      if (cancel?.aborted) return "canceled";
      const reason: unknown = ac.signal.aborted ? ac.signal.reason : err;
      st.lastError = reason instanceof Error ? reason.message : String(reason);
    } finally {
      disarm();
      cancel?.removeEventListener("abort", onCancel);
    }
  }
  st.state = "failed";
  return "failed";
}
