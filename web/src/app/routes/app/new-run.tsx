import type { QueryClient } from "@tanstack/react-query";
import { useNavigate, useSearchParams } from "react-router-dom";
import { Card } from "../../../components/ui/card";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { Loading } from "../../../components/ui/loading";
import { PageHeader } from "../../../components/ui/page-header";
import { paths } from "../../../config/paths";
import { useSession } from "../../../lib/auth";
import { can } from "../../../lib/authorization";
import { getReadyGraphsQueryOptions, useReadyGraphs } from "../../../features/graphs/api/get-graphs";
import { RunForm } from "../../../features/runs/components/run-form";

export const makeLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(getReadyGraphsQueryOptions());
  return null;
};

export function Component() {
  const session = useSession();
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const graphs = useReadyGraphs();
  const initial = Number(params.get("graph")) || null;

  return (
    <>
      <PageHeader title="New run" description="Choose a graph and the parameters of a ranking run. Every parameter is recorded with the results." />
      {!can(session.role, "runs:submit") ? (
        <EmptyState title="Engineers and admins submit runs">Viewers browse runs, their results and comparisons.</EmptyState>
      ) : graphs.isPending ? (
        <Loading label="Loading ready graphs…" />
      ) : graphs.isError ? (
        <ErrorBanner error={graphs.error} title="Graphs could not be loaded" />
      ) : (
        <Card>
          <RunForm
            graphs={graphs.data.items.map((g) => ({ id: g.id, name: g.name, nodes: g.nodes, edges: g.edges }))}
            initialGraphId={initial}
            onCreated={(id) => navigate(paths.app.run.getHref(id))}
          />
        </Card>
      )}
    </>
  );
}
