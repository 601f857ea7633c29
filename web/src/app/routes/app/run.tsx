import type { QueryClient } from "@tanstack/react-query";
import { useEffect, useRef } from "react";
import { Link, useLocation, useNavigate, useParams, type LoaderFunctionArgs } from "react-router-dom";
import { Region } from "../../../components/errors/region";
import { buttonClasses } from "../../../components/ui/button";
import { Card } from "../../../components/ui/card";
import { Caution } from "../../../components/ui/caution";
import { PageHeader } from "../../../components/ui/page-header";
import { LinkTabs } from "../../../components/ui/tabs";
import { paths } from "../../../config/paths";
import { useSession } from "../../../lib/auth";
import { can } from "../../../lib/authorization";
import { idParam } from "../../../lib/params";
import { useRunEvents } from "../../../features/runs/api/get-events";
import { useIterations } from "../../../features/runs/api/get-iterations";
import { getRunQueryOptions, runIsMoving, useRun, type RunDetail } from "../../../features/runs/api/get-run";
import { useShards } from "../../../features/runs/api/get-shards";
import { ConvergenceChart } from "../../../features/runs/components/convergence-chart";
import { Downloads } from "../../../features/runs/components/downloads";
import { EventLog } from "../../../features/runs/components/event-log";
import { NodeLookup } from "../../../features/runs/components/node-lookup";
import { RunActions } from "../../../features/runs/components/run-actions";
import { RunParameters, RunProvenance } from "../../../features/runs/components/run-facts";
import { RunStatus } from "../../../features/runs/components/run-status";
import { ScoreHistogram } from "../../../features/runs/components/score-histogram";
import { ShardGrid } from "../../../features/runs/components/shard-grid";
import { TopTable } from "../../../features/runs/components/top-table";
import { parametersSummary } from "../../../features/runs/lib/summary";

export const makeLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  void queryClient.prefetchQuery(getRunQueryOptions(idParam(params.runId)));
  return null;
};

function Convergence({ run }: { run: RunDetail }) {
  const live = runIsMoving(run);
  const iterations = useIterations(run.id, live);
  const shards = useShards(run.id, live);
  const events = useRunEvents(run.id, live);
  const wasLive = useRef(live);
  const { refetch: refetchIterations } = iterations;
  const { refetch: refetchShards } = shards;
  const { refetch: refetchEvents } = events;

  // The last poll may land just before the run's final iteration, shard states and events are written.
  useEffect(() => {
    if (wasLive.current && !live) {
      void refetchIterations();
      void refetchShards();
      void refetchEvents();
    }
    wasLive.current = live;
  }, [live, refetchIterations, refetchShards, refetchEvents]);
  const history = iterations.data?.items ?? [];
  return (
    <>
      <Card>
        <RunStatus run={run} iterations={history} />
      </Card>
      <Card title="Convergence">
        <ConvergenceChart
          iterations={history}
          tolerance={iterations.data?.tolerance ?? run.parameters.tolerance}
          boundFactor={iterations.data?.boundFactor ?? run.parameters.damping / (1 - run.parameters.damping)}
        />
      </Card>
      <div className="grid gap-5 xl:grid-cols-2">
        <Card title="Shards" description="Each shard holds the in-edges of a contiguous range of nodes.">
          <ShardGrid shards={shards.data?.items ?? []} />
        </Card>
        <Card title="Events">
          <EventLog events={events.data?.items ?? []} />
        </Card>
      </div>
    </>
  );
}

function Results({ run }: { run: RunDetail }) {
  const hasScores = run.files.length > 0 || run.status === "converged" || run.status === "not-converged";
  return (
    <>
      <Caution />
      {hasScores ? (
        <>
          <Card title="Find a node">
            <NodeLookup runId={run.id} />
          </Card>
          <Card title={`Top ${run.parameters.topK}`} bodyClassName="px-4 pt-3 pb-3">
            <TopTable runId={run.id} />
          </Card>
          <div className="grid gap-5 xl:grid-cols-2">
            <Card title="Score distribution">
              <ScoreHistogram runId={run.id} />
            </Card>
            <Card title="Score files">
              <Downloads run={run} />
            </Card>
          </div>
        </>
      ) : (
        <Card>
          <p className="text-[0.8125rem] text-ink-muted">Results appear when the run finishes with scores.</p>
        </Card>
      )}
      <div className="grid gap-5 xl:grid-cols-2">
        <Card title="Parameters">
          <RunParameters run={run} />
        </Card>
        <Card title="Provenance and timings">
          <RunProvenance run={run} />
        </Card>
      </div>
    </>
  );
}

function RunPage({ id, tab }: { id: number; tab: "convergence" | "results" }) {
  const { data: run } = useRun(id);
  const session = useSession();
  const navigate = useNavigate();
  const seeded = run.parameters.teleport.kind === "seeds";
  return (
    <>
      <PageHeader
        eyebrow={`Run #${run.id}`}
        title={run.graph.name}
        description={<span className="num text-xs">{parametersSummary(run.parameters)}</span>}
        actions={
          <>
            <RunActions
              run={run}
              canAct={can(session.role, "runs:cancel")}
              canDelete={session.role === "admin" || run.createdBy?.userId === session.user.id}
              onDeleted={() => navigate(paths.app.runs.getHref())}
            />
            <Link to={paths.app.compare.getHref(run.id)} className={buttonClasses("secondary", "md")}>
              Compare…
            </Link>
          </>
        }
      />
      <LinkTabs
        label="Run sections"
        tabs={[
          { label: "Convergence", href: paths.app.run.getHref(run.id) },
          { label: "Results", href: paths.app.runResults.getHref(run.id) },
        ]}
      />
      {tab === "convergence" && seeded ? <Caution compact /> : null}
      {tab === "convergence" ? <Convergence run={run} /> : <Results run={run} />}
    </>
  );
}

export function Component() {
  const id = idParam(useParams().runId);
  const tab = useLocation().pathname.endsWith("/results") ? "results" : "convergence";
  return (
    <Region loadingLabel="Loading the run…" errorTitle="The run could not be loaded">
      <RunPage id={id} tab={tab} />
    </Region>
  );
}
