import { FactList } from "../../../components/ui/figures";
import { elapsedMs, formatCount, formatDateTime, formatDuration, formatSciCompact } from "../../../lib/format";
import type { RunDetail } from "../api/get-run";

const num = (text: string) => <span className="num">{text}</span>;

export function RunParameters({ run }: { run: RunDetail }) {
  const p = run.parameters;
  const seeds = p.teleport.kind === "seeds" ? p.teleport.seeds : null;
  return (
    <div className="flex flex-col gap-3">
      <FactList
        items={[
          { label: "Damping α", value: <>{num(String(p.damping))} <span className="text-ink-muted">(teleport {num(String(+(1 - p.damping).toFixed(6)))})</span></> },
          { label: "Tolerance", value: num(formatSciCompact(p.tolerance)) },
          { label: "Iteration cap", value: num(formatCount(p.maxIterations)) },
          { label: "Dangling mass to", value: p.dangling === "teleport" ? "the teleport vector" : "every node equally" },
          { label: "Teleport", value: seeds ? `${formatCount(seeds.length)} trusted seed ${seeds.length === 1 ? "node" : "nodes"}` : "uniform over all nodes" },
          { label: "Edge weights", value: p.weighted ? "used" : "ignored (every edge weighs 1)" },
          { label: "Shards", value: p.shards === "auto" ? "automatic" : num(String(p.shards)) },
          { label: "Top-k size", value: num(formatCount(p.topK)) },
          { label: "E-mail when done", value: run.notify ? "yes" : "no" },
        ]}
      />
      {seeds ? (
        <details className="text-[0.8125rem]">
          <summary className="cursor-pointer text-ink-soft">Seed list</summary>
          <ul className="num mt-1 max-h-40 overflow-y-auto rounded-md border border-rule bg-paper-sunken px-3 py-1.5 text-xs">
            {seeds.map((seed) => (
              <li key={seed.node} className="break-all">
                {seed.node}
                {seed.weight !== 1 ? <span className="text-ink-muted">, {seed.weight}</span> : null}
              </li>
            ))}
          </ul>
        </details>
      ) : null}
    </div>
  );
}

export function RunProvenance({ run }: { run: RunDetail }) {
  const t = run.timings ?? {};
  return (
    <FactList
      items={[
        { label: "Graph", value: <>{run.graph.name} <span className="num text-ink-muted">· {formatCount(run.graph.nodes)} nodes · {formatCount(run.graph.edges)} edges</span></> },
        { label: "Stop reason", value: run.stopReason ?? "—" },
        { label: "Input fingerprint", value: <span className="num text-xs break-all">{run.inputFingerprint ?? "—"}</span> },
        { label: "Software version", value: num(run.softwareVersion ?? "—") },
        { label: "Submitted", value: <>{num(formatDateTime(run.createdAt))} by {run.createdBy?.name ?? "—"}</> },
        { label: "Started", value: num(formatDateTime(run.startedAt)) },
        { label: "Finished", value: num(formatDateTime(run.finishedAt)) },
        { label: "Waited in queue", value: num(formatDuration(t.queuedMs ?? elapsedMs(run.createdAt, run.startedAt))) },
        { label: "Graph load", value: num(formatDuration(t.loadMs)) },
        { label: "Iterating", value: num(`${formatDuration(t.iterateMs)}${t.perIterationMs ? ` (${formatDuration(t.perIterationMs)} each)` : ""}`) },
        { label: "Writing scores", value: num(formatDuration(t.writeMs)) },
        { label: "Total", value: num(formatDuration(t.totalMs ?? (run.startedAt ? elapsedMs(run.startedAt, run.finishedAt) : null))) },
        { label: "Attempts", value: num(formatCount(run.attempts)) },
      ]}
    />
  );
}
