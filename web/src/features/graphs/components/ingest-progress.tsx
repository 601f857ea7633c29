import { ProgressBar } from "../../../components/ui/progress-bar";
import { formatBytes, formatCount, formatRate } from "../../../lib/format";
import type { GraphDetail } from "../api/get-graph";

const PHASES = { parse: "Reading the file", build: "Building the graph", store: "Writing the graph store" } as const;

export function IngestProgress({ graph }: { graph: GraphDetail }) {
  const progress = graph.progress;
  if (graph.status === "queued" || !progress) {
    return (
      <div className="flex flex-col gap-2">
        <ProgressBar value={null} label="Ingest progress" valueText="Waiting for a worker" />
        <p className="text-[0.8125rem] text-ink-muted" role="status">
          {graph.status === "queued" ? "Queued: waiting for a free worker to read the file." : "Starting…"}
        </p>
      </div>
    );
  }
  const fraction = progress.totalBytes > 0 ? progress.bytesRead / progress.totalBytes : null;
  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-baseline justify-between gap-2 text-[0.8125rem]">
        <span className="font-medium text-ink">{PHASES[progress.phase]}</span>
        <span className="num text-ink-soft">
          {formatBytes(progress.bytesRead)} of {formatBytes(progress.totalBytes)}
          {fraction !== null ? ` · ${(fraction * 100).toFixed(0)} %` : ""}
        </span>
      </div>
      <ProgressBar
        value={progress.phase === "parse" ? fraction : null}
        label="Ingest progress"
        valueText={`${PHASES[progress.phase]}: ${formatBytes(progress.bytesRead)} of ${formatBytes(progress.totalBytes)}`}
      />
      <p className="num text-xs text-ink-muted" aria-live="off">
        {formatCount(progress.rows)} rows · {formatRate(progress.rowsPerSecond).replace("/s", " rows/s")}
      </p>
    </div>
  );
}
