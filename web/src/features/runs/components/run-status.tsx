import type { ReactNode } from "react";
import { StatusPill } from "../../../components/ui/badge";
import { Figures } from "../../../components/ui/figures";
import { ProgressBar } from "../../../components/ui/progress-bar";
import { formatCount, formatDecimal, formatDuration, formatRate, formatSci, formatSciCompact } from "../../../lib/format";
import { RUN_STATUS } from "../../../lib/status";
import type { Iteration } from "../api/get-iterations";
import type { RunDetail } from "../api/get-run";
import { runProgress } from "../lib/progress";

function Verdict({ run }: { run: RunDetail }) {
  const p = run.parameters;
  const box = (tone: "ok" | "accent" | "danger" | "neutral", children: ReactNode) => (
    <div
      role={tone === "danger" || tone === "accent" ? "alert" : "status"}
      className={
        {
          ok: "border-ok/30 bg-ok-soft text-ok",
          accent: "border-amber bg-amber-soft/70 text-amber-strong",
          danger: "border-danger/40 bg-danger-soft text-danger",
          neutral: "border-rule bg-paper-sunken text-ink-soft",
        }[tone] + " rounded-md border px-3 py-2.5 text-sm"
      }
    >
      {children}
    </div>
  );
  switch (run.status) {
    case "converged":
      return box(
        "ok",
        <>
          <strong className="font-semibold">Converged</strong> after <span className="num">{formatCount(run.iterations)}</span> iterations: residual{" "}
          <span className="num">{formatSci(run.residual)}</span> &lt; tolerance <span className="num">{formatSciCompact(p.tolerance)}</span>. Every score is within{" "}
          <span className="num">{formatSci(run.errorBound)}</span> (L1, all nodes together) of the exact stationary vector.
        </>,
      );
    case "not-converged":
      return box(
        "accent",
        <>
          <strong className="font-semibold">Not converged.</strong> The run stopped at the iteration cap of <span className="num">{formatCount(p.maxIterations)}</span>{" "}
          with residual <span className="num">{formatSci(run.residual)}</span>, still above the tolerance <span className="num">{formatSciCompact(p.tolerance)}</span>. The
          scores are usable with the certified bound <span className="num">{formatSci(run.errorBound)}</span>; raise the cap or loosen the tolerance for a
          converged run.
        </>,
      );
    case "needs-attention":
      return box(
        "accent",
        <>
          <strong className="font-semibold">Needs attention.</strong> {run.statusReason ?? "Shards kept failing after their automatic retries."} Retrying the
          failed shards keeps the residual history.
        </>,
      );
    case "failed":
      return box("danger", <><strong className="font-semibold">Failed.</strong> {run.statusReason ?? "The run stopped with an error."}</>);
    case "canceled":
      return box("neutral", <><strong className="font-semibold">Canceled.</strong> {run.statusReason ?? "Someone canceled this run."}</>);
    default:
      return null;
  }
}

export function RunStatus({ run, iterations }: { run: RunDetail; iterations: Iteration[] }) {
  const p = run.parameters;
  const progress = run.progress;
  const running = run.status === "running";
  const fraction = runProgress(iterations[0]?.residual ?? null, run.residual, p.tolerance, run.iterations, p.maxIterations);
  const finishedFraction = run.status === "converged" ? 1 : fraction;

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        <StatusPill {...RUN_STATUS[run.status]} />
        <p className="num text-[0.9375rem] text-ink">
          Iteration {formatCount(run.iterations)} <span className="text-ink-muted">of at most {formatCount(p.maxIterations)}</span>
        </p>
        {run.status === "queued" ? <p className="text-[0.8125rem] text-ink-muted">Waiting for a worker.</p> : null}
      </div>
      <ProgressBar
        value={run.status === "queued" ? null : finishedFraction}
        label="Progress toward the tolerance"
        valueText={`${Math.round(finishedFraction * 100)} % of the way from the first residual to the tolerance`}
      />
      <Verdict run={run} />
      <Figures
        columns={6}
        items={[
          { label: "Residual ‖xₖ₊₁ − xₖ‖₁", value: formatSci(run.residual), emphasis: true, hint: <>tolerance {formatSciCompact(p.tolerance)}</> },
          { label: "Certified error bound", value: formatSci(run.errorBound), emphasis: true, hint: <>α/(1−α) · residual</> },
          { label: "Contraction rate", value: formatDecimal(progress.contractionRate, 3), hint: <>observed; at most α = {p.damping}</> },
          { label: "Time per iteration", value: formatDuration(progress.perIterationMs) },
          { label: "Edges per second", value: formatRate(progress.edgesPerSecond).replace("/s", "") },
          {
            label: "ETA",
            value: running ? (progress.etaSeconds !== null ? formatDuration(progress.etaSeconds * 1000) : "estimating…") : "—",
            hint: running && progress.iterationsLeft !== null ? `about ${formatCount(progress.iterationsLeft)} iterations left` : undefined,
          },
        ]}
      />
    </div>
  );
}
