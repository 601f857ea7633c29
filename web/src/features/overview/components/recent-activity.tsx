import { formatDateTime, isoOrEmpty } from "../../../lib/format";
import type { Overview } from "../api/get-overview";

export function RecentActivity({ recent }: { recent: Overview["recent"] }) {
  if (recent.length === 0) return <p className="text-[0.8125rem] text-ink-muted">Uploads, graphs and runs of the team appear here.</p>;
  return (
    <ol aria-label="Recent activity" className="flex flex-col divide-y divide-rule text-[0.8125rem]">
      {recent.map((item) => (
        <li key={item.id} className="grid grid-cols-[8.5rem_1fr] gap-x-3 py-1.5 first:pt-0">
          <time className="num text-xs text-ink-muted" dateTime={isoOrEmpty(item.createdAt)}>
            {formatDateTime(item.createdAt)}
          </time>
          <span className="min-w-0">
            <span className="text-ink">{item.actor ?? "System"}</span>{" "}
            <code className="num rounded-sm bg-paper-sunken px-1 text-xs text-ink-soft">{item.action}</code>{" "}
            <span className="break-words text-ink-soft">{item.target ?? ""}</span>
          </span>
        </li>
      ))}
    </ol>
  );
}
