import { useSearchParams } from "react-router-dom";
import { RunStatusSchema } from "#contracts/runs";
import { Card } from "../../../components/ui/card";
import { PageHeader } from "../../../components/ui/page-header";
import { useGraphs } from "../../../features/graphs/api/get-graphs";
import type { RunFilter } from "../../../features/runs/api/get-runs";
import { RunsTable } from "../../../features/runs/components/runs-table";

export function Component() {
  const [params, setParams] = useSearchParams();
  const status = RunStatusSchema.safeParse(params.get("status"));
  const graphId = Number(params.get("graph")) || undefined;
  const filter: RunFilter = { status: status.success ? status.data : undefined, graphId };
  const graphs = useGraphs({ sort: "name", order: "asc", status: "ready" }, null);

  function onFilterChange(next: RunFilter) {
    const search = new URLSearchParams();
    if (next.status) search.set("status", next.status);
    if (next.graphId) search.set("graph", String(next.graphId));
    setParams(search, { replace: true });
  }

  return (
    <>
      <PageHeader title="Runs" description="Every ranking run of this team, its state and how close it came to convergence." />
      <Card bodyClassName="px-4 pt-3 pb-3">
        <RunsTable filter={filter} onFilterChange={onFilterChange} graphs={graphs.data?.items ?? []} caption="Ranking runs of this team" />
      </Card>
    </>
  );
}
