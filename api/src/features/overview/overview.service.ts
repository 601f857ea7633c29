import { IngestProgressSchema } from "../../../contracts/graphs";
import type { Overview } from "../../../contracts/overview";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { runProgress } from "../runs/run-progress";
import { parametersOf } from "../runs/runs.service";
import { firstResidual, iterationTotals, lastIterations } from "../runs/runs.repo";
import { liveRunners, pendingIngests, queuedRuns, recentWork, runningRuns, teamCounts, teamGraphIds, teamRunIds } from "./overview.repo";

const LIST_LIMIT = 50;
const RUNNER_WINDOW_SECONDS = 600;
/** A runner that has not beaten for this long is shown as unhealthy (it beats every few seconds). */
export const HEALTHY_BEAT_MS = 15_000;

/** 0..1: how far log(r) has come from the first residual toward the tolerance, or k / cap when that is further. */
export function runFraction(first: number | null, last: number | null, tolerance: number, k: number, cap: number): number {
  const byCap = cap > 0 ? k / cap : 0;
  if (first === null || last === null || first <= tolerance || last <= 0) return Math.min(1, byCap);
  const byResidual = Math.log(first / last) / Math.log(first / tolerance);
  return Math.min(1, Math.max(0, byResidual, byCap));
}

export async function getOverview(deps: AppDeps, principal: Principal): Promise<Overview> {
  const { db } = deps;
  const teamId = principal.teamId;
  const [queued, ingests, running, runners, recent, counts] = await Promise.all([
    queuedRuns(db, teamId, LIST_LIMIT),
    pendingIngests(db, teamId, LIST_LIMIT),
    runningRuns(db, teamId),
    liveRunners(db, RUNNER_WINDOW_SECONDS),
    recentWork(db, teamId, 20),
    teamCounts(db, teamId),
  ]);
  const runningOut = await Promise.all(
    running.map(async ({ run, graphName, graphStatistics }) => {
      const parameters = parametersOf(run);
      const [recentIterations, totals, first] = await Promise.all([
        lastIterations(db, run.id, 11),
        iterationTotals(db, run.id),
        firstResidual(db, run.id),
      ]);
      const edges = typeof graphStatistics?.edges === "number" ? graphStatistics.edges : null;
      const progress = runProgress(recentIterations, totals, edges, parameters.tolerance, true);
      return {
        id: run.id,
        graph: { id: run.graphId, name: graphName },
        iteration: run.iterations,
        maxIterations: parameters.maxIterations,
        residual: run.finalResidual,
        tolerance: parameters.tolerance,
        fraction: runFraction(first, run.finalResidual, parameters.tolerance, run.iterations, parameters.maxIterations),
        etaSeconds: progress.etaSeconds,
        startedAt: run.startedAt?.toISOString() ?? null,
      };
    }),
  );
  // Runners are shared by all teams; only this team's run and graph ids are shown.
  const ownRuns = await teamRunIds(db, teamId, runners.flatMap((r) => (r.beat.currentRunId ? [r.beat.currentRunId] : [])));
  const ownGraphs = await teamGraphIds(db, teamId, runners.flatMap((r) => (r.beat.currentGraphId ? [r.beat.currentGraphId] : [])));
  return {
    queue: {
      runs: queued.map((q) => ({ id: q.id, graph: { id: q.graphId, name: q.graphName }, createdBy: q.creatorName, createdAt: q.createdAt.toISOString() })),
      ingests: ingests.map((g) => {
        const progress = IngestProgressSchema.safeParse(g.progress);
        return {
          id: g.id,
          name: g.name,
          status: g.status === "ingesting" ? ("ingesting" as const) : ("queued" as const),
          progress: g.status === "ingesting" && progress.success ? progress.data : null,
          createdAt: g.createdAt.toISOString(),
        };
      }),
    },
    running: runningOut,
    workers: runners.map(({ beat, ageMs }) => {
      const age = Math.max(0, Number(ageMs));
      return {
        runnerId: beat.runnerId,
        host: beat.host,
        pid: beat.pid,
        threads: beat.threads,
        // Heartbeats of older runners counted queued shard tasks as busy threads.
        busy: Math.min(beat.busy, beat.threads),
        rssBytes: beat.rssBytes,
        heapBytes: beat.heapBytes,
        currentRunId: beat.currentRunId !== null && ownRuns.has(beat.currentRunId) ? beat.currentRunId : null,
        currentGraphId: beat.currentGraphId !== null && ownGraphs.has(beat.currentGraphId) ? beat.currentGraphId : null,
        softwareVersion: beat.softwareVersion,
        startedAt: beat.startedAt.toISOString(),
        lastBeatAt: beat.beatAt.toISOString(),
        ageSeconds: age / 1000,
        healthy: age < HEALTHY_BEAT_MS,
      };
    }),
    recent: recent.map((r) => ({ id: r.id, action: r.action, actor: r.actorName, target: r.target, createdAt: r.createdAt.toISOString() })),
    counts,
  };
}
