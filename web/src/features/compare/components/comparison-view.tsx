import clsx from "clsx";
import { Link } from "react-router-dom";
import { Card } from "../../../components/ui/card";
import { Figures } from "../../../components/ui/figures";
import { TBody, TD, TH, THead, TR, Table } from "../../../components/ui/table";
import { paths } from "../../../config/paths";
import { formatCount, formatDecimal, formatPercent, formatScore } from "../../../lib/format";
import type { Comparison, Mover } from "../api/get-comparison";

function MoversTable({ caption, movers, direction }: { caption: string; movers: Mover[]; direction: "up" | "down" }) {
  if (movers.length === 0) return <p className="px-4 py-3 text-[0.8125rem] text-ink-muted">No node moved {direction}.</p>;
  return (
    <Table caption={caption}>
      <THead>
        <TR>
          <TH>Node id</TH>
          <TH numeric>Rank in A</TH>
          <TH numeric>Rank in B</TH>
          <TH numeric>Change</TH>
        </TR>
      </THead>
      <TBody>
        {movers.map((m) => (
          <TR key={m.nodeId}>
            <TD className="num max-w-64 truncate" title={m.nodeId}>
              {m.nodeId}
            </TD>
            <TD numeric>{formatCount(m.rankA)}</TD>
            <TD numeric>{formatCount(m.rankB)}</TD>
            <TD numeric className={clsx("font-medium", m.change > 0 ? "text-ok" : "text-danger")}>
              <span aria-hidden>{m.change > 0 ? "▲ " : "▼ "}</span>
              {formatCount(Math.abs(m.change))}
              <span className="sr-only">{m.change > 0 ? " places up" : " places down"}</span>
            </TD>
          </TR>
        ))}
      </TBody>
    </Table>
  );
}

function OneSided({ caption, nodes, count }: { caption: string; nodes: Comparison["onlyInA"]; count: number }) {
  if (count === 0) return <p className="px-4 py-3 text-[0.8125rem] text-ink-muted">None.</p>;
  return (
    <div>
      <Table caption={caption}>
        <THead>
          <TR>
            <TH>Node id</TH>
            <TH numeric>Rank</TH>
            <TH numeric>Score</TH>
          </TR>
        </THead>
        <TBody>
          {nodes.map((n) => (
            <TR key={n.nodeId}>
              <TD className="num max-w-64 truncate" title={n.nodeId}>
                {n.nodeId}
              </TD>
              <TD numeric>{formatCount(n.rank)}</TD>
              <TD numeric>{formatScore(n.score)}</TD>
            </TR>
          ))}
        </TBody>
      </Table>
      {count > nodes.length ? <p className="px-4 py-2 text-xs text-ink-muted">The best-ranked {nodes.length} of {formatCount(count)} are listed.</p> : null}
    </div>
  );
}

export function ComparisonView({ comparison: c }: { comparison: Comparison }) {
  const runLink = (run: Comparison["a"], label: string) => (
    <Link to={paths.app.run.getHref(run.id)} className="font-medium text-ink underline decoration-rule-strong underline-offset-2 hover:decoration-ink">
      {label} · run #{run.id}
    </Link>
  );
  return (
    <>
      <p className="text-[0.8125rem] text-ink-soft">
        {runLink(c.a, "A")} on {c.a.graph.name} ({formatCount(c.a.nodes)} nodes) against {runLink(c.b, "B")} on {c.b.graph.name} ({formatCount(c.b.nodes)} nodes).
        Correlations are over the nodes both runs ranked.
      </p>
      <Figures
        columns={6}
        items={[
          { label: "Matched nodes", value: formatCount(c.matchedNodes), emphasis: true, hint: `${formatCount(c.onlyInACount)} only in A · ${formatCount(c.onlyInBCount)} only in B` },
          { label: "Kendall tau-b", value: formatDecimal(c.kendallTau), emphasis: true, hint: "1 = same order" },
          { label: "Spearman rho", value: formatDecimal(c.spearmanRho), emphasis: true, hint: "rank correlation" },
          { label: `Top-${formatCount(c.topK.k)} overlap`, value: formatCount(c.topK.overlap), hint: formatPercent(c.topK.fraction) },
          { label: "Rank-biased overlap", value: formatDecimal(c.rbo.value), hint: `p = ${c.rbo.p}, depth ${formatCount(c.rbo.depth)}` },
          { label: "Graphs", value: c.a.graph.id === c.b.graph.id ? "same" : "different", hint: c.a.graph.id === c.b.graph.id ? c.a.graph.name : `${c.a.graph.name} → ${c.b.graph.name}` },
        ]}
      />
      <div className="grid gap-5 xl:grid-cols-2">
        <Card title="Biggest movers up" description="Ranked higher in B than in A." bodyClassName="p-0">
          <MoversTable caption="Nodes that moved up the most" movers={c.moversUp} direction="up" />
        </Card>
        <Card title="Biggest movers down" description="Ranked lower in B than in A." bodyClassName="p-0">
          <MoversTable caption="Nodes that moved down the most" movers={c.moversDown} direction="down" />
        </Card>
        <Card title="Only in A" description="Nodes that disappeared in B." bodyClassName="p-0">
          <OneSided caption="Nodes ranked only in run A" nodes={c.onlyInA} count={c.onlyInACount} />
        </Card>
        <Card title="Only in B" description="Nodes that appeared in B." bodyClassName="p-0">
          <OneSided caption="Nodes ranked only in run B" nodes={c.onlyInB} count={c.onlyInBCount} />
        </Card>
      </div>
    </>
  );
}
