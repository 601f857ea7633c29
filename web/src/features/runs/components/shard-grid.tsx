import clsx from "clsx";
import { formatCount, formatDateTime } from "../../../lib/format";
import { SHARD_STATE } from "../../../lib/status";
import type { Shard } from "../api/get-shards";

const STRIP: Record<Shard["state"], string> = {
  queued: "bg-rule-strong",
  running: "bg-ink",
  done: "bg-ok",
  retrying: "bg-amber",
  failed: "bg-danger",
};

/** One tile per shard: its state in a word and a colour strip, attempts, the worker holding it and its last error. */
export function ShardGrid({ shards }: { shards: Shard[] }) {
  if (shards.length === 0) return <p className="text-[0.8125rem] text-ink-muted">Shards appear when a worker starts the run.</p>;
  const counts = shards.reduce<Record<string, number>>((acc, s) => ({ ...acc, [s.state]: (acc[s.state] ?? 0) + 1 }), {});
  return (
    <div className="flex flex-col gap-3">
      <p className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-muted" aria-live="polite">
        {(["done", "running", "retrying", "queued", "failed"] as const)
          .filter((state) => counts[state])
          .map((state) => (
            <span key={state} className="inline-flex items-center gap-1.5">
              <span aria-hidden className={clsx("size-2 rounded-sm", STRIP[state])} />
              <span className="num text-ink">{counts[state]}</span> {SHARD_STATE[state].label.toLowerCase()}
            </span>
          ))}
      </p>
      <ul aria-label="Shards" className="grid grid-cols-[repeat(auto-fill,minmax(11.5rem,1fr))] gap-2">
        {shards.map((shard) => (
          <li
            key={shard.shard}
            aria-label={`Shard ${shard.shard}: ${SHARD_STATE[shard.state].label}`}
            className={clsx(
              "relative overflow-hidden rounded-md border bg-paper-raised py-1.5 pr-2 pl-3 text-xs",
              shard.state === "failed" ? "border-danger/50" : shard.state === "retrying" ? "border-amber" : "border-rule",
            )}
          >
            <span aria-hidden className={clsx("absolute inset-y-0 left-0 w-1", STRIP[shard.state], shard.state === "running" && "animate-pulse")} />
            <div className="flex items-baseline justify-between gap-2">
              <span className="num font-medium text-ink">#{shard.shard}</span>
              <span className={clsx("font-medium", shard.state === "failed" ? "text-danger" : shard.state === "retrying" ? "text-amber-strong" : "text-ink-soft")}>
                {SHARD_STATE[shard.state].label}
              </span>
            </div>
            <div className="num mt-0.5 flex justify-between gap-2 text-ink-muted">
              <span title={`nodes ${shard.vertexStart}–${shard.vertexEnd - 1}`}>{formatCount(shard.edgeCount)} edges</span>
              <span title="attempts">×{shard.attempts}</span>
            </div>
            <div className="num truncate text-ink-muted" title={shard.worker ?? undefined}>
              {shard.worker ?? "no worker"} · {formatDateTime(shard.updatedAt).slice(11)}
            </div>
            {shard.lastError ? (
              <p className={clsx("mt-1 line-clamp-2", shard.state === "done" ? "text-ink-muted" : "text-danger")} title={shard.lastError}>
                {shard.state === "done" ? "earlier: " : ""}
                {shard.lastError}
              </p>
            ) : null}
          </li>
        ))}
      </ul>
    </div>
  );
}
