import { formatBytes } from "../../../lib/format";
import type { RunDetail } from "../api/get-run";

const FORMATS = {
  csv: { label: "CSV", note: "node_id,score,rank" },
  arrow: { label: "Arrow IPC", note: "columnar, for dataframes" },
  parquet: { label: "Parquet", note: "compressed columnar" },
} as const;

/** Score files of every node; the same addresses serve scripts that send an API token. */
export function Downloads({ run }: { run: RunDetail }) {
  if (run.files.length === 0) {
    return <p className="text-[0.8125rem] text-ink-muted">Score files appear here when the run finishes with scores.</p>;
  }
  const csv = run.files.find((f) => f.format === "csv");
  return (
    <div className="flex flex-col gap-3">
      <ul aria-label="Score files" className="flex flex-wrap gap-2">
        {run.files.map((file) => (
          <li key={file.format}>
            <a
              href={file.url}
              download
              className="flex flex-col rounded-md border border-rule-strong bg-paper-raised px-3 py-2 hover:border-ink-muted hover:bg-paper-sunken"
            >
              <span className="text-sm font-medium text-ink">Download {FORMATS[file.format].label}</span>
              <span className="num text-xs text-ink-muted">
                {formatBytes(file.bytes)} · {FORMATS[file.format].note}
              </span>
            </a>
          </li>
        ))}
      </ul>
      {csv ? (
        <p className="text-xs text-ink-muted">
          From a script: <code className="num rounded-sm bg-paper-sunken px-1 py-0.5 text-ink">curl -H &quot;Authorization: Bearer $TOKEN&quot; -O {window.location.origin}{csv.url}</code>. Range
          requests resume a broken download.
        </p>
      ) : null}
    </div>
  );
}
