import { Figures } from "../../../components/ui/figures";
import { formatBytes, formatCount, formatSci } from "../../../lib/format";
import type { GraphOptions, GraphStatistics } from "../api/get-graph";

function weightRange(statistics: GraphStatistics): string {
  if (!statistics.weight) return statistics.weighted ? "—" : "1 (unweighted)";
  const { min, max } = statistics.weight;
  const show = (v: number) => (Number.isInteger(v) && Math.abs(v) < 1e9 ? formatCount(v) : formatSci(v, 3));
  return `${show(min)} – ${show(max)}`;
}

const DELIMITER_NAMES: Record<string, string> = { ",": "comma", "\t": "tab", " ": "spaces", ";": "semicolon" };

export function ValidationReport({ statistics, options }: { statistics: GraphStatistics; options: GraphOptions }) {
  const format = statistics.format;
  const formatText = format
    ? [
        format.delimiter !== undefined ? `${DELIMITER_NAMES[format.delimiter] ?? JSON.stringify(format.delimiter)}-separated` : null,
        format.columns ? `${format.columns} columns` : null,
        format.header === undefined ? null : format.header ? "header row" : "no header",
        format.gzip ? "gzip" : null,
      ]
        .filter(Boolean)
        .join(", ")
    : null;

  return (
    <div className="flex flex-col gap-3">
      <Figures
        columns={4}
        items={[
          { label: "Rows read", value: formatCount(statistics.rows), hint: `${formatCount(statistics.lines)} lines in the file` },
          { label: "Nodes", value: formatCount(statistics.nodes), emphasis: true },
          { label: "Edges", value: formatCount(statistics.edges), emphasis: true },
          { label: "Id kind", value: statistics.idKind === "integer" ? "integer" : "string" },
          {
            label: "Self-loops",
            value: formatCount(statistics.selfLoops),
            hint: statistics.selfLoops ? (options.selfLoops === "drop" ? `${formatCount(statistics.selfLoopsDropped)} dropped` : "kept") : undefined,
          },
          {
            label: "Duplicate edges",
            value: formatCount(statistics.duplicates),
            hint: statistics.duplicates ? (options.duplicates === "merge" ? "merged, weights summed" : "kept") : undefined,
          },
          { label: "Dangling nodes", value: formatCount(statistics.danglingNodes), hint: "no out-edges" },
          { label: "Weight range", value: weightRange(statistics) },
          { label: "Bad lines", value: formatCount(statistics.badLines), hint: options.maxBadLines ? `${formatCount(options.maxBadLines)} allowed` : "none allowed" },
          { label: "Comment and blank lines", value: formatCount(statistics.commentLines + statistics.blankLines) },
          { label: "Max in-degree", value: formatCount(statistics.maxInDegree) },
          { label: "Max out-degree", value: formatCount(statistics.maxOutDegree) },
        ]}
      />
      <p className="text-xs text-ink-muted">
        {formatText ? <>Read as {formatText}. </> : null}
        {statistics.bytesRead !== undefined ? <>{formatBytes(statistics.bytesRead)} parsed. </> : null}
        Edges are {options.directed ? "directed (source → target)" : "undirected: each line added both directions"}.
      </p>
      {statistics.warnings?.length ? (
        <ul className="list-disc pl-5 text-[0.8125rem] text-amber-strong">
          {statistics.warnings.map((warning) => (
            <li key={warning}>{warning}</li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
