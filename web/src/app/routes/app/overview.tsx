import type { QueryClient } from "@tanstack/react-query";
import { Link } from "react-router-dom";
import { Region } from "../../../components/errors/region";
import { buttonClasses } from "../../../components/ui/button";
import { Card } from "../../../components/ui/card";
import { Figures } from "../../../components/ui/figures";
import { PageHeader } from "../../../components/ui/page-header";
import { paths } from "../../../config/paths";
import { useSession } from "../../../lib/auth";
import { can } from "../../../lib/authorization";
import { formatCount } from "../../../lib/format";
import { getOverviewQueryOptions, useOverview } from "../../../features/overview/api/get-overview";
import { RecentActivity } from "../../../features/overview/components/recent-activity";
import { Queue, RunningRuns, WorkerPool } from "../../../features/overview/components/work-panels";

export const makeLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(getOverviewQueryOptions());
  return null;
};

function OverviewBody() {
  const { data } = useOverview();
  const healthy = data.workers.filter((w) => w.healthy);
  return (
    <>
      <Figures
        columns={6}
        items={[
          { label: "Graphs", value: formatCount(data.counts.graphs) },
          { label: "Runs", value: formatCount(data.counts.runs), hint: `${formatCount(data.counts.finishedRuns)} finished` },
          { label: "Running now", value: formatCount(data.running.length), emphasis: true },
          { label: "Queued", value: formatCount(data.queue.runs.length + data.queue.ingests.length), emphasis: true, hint: `${data.queue.runs.length} runs · ${data.queue.ingests.length} ingests` },
          { label: "Runners healthy", value: `${healthy.length} / ${data.workers.length}` },
          { label: "Threads busy", value: `${healthy.reduce((s, w) => s + w.busy, 0)} / ${healthy.reduce((s, w) => s + w.threads, 0)}` },
        ]}
      />
      <div className="grid gap-5 lg:grid-cols-[3fr_2fr]">
        <Card title="Running">
          <RunningRuns running={data.running} />
        </Card>
        <Card title="Queue" description="Oldest first; runners take work in this order.">
          <Queue queue={data.queue} />
        </Card>
      </div>
      <Card title="Worker pool" description="Runner processes report a heartbeat every few seconds." bodyClassName="px-4 pt-1 pb-3">
        <WorkerPool workers={data.workers} />
      </Card>
      <Card title="Recent activity">
        <RecentActivity recent={data.recent} />
      </Card>
    </>
  );
}

export function Component() {
  const session = useSession();
  return (
    <>
      <PageHeader
        eyebrow={session.team.name}
        title="Overview"
        description="The state of this team's ranking work at a glance."
        actions={
          can(session.role, "runs:submit") ? (
            <Link to={paths.app.newRun.getHref()} className={buttonClasses("primary", "md")}>
              New run
            </Link>
          ) : null
        }
      />
      <Region loadingLabel="Loading the overview…" errorTitle="The overview could not be loaded">
        <OverviewBody />
      </Region>
    </>
  );
}
