import { ComingSoon } from "../../../components/ui/coming-soon";
import { PageHeader } from "../../../components/ui/page-header";
import { useSession } from "../../../lib/auth";

export function Component() {
  const session = useSession();
  return (
    <>
      <PageHeader eyebrow={session.team.name} title="Overview" description="The state of this team's ranking work at a glance." />
      <ComingSoon what="Queue, running runs and worker pool health">
        This page will show queued and running runs with their latest residual, the health of the worker pool and the
        team&apos;s most recent activity. It fills in once runs can be submitted.
      </ComingSoon>
    </>
  );
}
