import type { GraphStatus } from "#contracts/graphs";
import type { RunStatus } from "#contracts/runs";
import type { Tone } from "../components/ui/badge";

type ShardState = "queued" | "running" | "done" | "retrying" | "failed";

// Every state has a word as well as a tone: colour alone never carries the meaning.
export const GRAPH_STATUS: Record<GraphStatus, { label: string; tone: Tone }> = {
  queued: { label: "Queued", tone: "neutral" },
  ingesting: { label: "Ingesting", tone: "ink" },
  ready: { label: "Ready", tone: "ok" },
  rejected: { label: "Rejected", tone: "danger" },
};

export const RUN_STATUS: Record<RunStatus, { label: string; tone: Tone }> = {
  queued: { label: "Queued", tone: "neutral" },
  running: { label: "Running", tone: "ink" },
  converged: { label: "Converged", tone: "ok" },
  "not-converged": { label: "Not converged", tone: "accent" },
  "needs-attention": { label: "Needs attention", tone: "accent" },
  canceled: { label: "Canceled", tone: "neutral" },
  failed: { label: "Failed", tone: "danger" },
};

export const SHARD_STATE: Record<ShardState, { label: string; tone: Tone }> = {
  queued: { label: "Queued", tone: "neutral" },
  running: { label: "Running", tone: "ink" },
  done: { label: "Done", tone: "ok" },
  retrying: { label: "Retrying", tone: "accent" },
  failed: { label: "Failed", tone: "danger" },
};

/** Runs whose figures still change: pages poll them. */
export const isLiveRun = (status: RunStatus) => status === "queued" || status === "running";
export const isLiveGraph = (status: GraphStatus) => status === "queued" || status === "ingesting";
