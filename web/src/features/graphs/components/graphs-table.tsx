import { useState } from "react";
import { Link } from "react-router-dom";
import { GRAPH_STATUSES, GraphStatusSchema, type GraphQuery } from "#contracts/graphs";
import { StatusPill } from "../../../components/ui/badge";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { Select } from "../../../components/ui/field";
import { Loading } from "../../../components/ui/loading";
import { Pager } from "../../../components/ui/pager";
import { SortHeader, type SortOrder } from "../../../components/ui/sort-header";
import { TBody, TD, TH, THead, TR, Table } from "../../../components/ui/table";
import { paths } from "../../../config/paths";
import { formatBytes, formatCount, formatDateTime, isoOrEmpty } from "../../../lib/format";
import { GRAPH_STATUS } from "../../../lib/status";
import { useCursorPager } from "../../../lib/use-cursor-pager";
import { useGraphs, type GraphFilter } from "../api/get-graphs";

type Sort = GraphQuery["sort"];

const STATUS_OPTIONS = [{ value: "", label: "Any status" }, ...GRAPH_STATUSES.map((s) => ({ value: s, label: GRAPH_STATUS[s].label }))];

export function GraphsTable() {
  const [filter, setFilter] = useState<GraphFilter>({ sort: "created", order: "desc" });
  const [search, setSearch] = useState("");
  const pager = useCursorPager();
  const graphs = useGraphs(filter, pager.cursor);

  function update(change: Partial<GraphFilter>) {
    setFilter((current) => ({ ...current, ...change }));
    pager.reset();
  }

  const sortProps = {
    sort: filter.sort,
    order: filter.order,
    onSort: (sort: Sort, order: SortOrder) => update({ sort, order }),
  };
  const items = graphs.data?.items ?? [];
  const filtered = Boolean(filter.q || filter.status);

  return (
    <div className="flex flex-col gap-3">
      <form
        role="search"
        aria-label="Filter graphs"
        className="flex flex-wrap items-center gap-2"
        onSubmit={(event) => {
          event.preventDefault();
          update({ q: search.trim() || undefined });
        }}
      >
        <input
          type="search"
          aria-label="Search graphs by name or file"
          placeholder="Name or file…"
          value={search}
          onChange={(event) => {
            setSearch(event.target.value);
            if (event.target.value === "" && filter.q) update({ q: undefined });
          }}
          className="h-7 w-64 rounded-md border border-rule-strong bg-paper-raised px-2.5 text-[0.8125rem] text-ink placeholder:text-ink-muted"
        />
        <Select
          compact
          aria-label="Status"
          value={filter.status ?? ""}
          options={STATUS_OPTIONS}
          onChange={(event) => {
            const status = GraphStatusSchema.safeParse(event.target.value);
            update({ status: status.success ? status.data : undefined });
          }}
        />
        <button type="submit" className="h-7 rounded-md border border-rule-strong bg-paper-raised px-2.5 text-[0.8125rem] font-medium text-ink hover:bg-paper-sunken">
          Search
        </button>
      </form>

      {graphs.isError ? <ErrorBanner error={graphs.error} title="Graphs could not be loaded" /> : null}
      {graphs.isPending ? (
        <Loading label="Loading graphs…" />
      ) : items.length === 0 ? (
        <EmptyState className="my-2" title={filtered ? "No graph matches" : "No graphs yet"}>
          {filtered ? "Change the search or the status filter." : "Upload an edge list, then create a graph from it."}
        </EmptyState>
      ) : (
        <Table caption="Graphs of this team" className="-mx-4">
          <THead>
            <TR>
              <SortHeader label="Name" column="name" {...sortProps} />
              <SortHeader label="Size" column="size" numeric firstOrder="desc" {...sortProps} />
              <SortHeader label="Nodes" column="nodes" numeric firstOrder="desc" {...sortProps} />
              <SortHeader label="Edges" column="edges" numeric firstOrder="desc" {...sortProps} />
              <SortHeader label="Status" column="status" {...sortProps} />
              <TH>Owner</TH>
              <SortHeader label="Created" column="created" firstOrder="desc" {...sortProps} />
            </TR>
          </THead>
          <TBody>
            {items.map((graph) => (
              <TR key={graph.id} aria-busy={graphs.isPlaceholderData || undefined}>
                <TD className="max-w-72">
                  <Link to={paths.app.graph.getHref(graph.id)} className="font-medium text-ink underline decoration-rule-strong underline-offset-2 hover:decoration-ink">
                    {graph.name}
                  </Link>
                  {graph.upload ? <p className="truncate text-xs text-ink-muted" title={graph.upload.filename}>{graph.upload.filename}</p> : null}
                </TD>
                <TD numeric className="text-ink-soft">{formatBytes(graph.size)}</TD>
                <TD numeric>{formatCount(graph.nodes)}</TD>
                <TD numeric>{formatCount(graph.edges)}</TD>
                <TD>
                  <StatusPill {...GRAPH_STATUS[graph.status]} />
                </TD>
                <TD className="whitespace-nowrap text-ink-soft">{graph.createdBy?.name ?? (graph.isDemo ? "Demo" : "—")}</TD>
                <TD className="num whitespace-nowrap text-ink-soft">
                  <time dateTime={isoOrEmpty(graph.createdAt)}>{formatDateTime(graph.createdAt)}</time>
                </TD>
              </TR>
            ))}
          </TBody>
        </Table>
      )}
      {items.length > 0 || pager.hasPrevious ? (
      <Pager
        label="Graph pages"
        page={pager.page}
        hasPrevious={pager.hasPrevious}
        hasNext={Boolean(graphs.data?.nextCursor)}
        busy={graphs.isFetching && graphs.isPlaceholderData}
        onPrevious={pager.previous}
        onNext={() => graphs.data?.nextCursor && pager.next(graphs.data.nextCursor)}
        summary={
          items.length ? (
            <>
              Showing <span className="num text-ink">{items.length}</span> {items.length === 1 ? "graph" : "graphs"}
            </>
          ) : null
        }
      />
      ) : null}
    </div>
  );
}
