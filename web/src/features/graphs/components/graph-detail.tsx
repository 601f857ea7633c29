import { Card } from "../../../components/ui/card";
import { FactList } from "../../../components/ui/figures";
import { formatBytes, formatDateTime, formatDuration, elapsedMs, isoOrEmpty } from "../../../lib/format";
import type { GraphDetail as Graph } from "../api/get-graph";
import { BadLinesTable } from "./bad-lines-table";
import { DegreePlot } from "./degree-plot";
import { IngestProgress } from "./ingest-progress";
import { RejectionPanel } from "./rejection-panel";
import { ValidationReport } from "./validation-report";

export function GraphDetail({ graph, canRetry }: { graph: Graph; canRetry: boolean }) {
  const live = graph.status === "queued" || graph.status === "ingesting";
  return (
    <>
      {live ? (
        <Card title="Ingest" description="A worker is reading the upload; this page follows it live.">
          <IngestProgress graph={graph} />
        </Card>
      ) : null}
      {graph.status === "rejected" ? (
        <Card title="Rejected">
          <RejectionPanel graph={graph} canRetry={canRetry} />
        </Card>
      ) : null}
      {graph.statistics ? (
        <Card title="Validation report">
          <ValidationReport statistics={graph.statistics} options={graph.options} />
        </Card>
      ) : null}
      {graph.problems.length > 0 ? (
        <Card title="Bad lines" description="Lines that could not be read, with their line number in the file and the reason." bodyClassName="px-4 pt-1 pb-3">
          <BadLinesTable problems={graph.problems} total={graph.statistics?.badLines ?? graph.problems.length} />
        </Card>
      ) : null}
      {graph.statistics ? (
        <Card title="Degrees">
          <DegreePlot inDegree={graph.statistics.inDegree} outDegree={graph.statistics.outDegree} />
        </Card>
      ) : null}
      <Card title="Source">
        <FactList
          items={[
            { label: "File", value: graph.upload ? <span className="num">{graph.upload.filename}</span> : "—" },
            { label: "Size", value: <span className="num">{formatBytes(graph.size)}</span> },
            { label: "Fingerprint", value: <span className="num text-xs break-all">{graph.fingerprint ?? "—"}</span> },
            { label: "Created", value: <time className="num" dateTime={isoOrEmpty(graph.createdAt)}>{formatDateTime(graph.createdAt)}</time> },
            {
              label: "Ingest time",
              value: <span className="num">{graph.ingestStartedAt ? formatDuration(elapsedMs(graph.ingestStartedAt, graph.finishedAt)) : "—"}</span>,
            },
            { label: "Created by", value: graph.createdBy?.name ?? (graph.isDemo ? "Demo data" : "—") },
          ]}
        />
      </Card>
    </>
  );
}
