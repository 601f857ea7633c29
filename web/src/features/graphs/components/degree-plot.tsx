import { CartesianGrid, Line, LineChart, Tooltip, XAxis, YAxis } from "recharts";
import { ChartFrame, LegendKey } from "../../../components/charts/chart-frame";
import { CHART, decadeLabel, decadeTicks } from "../../../components/charts/chart-theme";
import { formatCount } from "../../../lib/format";
import type { DegreeBin } from "../api/get-graph";

type Point = { degree: number; nodes: number | null; min: number; max: number };

/**
 * Log bins drawn at their geometric centre. Empty bins stay in as gaps (null) so no line is drawn across them;
 * degree 0 has no place on a log axis and is reported in words instead.
 */
function toPoints(bins: DegreeBin[]): Point[] {
  const drawn = bins.filter((bin) => bin.min >= 1);
  const last = drawn.findLastIndex((bin) => bin.count > 0);
  return drawn
    .slice(0, last + 1)
    .map((bin) => ({ degree: Math.sqrt(bin.min * Math.max(bin.min, bin.max)), nodes: bin.count > 0 ? bin.count : null, min: bin.min, max: bin.max }));
}

function zeroCount(bins: DegreeBin[]): number {
  return bins.filter((bin) => bin.max < 1).reduce((sum, bin) => sum + bin.count, 0);
}

export function DegreePlot({ inDegree, outDegree }: { inDegree: DegreeBin[]; outDegree: DegreeBin[] }) {
  const inPoints = toPoints(inDegree);
  const outPoints = toPoints(outDegree);
  const all = [...inPoints, ...outPoints].filter((p): p is Point & { nodes: number } => p.nodes !== null);
  if (all.length === 0) return <p className="text-[0.8125rem] text-ink-muted">No node has an edge, so there is no degree distribution to draw.</p>;
  // Degrees and counts are whole numbers ≥ 1: the axes start at 1 and span at least one decade.
  const xTicks = decadeTicks(Math.max(1, Math.min(...all.map((p) => p.min))), Math.max(10, ...all.map((p) => p.max)));
  const yTicks = decadeTicks(1, Math.max(10, ...all.map((p) => p.nodes)));
  const summary =
    `Log-log degree distribution. In-degree: ${inPoints.filter((p) => p.nodes).length} bins, highest bin up to degree ${formatCount(inPoints.at(-1)?.max)}; ` +
    `out-degree: ${outPoints.filter((p) => p.nodes).length} bins, highest bin up to degree ${formatCount(outPoints.at(-1)?.max)}. ` +
    `${formatCount(zeroCount(inDegree))} nodes have no in-edges and ${formatCount(zeroCount(outDegree))} have no out-edges.`;

  return (
    <ChartFrame
      title="Degree distribution (log-log): nodes per degree bin"
      summary={summary}
      legend={
        <>
          <LegendKey color={CHART.ink} label="in-degree" />
          <LegendKey color={CHART.amber} label="out-degree" dashed />
        </>
      }
    >
      <LineChart responsive style={{ width: "100%", height: 260 }} margin={{ top: 8, right: 16, bottom: 18, left: 4 }}>
        <CartesianGrid stroke={CHART.grid} strokeDasharray="2 4" />
        <XAxis
          dataKey="degree"
          type="number"
          scale="log"
          domain={[(xTicks[0] ?? 1) / 1.6, (xTicks.at(-1) ?? 10) * 1.6]}
          ticks={xTicks}
          tickFormatter={decadeLabel}
          tick={CHART.font}
          stroke={CHART.muted}
          allowDuplicatedCategory={false}
          label={{ value: "degree", position: "insideBottom", offset: -10, ...CHART.font }}
        />
        <YAxis
          dataKey="nodes"
          type="number"
          scale="log"
          domain={[(yTicks[0] ?? 1) / 1.6, (yTicks.at(-1) ?? 10) * 1.6]}
          ticks={yTicks}
          tickFormatter={decadeLabel}
          tick={CHART.font}
          stroke={CHART.muted}
          width={44}
        />
        <Tooltip
          formatter={(value, name) => [formatCount(Number(value)), name]}
          labelFormatter={(_label, payload) => {
            const point = payload?.[0]?.payload as Point | undefined;
            return point ? `degree ${formatCount(point.min)}–${formatCount(point.max)}` : "";
          }}
          contentStyle={{ fontSize: 12, borderColor: "var(--color-rule-strong)", background: "var(--color-paper-raised)" }}
        />
        <Line data={inPoints} dataKey="nodes" name="in-degree" stroke={CHART.ink} strokeWidth={2} dot={{ r: 3, fill: CHART.ink, strokeWidth: 0 }} connectNulls={false} isAnimationActive={false} />
        <Line data={outPoints} dataKey="nodes" name="out-degree" stroke={CHART.amber} strokeWidth={2} strokeDasharray="5 3" dot={{ r: 3, fill: CHART.amber, strokeWidth: 0, strokeDasharray: "0" }} connectNulls={false} isAnimationActive={false} />
      </LineChart>
    </ChartFrame>
  );
}
