import clsx from "clsx";
import { formatDateTime, isoOrEmpty } from "../../../lib/format";
import type { RunEvent } from "../api/get-events";

const LEVEL = {
  info: { label: "info", className: "text-ink-muted" },
  warn: { label: "warn", className: "text-amber-strong font-semibold" },
  error: { label: "error", className: "text-danger font-semibold" },
} as const;

/** Newest first, in a bounded scroll area so a long run's log does not push the page down. */
export function EventLog({ events }: { events: RunEvent[] }) {
  if (events.length === 0) return <p className="text-[0.8125rem] text-ink-muted">No events yet.</p>;
  const newestFirst = [...events].reverse();
  return (
    <div tabIndex={0} aria-label="Run events, newest first" className="max-h-80 overflow-y-auto rounded-md border border-rule">
      <ol className="divide-y divide-rule">
        {newestFirst.map((event) => (
          <li key={event.id} className="grid grid-cols-[6.5rem_3rem_1fr] gap-x-3 px-3 py-1.5 text-[0.8125rem]">
            <time className="num text-xs text-ink-muted" dateTime={isoOrEmpty(event.createdAt)} title={formatDateTime(event.createdAt)}>
              {new Date(event.createdAt).toLocaleTimeString("en-GB", { hour12: false })}
            </time>
            <span className={clsx("num text-xs uppercase", LEVEL[event.level].className)}>{LEVEL[event.level].label}</span>
            <span className={clsx("min-w-0 break-words", event.level === "error" ? "text-danger" : "text-ink")}>
              {event.message}
              <span className="num ml-2 text-xs text-ink-muted">{event.kind}</span>
            </span>
          </li>
        ))}
      </ol>
    </div>
  );
}
