import { CartesianGrid, Line, LineChart, ReferenceLine, Tooltip, XAxis, YAxis } from "recharts";
import { ChartFrame, LegendKey } from "../../../components/charts/chart-frame";
import { CHART, decadeLabel, decadeTicks, niceTicks } from "../../../components/charts/chart-theme";
import { formatSci } from "../../../lib/format";
import type { Iteration } from "../api/get-iterations";

type Props = { iterations: Iteration[]; tolerance: number; boundFactor: number };

/** Residual per iteration on a log axis, the tolerance it must get under, and the certified bound that follows from it. */
export function ConvergenceChart({ iterations, tolerance, boundFactor }: Props) {
  const points = iterations.filter((it) => it.residual > 0).map((it) => ({ k: it.k, residual: it.residual, bound: it.residual * boundFactor }));
  if (points.length === 0) {
    return <p className="py-10 text-center text-[0.8125rem] text-ink-muted">The chart starts with the first iteration.</p>;
  }
  // One decade of room under the tolerance so its line never sits on the axis.
  const values = points.flatMap((p) => [p.residual, p.bound]).concat(tolerance / 10);
  const yTicks = decadeTicks(Math.min(...values), Math.max(...values));
  const lastK = points.at(-1)?.k ?? 1;
  const xTicks = niceTicks(Math.max(lastK, 5));
  const last = points.at(-1);
  const summary =
    `Residual by iteration on a log scale: ${points.length} iterations, from ${formatSci(points[0]?.residual)} at k=${points[0]?.k} ` +
    `to ${formatSci(last?.residual)} at k=${last?.k}; tolerance ${formatSci(tolerance)}; certified bound ${formatSci(last?.bound)}.`;

  return (
    <ChartFrame
      title="L1 residual per iteration (log scale)"
      summary={summary}
      legend={
        <>
          <LegendKey color={CHART.ink} label="residual ‖xₖ₊₁ − xₖ‖₁" />
          <LegendKey color={CHART.muted} label="certified bound" dashed />
          <LegendKey color={CHART.amberStrong} label="tolerance" dashed />
        </>
      }
    >
      <LineChart responsive data={points} style={{ width: "100%", height: 300 }} margin={{ top: 10, right: 20, bottom: 18, left: 4 }}>
        <CartesianGrid stroke={CHART.grid} strokeDasharray="2 4" />
        <XAxis
          dataKey="k"
          type="number"
          domain={[0, xTicks.at(-1) ?? lastK]}
          ticks={xTicks}
          allowDecimals={false}
          tick={CHART.font}
          stroke={CHART.muted}
          label={{ value: "iteration k", position: "insideBottom", offset: -10, ...CHART.font }}
        />
        <YAxis
          type="number"
          scale="log"
          domain={[yTicks[0] ?? tolerance, yTicks.at(-1) ?? 1]}
          ticks={yTicks}
          tickFormatter={decadeLabel}
          allowDataOverflow
          tick={CHART.font}
          stroke={CHART.muted}
          width={48}
        />
        <Tooltip
          formatter={(value, name) => [formatSci(Number(value), 3), name]}
          labelFormatter={(label) => `iteration ${label}`}
          contentStyle={{ fontSize: 12, borderColor: "var(--color-rule-strong)", background: "var(--color-paper-raised)" }}
        />
        <ReferenceLine y={tolerance} stroke={CHART.amberStrong} strokeDasharray="6 4" strokeWidth={1.5} ifOverflow="extendDomain" />
        <Line dataKey="bound" name="certified bound" stroke={CHART.muted} strokeDasharray="4 3" strokeWidth={1.25} dot={false} isAnimationActive={false} />
        <Line dataKey="residual" name="residual" stroke={CHART.ink} strokeWidth={2} dot={points.length <= 60 ? { r: 2 } : false} isAnimationActive={false} />
      </LineChart>
    </ChartFrame>
  );
}
