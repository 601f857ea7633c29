// Test-only fault injection inside a worker thread.
import type { FaultKind } from "./rank-shard-task";

const HANG_MS = 10 * 60_000;

export function injectFault(kind: FaultKind): void {
  if (kind === "throw") throw new Error("injected fault: task threw");
  // In a worker thread process.exit ends only this thread; the pool sees the worker die mid-task.
  if (kind === "exit-worker") process.exit(70);
  // Blocks the thread without touching shared state; the driver's deadline aborts the task and piscina terminates it.
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, HANG_MS);
}
