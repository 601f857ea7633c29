import { Link } from "react-router-dom";
import { RUN_STATUSES, RunStatusSchema } from "#contracts/runs";
import { StatusPill } from "../../../components/ui/badge";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { Select } from "../../../components/ui/field";
import { Loading } from "../../../components/ui/loading";
import { Pager } from "../../../components/ui/pager";
import { TBody, TD, TH, THead, TR, Table } from "../../../components/ui/table";
import { paths } from "../../../config/paths";
import { elapsedMs, formatCount, formatDateTime, formatDuration, formatSci, isoOrEmpty } from "../../../lib/format";
import { RUN_STATUS } from "../../../lib/status";
import { useCursorPager } from "../../../lib/use-cursor-pager";
import { useRuns, type RunFilter } from "../api/get-runs";
import { parametersSummary } from "../lib/summary";

type RunsTableProps = {
  filter: RunFilter;
  onFilterChange?: (filter: RunFilter) => void;
  /** Graphs offered in the graph filter; leave out to hide that filter (e.g. on a graph's own page). */
  graphs?: Array<{ id: number; name: string }>;
  caption?: string;
  emptyHint?: string;
};

const STATUS_OPTIONS = [{ value: "", label: "Any status" }, ...RUN_STATUSES.map((s) => ({ value: s, label: RUN_STATUS[s].label }))];

export function RunsTable({ filter, onFilterChange, graphs, caption = "Ranking runs", emptyHint }: RunsTableProps) {
  const pager = useCursorPager();
  const runs = useRuns(filter, pager.cursor);
  const items = runs.data?.items ?? [];
  const filtered = Boolean(filter.status || (graphs && filter.graphId));

  function update(change: RunFilter) {
    onFilterChange?.({ ...filter, ...change });
    pager.reset();
  }

  return (
    <div className="flex flex-col gap-3">
      {onFilterChange ? (
        <div role="group" aria-label="Filter runs" className="flex flex-wrap items-center gap-2">
          <Select
            compact
            aria-label="Status"
            value={filter.status ?? ""}
            options={STATUS_OPTIONS}
            onChange={(event) => {
              const status = RunStatusSchema.safeParse(event.target.value);
              update({ status: status.success ? status.data : undefined });
            }}
          />
          {graphs ? (
            <Select
              compact
              aria-label="Graph"
              value={filter.graphId ? String(filter.graphId) : ""}
              options={[{ value: "", label: "Any graph" }, ...graphs.map((g) => ({ value: String(g.id), label: g.name }))]}
              onChange={(event) => update({ graphId: event.target.value ? Number(event.target.value) : undefined })}
              className="max-w-64"
            />
          ) : null}
        </div>
      ) : null}
      {runs.isError ? <ErrorBanner error={runs.error} title="Runs could not be loaded" /> : null}
      {runs.isPending ? (
        <Loading label="Loading runs…" />
      ) : items.length === 0 ? (
        <EmptyState className="my-2" title={filtered ? "No run matches" : "No runs yet"}>
          {filtered ? "Change the filters to see more runs." : (emptyHint ?? "Submit a run on a ready graph to rank its nodes.")}
        </EmptyState>
      ) : (
        <Table caption={caption} className="-mx-4">
          <THead>
            <TR>
              <TH numeric className="w-14">Run</TH>
              <TH>Status</TH>
              <TH>Graph</TH>
              <TH>Parameters</TH>
              <TH numeric>Iterations</TH>
              <TH numeric>Residual</TH>
              <TH>Submitted</TH>
              <TH numeric>Took</TH>
            </TR>
          </THead>
          <TBody>
            {items.map((run) => (
              <TR key={run.id} aria-busy={runs.isPlaceholderData || undefined}>
                <TD numeric>
                  <Link to={paths.app.run.getHref(run.id)} className="font-medium text-ink underline decoration-rule-strong underline-offset-2 hover:decoration-ink">
                    #{run.id}
                  </Link>
                </TD>
                <TD>
                  <StatusPill {...RUN_STATUS[run.status]} />
                </TD>
                <TD className="max-w-56 truncate" title={run.graph.name}>
                  <Link to={paths.app.graph.getHref(run.graph.id)} className="text-ink-soft hover:text-ink hover:underline">
                    {run.graph.name}
                  </Link>
                </TD>
                <TD className="num text-xs whitespace-nowrap text-ink-soft">{parametersSummary(run.parameters)}</TD>
                <TD numeric className="whitespace-nowrap">
                  {formatCount(run.iterations)}
                  <span className="text-ink-muted"> / {formatCount(run.parameters.maxIterations)}</span>
                </TD>
                <TD numeric className={run.status === "not-converged" ? "whitespace-nowrap text-amber-strong" : "whitespace-nowrap"}>
                  {formatSci(run.residual)}
                </TD>
                <TD className="whitespace-nowrap text-ink-soft">
                  <span className="block text-[0.8125rem]">{run.createdBy?.name ?? (run.isDemo ? "Demo" : "—")}</span>
                  <time className="num block text-xs text-ink-muted" dateTime={isoOrEmpty(run.createdAt)}>
                    {formatDateTime(run.createdAt)}
                  </time>
                </TD>
                <TD numeric className="whitespace-nowrap text-ink-soft">
                  {run.startedAt ? formatDuration(elapsedMs(run.startedAt, run.finishedAt)) : "—"}
                </TD>
              </TR>
            ))}
          </TBody>
        </Table>
      )}
      {items.length > 0 || pager.hasPrevious ? (
        <Pager
          label="Run pages"
          page={pager.page}
          hasPrevious={pager.hasPrevious}
          hasNext={Boolean(runs.data?.nextCursor)}
          busy={runs.isFetching && runs.isPlaceholderData}
          onPrevious={pager.previous}
          onNext={() => runs.data?.nextCursor && pager.next(runs.data.nextCursor)}
          summary={
            <>
              Showing <span className="num text-ink">{items.length}</span> {items.length === 1 ? "run" : "runs"}
            </>
          }
        />
      ) : null}
    </div>
  );
}
