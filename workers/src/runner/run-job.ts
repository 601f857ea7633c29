// One run: load the prepared graph, resolve seeds, iterate on the runner's pool with progress, checkpoints and
// fault handling, then write the results and the final record. A run can stop in five ways besides finishing:
// canceled (user), shutdown (handed back to the queue after a checkpoint), lease lost (another runner owns it now:
// write nothing final), needs attention (a shard failed past its retries), failed (anything else).
import { RunParametersSchema } from "../../../api/contracts/runs";
import { BLOCK_NODES, type Graph } from "../core/graph";
import { countMergedEdges, planShards } from "../core/shard-plan";
import { rank, type FaultPlan, type RankResult } from "../engine/rank";
import { GraphStore } from "../graph-store/load";
import type { StoreMeta } from "../graph-store/format";
import { readCheckpoint, removeCheckpoint, writeCheckpoint, type Checkpoint } from "./checkpoint";
import type { RunnerConfig } from "./config";
import { graphStorePath, inDataDir, runDirPath, type JobControl, type RunnerContext } from "./context";
import type { ClaimedRun } from "./queue-repo";
import { releaseRun } from "./queue-repo";
import { sendRunMail, type RunOutcome } from "./run-mail";
import { writeRunOutputs } from "./run-outputs";
import { RunRecorder } from "./run-recorder";
import { deleteShardsFrom, finishRun, iterationResidual, iterationTimes, type FinalRecord } from "./run-repo";
import { resolveSeedIds, UnknownSeedsError } from "./seeds";

let cached: { key: string; graph: Graph; meta: StoreMeta } | null = null;

/** The last graph stays loaded: consecutive runs on one graph (the usual case) skip reading and checking it. */
async function loadGraph(dir: string): Promise<{ graph: Graph; meta: StoreMeta }> {
  const store = await GraphStore.open(dir);
  const key = `${dir}@${store.meta.createdAt}`;
  if (cached?.key === key) return cached;
  cached = null;
  const graph = await store.loadGraph();
  cached = { key, graph, meta: store.meta };
  return cached;
}

export function forgetCachedGraph(): void {
  cached = null;
}

function faultsFor(config: RunnerConfig, runId: number): FaultPlan[] {
  return config.faults.filter((f) => f.run === undefined || f.run === runId).map(({ shard, iteration, attempt, kind }) => ({ shard, iteration, attempt, kind }));
}

const message = (error: unknown) => (error instanceof Error ? error.message : String(error));

function announce(rec: RunRecorder, claim: ClaimedRun, runnerId: string): void {
  if (claim.kind === "start") rec.event("info", "started", `Runner ${runnerId} started the run.`, { runner: runnerId });
  else if (claim.kind === "retry") rec.event("info", "retry", `Retry requested: runner ${runnerId} resumes the run from its last checkpoint.`, { runner: runnerId });
  else if (claim.previousRunner === runnerId) rec.event("warn", "reclaimed", `Runner ${runnerId} restarted and took its run back.`, { runner: runnerId });
  else {
    const who = claim.previousRunner ? `Runner ${claim.previousRunner}` : "The previous runner";
    rec.event("warn", "reclaimed", `${who} stopped sending heartbeats; runner ${runnerId} took the run over.`, { runner: runnerId, previous: claim.previousRunner });
  }
}

export async function executeRun(ctx: RunnerContext, claim: ClaimedRun, job: JobControl): Promise<void> {
  const { run, graph: graphRow } = claim;
  const { config } = ctx;
  const log = ctx.logger.child({ runId: run.id });
  const t0 = performance.now();
  const runDir = inDataDir(config.dataDir, runDirPath(run.id));
  const parsed = RunParametersSchema.safeParse(run.parameters);
  const alpha = parsed.success ? parsed.data.damping : 0.85;
  const boundFactor = alpha / (1 - alpha);
  const rec = new RunRecorder(ctx, run, boundFactor);
  announce(rec, claim, config.runnerId);

  const finish = async (
    record: Omit<FinalRecord, "softwareVersion">,
    event: { level: "info" | "warn" | "error"; kind: string; message: string; details?: Record<string, unknown> },
  ): Promise<boolean> => {
    rec.event(event.level, event.kind, event.message, event.details ?? null);
    await rec.flush();
    const ok = await ctx.retry("finish run", () =>
      finishRun(ctx.db, run.id, config.runnerId, { inputFingerprint: graphRow.fingerprint, ...record, softwareVersion: config.softwareVersion }),
    );
    if (!ok) log.warn("the run was taken over before it could be finished");
    return ok;
  };
  const mail = (outcome: RunOutcome) => sendRunMail(ctx, run, graphRow.name, outcome);
  const fail = async (reason: string, extra: Partial<FinalRecord> = {}) => {
    log.warn({ reason }, "run failed");
    const ok = await finish({ status: "failed", statusReason: reason, stopReason: "failed", ...extra }, { level: "error", kind: "failed", message: reason });
    if (ok) await mail({ status: "failed", reason, iterations: extra.iterations ?? run.iterations, residual: extra.finalResidual ?? null, errorBound: extra.errorBound ?? null });
  };

  if (run.cancelRequestedAt) {
    await finish({ status: "canceled", statusReason: "Canceled before it started.", stopReason: "canceled" }, { level: "info", kind: "canceled", message: "Canceled before it started." });
    return;
  }
  if (!parsed.success) return fail(`The run parameters are not valid: ${parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ")}`);
  if (graphRow.deletedAt) return fail("The graph was deleted.");
  if (graphRow.status !== "ready") return fail(`The graph "${graphRow.name}" was rejected: ${graphRow.rejectReason ?? "no reason recorded"}`);
  const params = parsed.data;

  let loaded: { graph: Graph; meta: StoreMeta };
  try {
    loaded = await loadGraph(inDataDir(config.dataDir, graphRow.storagePath ?? graphStorePath(graphRow.id)));
  } catch (error) {
    return fail(`The prepared graph cannot be loaded: ${message(error)}`);
  }
  const { graph, meta } = loaded;
  let seeds: Array<{ node: number; weight: number }> | null = null;
  if (params.teleport.kind === "seeds") {
    try {
      seeds = resolveSeedIds(params.teleport.seeds, graph.ids);
    } catch (error) {
      if (error instanceof UnknownSeedsError) return fail(error.message);
      throw error;
    }
  }
  // Merged duplicates always weigh their multiplicity (as weights or as repeated sources); a weight column only when
  // the run asks for it.
  const weighted = (graph.weights !== null || graph.mergedEdges !== undefined) && (params.weighted || meta.stats.weighted !== true);
  const shards = params.shards === "auto" ? ctx.pool.threads : params.shards;
  const balanced = planShards(graph.inOffsets, graph.n, shards, BLOCK_NODES);
  const plan = graph.mergedEdges !== undefined ? countMergedEdges(balanced, graph.inOffsets, graph.sources) : balanced;
  await ctx.retry("trim shards", () => deleteShardsFrom(ctx.db, run.id, plan.length));
  rec.plan(plan, "running");

  let resumeFrom: Checkpoint | undefined;
  const found = await readCheckpoint(runDir, graph.n);
  if (found.kind === "ok") {
    resumeFrom = found.checkpoint;
    rec.event("info", "resumed", `Resuming from the checkpoint at iteration ${resumeFrom.k}.`, { k: resumeFrom.k });
  } else if (found.kind === "unusable") {
    rec.event("warn", "checkpoint-ignored", `The checkpoint cannot be used (${found.reason}); starting from the beginning.`);
  }
  let lastCheckpointK = resumeFrom?.k ?? null;
  const storedResidual = resumeFrom ? await ctx.retry("read residual", () => iterationResidual(ctx.db, run.id, (resumeFrom as Checkpoint).k)) : null;
  const tLoaded = performance.now();

  let result: RankResult;
  if (resumeFrom && storedResidual !== null && (storedResidual < params.tolerance || resumeFrom.k >= params.maxIterations)) {
    // The checkpoint already holds the final iterate: one more step would change the answer.
    const converged = storedResidual < params.tolerance;
    result = {
      scores: resumeFrom.x,
      iterations: resumeFrom.k,
      residual: storedResidual,
      errorBound: boundFactor * storedResidual,
      converged,
      stopReason: converged ? "converged" : "iteration-cap",
      residuals: [],
      danglingMass: [],
      timings: { setupMs: 0, iterateMs: 0, perIterationMs: 0, medianIterationMs: 0 },
    };
  } else {
    try {
      result = await rank(
        graph,
        {
          damping: params.damping,
          tolerance: params.tolerance,
          maxIterations: params.maxIterations,
          dangling: params.dangling,
          teleport: seeds ? { kind: "seeds", seeds } : { kind: "uniform" },
          weighted,
          shards,
        },
        {
          pool: ctx.pool,
          signal: job.controller.signal,
          onIteration: (p) => rec.iteration(p),
          checkpointEvery: config.checkpointEvery,
          onCheckpoint: async (k, x) => {
            await rec.flush();
            await writeCheckpoint(runDir, k, x);
            lastCheckpointK = k;
            rec.checkpointAt(k);
          },
          resumeFrom,
          retry: config.retry,
          faults: faultsFor(config, run.id),
        },
      );
    } catch (error) {
      forgetCachedGraph();
      await rec.flush();
      if (job.cause === "lease-lost" || job.cause === "shutdown") return;
      return fail(`The iteration stopped with an error: ${message(error)}`);
    }
    // A run that did not end cleanly keeps its graph's memory lent (a stopped thread may still write there): load the
    // graph afresh for the next run rather than have every later run copy it.
    if (result.stopReason !== "converged" && result.stopReason !== "iteration-cap") forgetCachedGraph();
  }
  await rec.flush();
  const iterated = result.residuals.length > 0;
  const residual = iterated ? result.residual : storedResidual;
  const errorBound = residual === null ? null : boundFactor * residual;
  const progress = { iterations: result.iterations, finalResidual: residual, errorBound };
  const saveCheckpoint = async () => {
    if (result.iterations > (lastCheckpointK ?? 0)) {
      await writeCheckpoint(runDir, result.iterations, result.scores);
      lastCheckpointK = result.iterations;
    }
  };

  if (job.cause === "lease-lost") {
    log.warn("another runner took the run over; stopping without a final record");
    return;
  }
  if (job.cause === "shutdown") {
    await saveCheckpoint();
    rec.event("info", "released", `Runner ${config.runnerId} stopped; the run is queued again and resumes from iteration ${lastCheckpointK ?? 0}.`, {
      k: lastCheckpointK ?? 0,
    });
    rec.checkpointAt(lastCheckpointK ?? 0);
    await rec.flush();
    await ctx.retry("release run", () => releaseRun(ctx.db, run.id, config.runnerId));
    log.info({ k: lastCheckpointK }, "run handed back to the queue");
    return;
  }
  if (job.cause === "cancel" || result.stopReason === "canceled") {
    const why = `Canceled by request at iteration ${result.iterations}.`;
    await finish({ status: "canceled", statusReason: why, stopReason: "canceled", ...progress }, { level: "info", kind: "canceled", message: why });
    return;
  }
  if (result.stopReason === "needs-attention" && result.failure) {
    await saveCheckpoint();
    const f = result.failure;
    const range = plan[f.shard];
    rec.shard({
      shard: f.shard,
      vertexStart: range?.start ?? 0,
      vertexEnd: range?.end ?? 0,
      edgeCount: range?.edges ?? 0,
      state: "failed",
      attempts: f.attempts,
      worker: null,
      lastError: f.lastError,
    });
    const at = result.iterations + 1;
    const why = `Shard ${f.shard} failed ${f.attempts} times at iteration ${at}: ${f.lastError}. A retry resumes from iteration ${lastCheckpointK ?? 0}.`;
    const ok = await finish(
      { status: "needs-attention", statusReason: why, stopReason: "shard-failed", lastCheckpointK, ...progress },
      { level: "error", kind: "needs-attention", message: why, details: { shard: f.shard, attempts: f.attempts, lastError: f.lastError, iteration: at } },
    );
    if (ok) await mail({ status: "needs-attention", reason: why, iterations: result.iterations, residual, errorBound });
    return;
  }
  if (result.stopReason === "failed") return fail(result.failure?.lastError ?? "The iteration failed.", progress);

  const tOut = performance.now();
  let outputs;
  try {
    outputs = await writeRunOutputs(ctx, run, graph.ids, result.scores, params.topK, {
      run: String(run.id),
      graph: graphRow.name,
      damping: String(params.damping),
      tolerance: String(params.tolerance),
      maxIterations: String(params.maxIterations),
      iterations: String(result.iterations),
      residual: String(residual),
      errorBound: String(errorBound),
      stopReason: result.stopReason,
      weighted: String(weighted),
      dangling: params.dangling,
      teleport: params.teleport.kind,
      inputFingerprint: graphRow.fingerprint ?? "",
      softwareVersion: config.softwareVersion,
    });
  } catch (error) {
    return fail(`The score files could not be written: ${message(error)}`, progress);
  }
  // From the iterations' own times, not this attempt's wall clock: a retried run counts every attempt's iterations,
  // and neither the pause before the retry nor checkpoint and recording time.
  const own = await ctx.retry("iteration times", () => iterationTimes(ctx.db, run.id, result.iterations));
  const now = performance.now();
  const timings = {
    ...(run.startedAt ? { queuedMs: Math.max(0, run.startedAt.getTime() - run.createdAt.getTime()) } : {}),
    loadMs: tLoaded - t0,
    setupMs: result.timings.setupMs,
    iterateMs: own.totalMs,
    perIterationMs: own.count > 0 ? own.totalMs / own.count : 0,
    writeMs: now - tOut,
    totalMs: now - t0,
  };
  const status = result.converged ? "converged" : "not-converged";
  const summary = result.converged
    ? `Converged after ${result.iterations} iterations: L1 residual ${residual?.toExponential(3)}, error bound ${errorBound?.toExponential(3)}.`
    : `Stopped at the iteration cap (${result.iterations}) without converging: L1 residual ${residual?.toExponential(3)}.`;
  const ok = await finish(
    { status, statusReason: null, stopReason: result.converged ? "converged" : "iteration-cap", timings, outputs: { ...outputs }, lastCheckpointK, ...progress },
    { level: "info", kind: status, message: summary, details: { iterations: result.iterations, residual, errorBound } },
  );
  if (!ok) return;
  await removeCheckpoint(runDir).catch(() => undefined);
  log.info({ status, iterations: result.iterations, residual }, "run finished");
  await mail({ status, reason: null, iterations: result.iterations, residual, errorBound });
}
