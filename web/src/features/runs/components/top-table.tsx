import { useMemo, useState } from "react";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { Loading } from "../../../components/ui/loading";
import { Pager } from "../../../components/ui/pager";
import { SortHeader, type SortOrder } from "../../../components/ui/sort-header";
import { TBody, TD, TH, THead, TR, Table } from "../../../components/ui/table";
import { formatCount, formatScore, formatSci } from "../../../lib/format";
import { useTop, type TopEntry } from "../api/get-top";

const PAGE = 25;
type Column = "rank" | "score" | "nodeId";

function compare(column: Column, a: TopEntry, b: TopEntry): number {
  if (column === "nodeId") return a.nodeId < b.nodeId ? -1 : a.nodeId > b.nodeId ? 1 : 0;
  if (column === "score") return a.score - b.score || b.rank - a.rank;
  return a.rank - b.rank;
}

/** The stored top-k, sorted and paged in the browser (it is at most a few thousand rows). */
export function TopTable({ runId }: { runId: number }) {
  const top = useTop(runId, true);
  const [sort, setSort] = useState<{ column: Column; order: SortOrder }>({ column: "rank", order: "asc" });
  const [page, setPage] = useState(0);

  const rows = useMemo(() => {
    const items = [...(top.data?.items ?? [])];
    items.sort((a, b) => compare(sort.column, a, b) * (sort.order === "asc" ? 1 : -1));
    return items;
  }, [top.data, sort]);

  if (top.isPending) return <Loading label="Loading the top-k…" />;
  if (top.isError) return <ErrorBanner error={top.error} title="The top-k could not be loaded" />;
  if (rows.length === 0) return <EmptyState title="No ranked positions">This run stored no top-k positions.</EmptyState>;

  const data = top.data;
  const pages = Math.ceil(rows.length / PAGE);
  const shown = rows.slice(page * PAGE, page * PAGE + PAGE);
  const sortProps = {
    sort: sort.column,
    order: sort.order,
    onSort: (column: Column, order: SortOrder) => {
      setSort({ column, order });
      setPage(0);
    },
  };

  return (
    <div className="flex flex-col gap-3">
      <p className="text-[0.8125rem] text-ink-soft">
        {data.errorBound !== null ? (
          <>
            With the certified error bound <span className="num text-ink">{formatSci(data.errorBound)}</span>, a position is{" "}
            <strong className="font-semibold text-ink">certain</strong> when the scores above and below it are more than twice the bound away. Ranks{" "}
            <span className="num text-ink">1–{formatCount(data.certainPrefix)}</span> are all certain
            {data.certainPrefix < data.total ? "; below that, neighbours may swap places" : ""}.
          </>
        ) : (
          "No error bound is recorded for this run, so no position is marked certain."
        )}
      </p>
      <Table caption={`Top ${formatCount(data.total)} nodes by score`} className="-mx-4">
        <THead>
          <TR>
            <SortHeader label="Rank" column="rank" numeric {...sortProps} className="w-24" />
            <SortHeader label="Node id" column="nodeId" {...sortProps} />
            <SortHeader label="Score" column="score" numeric firstOrder="desc" {...sortProps} />
            <TH className="w-32">Position</TH>
          </TR>
        </THead>
        <TBody>
          {shown.map((entry) => (
            <TR key={entry.rank}>
              <TD numeric>{formatCount(entry.rank)}</TD>
              <TD className="num max-w-md truncate" title={entry.nodeId}>
                {entry.nodeId}
              </TD>
              <TD numeric>{formatScore(entry.score)}</TD>
              <TD>
                {entry.certain ? (
                  <span className="inline-flex items-center gap-1 text-xs font-medium text-ok">
                    <span aria-hidden>●</span> certain
                  </span>
                ) : (
                  <span className="inline-flex items-center gap-1 text-xs text-ink-muted" title="A neighbour's score is within twice the error bound">
                    <span aria-hidden>○</span> may swap
                  </span>
                )}
              </TD>
            </TR>
          ))}
        </TBody>
      </Table>
      <Pager
        label="Top-k pages"
        page={page + 1}
        hasPrevious={page > 0}
        hasNext={page + 1 < pages}
        onPrevious={() => setPage((p) => Math.max(0, p - 1))}
        onNext={() => setPage((p) => Math.min(pages - 1, p + 1))}
        summary={
          <>
            Positions <span className="num text-ink">{formatCount(page * PAGE + 1)}–{formatCount(page * PAGE + shown.length)}</span> of{" "}
            <span className="num text-ink">{formatCount(rows.length)}</span>
          </>
        }
      />
    </div>
  );
}
