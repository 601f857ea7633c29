// Piscina task: one power-iteration step for one shard over shared memory.
import { threadId } from "node:worker_threads";
import { formatRows, ScoreText, type CsvRowsTask } from "../output/csv-rows";
import { pullStep } from "../core/pull-step";
import { injectFault } from "./fault";
import { cachedRun, type ShardDone, type ShardTask } from "./rank-shard-task";
import { wasmStep } from "./wasm-step";

export default function rankShard(t: ShardTask): ShardDone {
  Atomics.store(new Int32Array(t.started), t.shard, t.attempt);
  if (t.fault) injectFault(t.fault);
  const { views: v, wasm } = cachedRun(t.runId, t.buffers);
  const [x0, x1, c0, c1] = [v.x[t.cur], v.x[1 - t.cur], v.c[t.cur], v.c[1 - t.cur]];
  const args = { ...v, start: t.start, end: t.end, c0, x0, x1, c1, scalars: t.scalars, blockNodes: t.blockNodes };
  const t0 = performance.now();
  if (wasm) wasmStep(wasm, args);
  else pullStep(args);
  return { threadId, kernelMs: performance.now() - t0 };
}

/** Piscina task "formatCsvRows": rows [from, to) into the task's shared buffer; returns the bytes written. */
export function formatCsvRows(t: CsvRowsTask): number {
  return formatRows(t.ids, t.scores, t.order, t.from, t.to, new Uint8Array(t.out), t.textModule ? ScoreText.of(t.textModule) : undefined);
}
