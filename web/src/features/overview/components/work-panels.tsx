import { Link } from "react-router-dom";
import { EmptyState } from "../../../components/ui/empty-state";
import { ProgressBar } from "../../../components/ui/progress-bar";
import { TBody, TD, TH, THead, TR, Table } from "../../../components/ui/table";
import { paths } from "../../../config/paths";
import { elapsedMs, formatBytes, formatCount, formatDuration, formatSci, formatSciCompact } from "../../../lib/format";
import type { Overview } from "../api/get-overview";

const link = "font-medium text-ink underline decoration-rule-strong underline-offset-2 hover:decoration-ink";

export function RunningRuns({ running }: { running: Overview["running"] }) {
  if (running.length === 0) return <EmptyState title="Nothing is running">Submitted runs show their progress here while a worker iterates.</EmptyState>;
  return (
    <ul aria-label="Running runs" className="flex flex-col divide-y divide-rule">
      {running.map((run) => (
        <li key={run.id} className="flex flex-col gap-1.5 py-2.5 first:pt-0 last:pb-0">
          <div className="flex flex-wrap items-baseline justify-between gap-2 text-[0.8125rem]">
            <span>
              <Link to={paths.app.run.getHref(run.id)} className={link}>
                Run #{run.id}
              </Link>{" "}
              <span className="text-ink-soft">on {run.graph.name}</span>
            </span>
            <span className="num text-xs text-ink-muted">
              k {formatCount(run.iteration)}/{formatCount(run.maxIterations)} · r {formatSci(run.residual)} → {formatSciCompact(run.tolerance)}
              {run.etaSeconds !== null ? ` · ETA ${formatDuration(run.etaSeconds * 1000)}` : ""}
            </span>
          </div>
          <ProgressBar value={run.fraction} label={`Progress of run ${run.id}`} valueText={`${Math.round(run.fraction * 100)} %`} />
        </li>
      ))}
    </ul>
  );
}

export function Queue({ queue }: { queue: Overview["queue"] }) {
  if (queue.runs.length === 0 && queue.ingests.length === 0) {
    return <p className="text-[0.8125rem] text-ink-muted">The queue is empty.</p>;
  }
  return (
    <ol aria-label="Queue" className="flex flex-col gap-1.5 text-[0.8125rem]">
      {queue.ingests.map((graph) => (
        <li key={`g${graph.id}`} className="flex items-baseline justify-between gap-2">
          <span>
            <span className="mr-1.5 rounded-sm bg-paper-sunken px-1 text-xs text-ink-soft">ingest</span>
            <Link to={paths.app.graph.getHref(graph.id)} className={link}>
              {graph.name}
            </Link>
          </span>
          <span className="num text-xs text-ink-muted">
            {graph.status === "ingesting" && graph.progress
              ? `${formatBytes(graph.progress.bytesRead)} / ${formatBytes(graph.progress.totalBytes)}`
              : `waiting ${formatDuration(elapsedMs(graph.createdAt))}`}
          </span>
        </li>
      ))}
      {queue.runs.map((run) => (
        <li key={`r${run.id}`} className="flex items-baseline justify-between gap-2">
          <span>
            <span className="mr-1.5 rounded-sm bg-paper-sunken px-1 text-xs text-ink-soft">run</span>
            <Link to={paths.app.run.getHref(run.id)} className={link}>
              #{run.id}
            </Link>{" "}
            <span className="text-ink-soft">on {run.graph.name}</span>
          </span>
          <span className="num text-xs text-ink-muted">
            {run.createdBy ?? "—"} · waiting {formatDuration(elapsedMs(run.createdAt))}
          </span>
        </li>
      ))}
    </ol>
  );
}

export function WorkerPool({ workers }: { workers: Overview["workers"] }) {
  if (workers.length === 0) {
    return (
      <EmptyState title="No runner is reporting">
        Start a runner process; until one sends heartbeats, queued ingests and runs wait.
      </EmptyState>
    );
  }
  return (
    <Table caption="Runner processes and their last heartbeat" className="-mx-4">
      <THead>
        <TR>
          <TH>Runner</TH>
          <TH>Health</TH>
          <TH numeric>Threads busy</TH>
          <TH numeric>Memory</TH>
          <TH numeric>Heartbeat</TH>
          <TH>Working on</TH>
        </TR>
      </THead>
      <TBody>
        {workers.map((w) => (
          <TR key={w.runnerId}>
            <TD className="max-w-48">
              <span className="num block truncate text-[0.8125rem]" title={w.runnerId}>
                {w.runnerId}
              </span>
              <span className="num block truncate text-xs text-ink-muted">
                {w.host} · pid {w.pid}
                {w.softwareVersion ? ` · ${w.softwareVersion}` : ""}
              </span>
            </TD>
            <TD>
              <span className={w.healthy ? "inline-flex items-center gap-1.5 text-ok" : "inline-flex items-center gap-1.5 font-medium text-danger"}>
                <span aria-hidden className="size-1.5 rounded-full bg-current" />
                {w.healthy ? "Healthy" : "Silent"}
              </span>
            </TD>
            <TD numeric>
              {w.busy} / {w.threads}
            </TD>
            <TD numeric title={`heap ${formatBytes(w.heapBytes)}`}>{formatBytes(w.rssBytes)}</TD>
            <TD numeric className={w.healthy ? undefined : "text-danger"}>
              {formatDuration(w.ageSeconds * 1000)} ago
            </TD>
            <TD className="text-[0.8125rem]">
              {w.currentRunId ? (
                <Link to={paths.app.run.getHref(w.currentRunId)} className={link}>
                  run #{w.currentRunId}
                </Link>
              ) : w.currentGraphId ? (
                <Link to={paths.app.graph.getHref(w.currentGraphId)} className={link}>
                  ingest of graph #{w.currentGraphId}
                </Link>
              ) : (
                <span className="text-ink-muted">idle</span>
              )}
            </TD>
          </TR>
        ))}
      </TBody>
    </Table>
  );
}
