import { Bar, BarChart, CartesianGrid, Tooltip, XAxis, YAxis } from "recharts";
import { ChartFrame } from "../../../components/charts/chart-frame";
import { CHART } from "../../../components/charts/chart-theme";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { Loading } from "../../../components/ui/loading";
import { formatCount, formatSci } from "../../../lib/format";
import { useHistogram } from "../api/get-histogram";

export function ScoreHistogram({ runId }: { runId: number }) {
  const histogram = useHistogram(runId, true);
  if (histogram.isPending) return <Loading label="Loading the score distribution…" />;
  if (histogram.isError) return <ErrorBanner error={histogram.error} title="The score distribution could not be loaded" />;
  const h = histogram.data;
  const bars = h.bins.map((bin) => ({ label: formatSci(bin.min, 0), range: `${formatSci(bin.min, 2)} – ${formatSci(bin.max, 2)}`, count: bin.count }));
  const peak = bars.reduce((best, bar) => (bar.count > (best?.count ?? -1) ? bar : best), bars[0]);
  const summary =
    `Score distribution over ${formatCount(h.nodes)} nodes in ${bars.length} logarithmic bins from ${formatSci(h.minScore)} to ${formatSci(h.maxScore)}` +
    (peak ? `; the fullest bin is ${peak.range} with ${formatCount(peak.count)} nodes` : "") +
    (h.zeros ? `; ${formatCount(h.zeros)} nodes score exactly 0.` : ".");
  return (
    <div className="flex flex-col gap-2">
      <ChartFrame title="Nodes per score bin (bins on a log scale)" summary={summary}>
        <BarChart responsive data={bars} style={{ width: "100%", height: 240 }} margin={{ top: 8, right: 12, bottom: 18, left: 4 }} barCategoryGap={2}>
          <CartesianGrid stroke={CHART.grid} strokeDasharray="2 4" vertical={false} />
          <XAxis dataKey="label" tick={CHART.font} stroke={CHART.muted} interval="preserveStartEnd" label={{ value: "score ≥", position: "insideBottom", offset: -10, ...CHART.font }} />
          <YAxis tick={CHART.font} stroke={CHART.muted} width={56} tickFormatter={(v: number) => formatCount(v)} allowDecimals={false} />
          <Tooltip
            formatter={(value) => [formatCount(Number(value)), "nodes"]}
            labelFormatter={(_label, payload) => (payload?.[0]?.payload as { range?: string } | undefined)?.range ?? ""}
            contentStyle={{ fontSize: 12, borderColor: "var(--color-rule-strong)", background: "var(--color-paper-raised)" }}
            cursor={{ fill: "var(--color-paper-sunken)" }}
          />
          <Bar dataKey="count" fill={CHART.ink} isAnimationActive={false} />
        </BarChart>
      </ChartFrame>
      <p className="num text-xs text-ink-muted">
        {formatCount(h.nodes)} nodes · min {formatSci(h.minScore, 3)} · max {formatSci(h.maxScore, 3)}
        {h.zeros ? ` · ${formatCount(h.zeros)} exactly 0` : ""}
      </p>
    </div>
  );
}
