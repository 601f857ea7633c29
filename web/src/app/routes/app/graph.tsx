import type { QueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { Link, useNavigate, useParams, type LoaderFunctionArgs } from "react-router-dom";
import { Region } from "../../../components/errors/region";
import { StatusPill } from "../../../components/ui/badge";
import { Button, buttonClasses } from "../../../components/ui/button";
import { Card } from "../../../components/ui/card";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { PageHeader } from "../../../components/ui/page-header";
import { paths } from "../../../config/paths";
import { useSession } from "../../../lib/auth";
import { can } from "../../../lib/authorization";
import { idParam } from "../../../lib/params";
import { GRAPH_STATUS } from "../../../lib/status";
import { useDeleteGraph } from "../../../features/graphs/api/delete-graph";
import { getGraphQueryOptions, useGraph, type GraphDetail as Graph } from "../../../features/graphs/api/get-graph";
import { GraphDetail } from "../../../features/graphs/components/graph-detail";
import { RunsTable } from "../../../features/runs/components/runs-table";

export const makeLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  void queryClient.prefetchQuery(getGraphQueryOptions(idParam(params.graphId)));
  return null;
};

function DeleteGraph({ graph }: { graph: Graph }) {
  const remove = useDeleteGraph();
  const navigate = useNavigate();
  const [confirming, setConfirming] = useState(false);
  if (!confirming) {
    return (
      <Button variant="danger" onClick={() => setConfirming(true)}>
        Delete graph
      </Button>
    );
  }
  return (
    <div className="flex flex-col items-end gap-2">
      <div className="flex items-center gap-2">
        <span className="text-[0.8125rem] text-ink-soft">Delete “{graph.name}” and its stored graph?</span>
        <Button variant="danger" busy={remove.isPending} onClick={() => remove.mutate({ id: graph.id }, { onSuccess: () => navigate(paths.app.graphs.getHref()) })}>
          Confirm delete
        </Button>
        <Button variant="quiet" onClick={() => setConfirming(false)}>
          Keep it
        </Button>
      </div>
      {remove.isError ? <ErrorBanner error={remove.error} title="The graph was not deleted" /> : null}
    </div>
  );
}

function GraphPage({ id }: { id: number }) {
  const { data: graph } = useGraph(id);
  const session = useSession();
  const canSubmit = can(session.role, "runs:submit");
  const canChange = session.role === "admin" || (can(session.role, "graphs:delete") && graph.createdBy?.userId === session.user.id);

  return (
    <>
      <PageHeader
        eyebrow={`Graph #${graph.id}`}
        title={graph.name}
        description={
          <span className="inline-flex items-center gap-2">
            <StatusPill {...GRAPH_STATUS[graph.status]} />
            {graph.upload ? <span className="num">{graph.upload.filename}</span> : null}
          </span>
        }
        actions={
          <>
            {canChange && graph.status !== "ingesting" ? <DeleteGraph graph={graph} /> : null}
            {canSubmit && graph.status === "ready" ? (
              <Link to={paths.app.newRun.getHref(graph.id)} className={buttonClasses("primary", "md")}>
                New run
              </Link>
            ) : null}
          </>
        }
      />
      <GraphDetail graph={graph} canRetry={canChange || session.role === "admin"} />
      {graph.status === "ready" || graph.runCount > 0 ? (
        <Card title="Runs on this graph" bodyClassName="px-4 pt-1 pb-3">
          <RunsTable filter={{ graphId: graph.id }} caption={`Runs on ${graph.name}`} emptyHint="No run has used this graph yet." />
        </Card>
      ) : null}
    </>
  );
}

export function Component() {
  const id = idParam(useParams().graphId);
  return (
    <Region loadingLabel="Loading the graph…" errorTitle="The graph could not be loaded">
      <GraphPage id={id} />
    </Region>
  );
}
