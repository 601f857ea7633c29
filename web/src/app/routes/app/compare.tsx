import { useSearchParams } from "react-router-dom";
import { Card } from "../../../components/ui/card";
import { Caution } from "../../../components/ui/caution";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { Loading } from "../../../components/ui/loading";
import { PageHeader } from "../../../components/ui/page-header";
import { formatDateTime } from "../../../lib/format";
import { useComparison } from "../../../features/compare/api/get-comparison";
import { ComparePicker } from "../../../features/compare/components/compare-picker";
import { ComparisonView } from "../../../features/compare/components/comparison-view";
import { useRuns } from "../../../features/runs/api/get-runs";

export function Component() {
  const [params, setParams] = useSearchParams();
  const a = Number(params.get("a")) || null;
  const b = Number(params.get("b")) || null;
  const runs = useRuns({ status: "converged" }, null, 200);
  const notConverged = useRuns({ status: "not-converged" }, null, 200);
  const comparison = useComparison(a, b);
  const choices = [...(runs.data?.items ?? []), ...(notConverged.data?.items ?? [])]
    .sort((x, y) => y.id - x.id)
    .map((run) => ({ id: run.id, label: `#${run.id} · ${run.graph.name} · ${formatDateTime(run.finishedAt ?? run.createdAt)}` }));

  return (
    <>
      <PageHeader title="Compare" description="How two rankings differ over the nodes they share: rank correlations, top-k overlap and the nodes that moved." />
      <Card>
        <ComparePicker key={`${a}-${b}`} runs={choices} a={a} b={b} onCompare={(x, y) => setParams({ a: String(x), b: String(y) })} />
      </Card>
      {a === null || b === null ? (
        <EmptyState title="Pick two finished runs">For example last week&apos;s crawl against this week&apos;s, or a uniform run against a seeded one.</EmptyState>
      ) : a === b ? (
        <EmptyState title="Pick two different runs">A run compared with itself agrees perfectly.</EmptyState>
      ) : comparison.isPending ? (
        <Loading label="Comparing the two rankings…" />
      ) : comparison.isError ? (
        <ErrorBanner error={comparison.error} title="The runs could not be compared" />
      ) : (
        <>
          <ComparisonView comparison={comparison.data} />
          <Caution />
        </>
      )}
    </>
  );
}
