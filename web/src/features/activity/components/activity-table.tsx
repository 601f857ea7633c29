import { Button } from "../../../components/ui/button";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { TBody, TD, TH, THead, TR, Table } from "../../../components/ui/table";
import { formatDateTime, isoOrEmpty } from "../../../lib/format";
import { useActivity } from "../api/get-activity";

export function ActivityTable() {
  const activity = useActivity();
  const entries = activity.data.pages.flatMap((page) => page.items);

  if (entries.length === 0) {
    return <EmptyState className="my-3" title="Nothing recorded yet">Sign-ins, invitations, role changes and runs are logged here.</EmptyState>;
  }

  return (
    <div className="flex flex-col gap-3">
      <Table caption="Activity log, newest first" className="-mx-4">
        <THead>
          <TR>
            <TH className="w-44">When</TH>
            <TH>Who</TH>
            <TH>What</TH>
            <TH>On</TH>
          </TR>
        </THead>
        <TBody>
          {entries.map((entry) => (
            <TR key={entry.id}>
              <TD className="num whitespace-nowrap text-ink-soft">
                <time dateTime={isoOrEmpty(entry.createdAt)}>{formatDateTime(entry.createdAt)}</time>
              </TD>
              <TD className="max-w-56 truncate" title={entry.actor?.email}>
                {entry.actor ? entry.actor.name || entry.actor.email : <span className="text-ink-muted">System</span>}
                {entry.viaToken ? <span className="ml-1.5 text-xs text-ink-muted">via token</span> : null}
              </TD>
              <TD>
                <code className="num rounded-sm bg-paper-sunken px-1.5 py-0.5 text-[0.8125rem] text-ink">{entry.action}</code>
              </TD>
              <TD className="max-w-72 truncate text-ink-soft" title={entry.target ?? undefined}>
                {entry.target ?? "—"}
              </TD>
            </TR>
          ))}
        </TBody>
      </Table>
      {activity.isFetchNextPageError ? <ErrorBanner error={activity.error} title="More entries could not be loaded" /> : null}
      <div className="flex items-center justify-between gap-3 text-[0.8125rem] text-ink-muted">
        <p aria-live="polite">
          Showing <span className="num text-ink">{entries.length}</span> {entries.length === 1 ? "entry" : "entries"}
        </p>
        {activity.hasNextPage ? (
          <Button size="sm" busy={activity.isFetchingNextPage} onClick={() => void activity.fetchNextPage()}>
            Load more
          </Button>
        ) : (
          <p>End of the log</p>
        )}
      </div>
    </div>
  );
}
