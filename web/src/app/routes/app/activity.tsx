import type { QueryClient } from "@tanstack/react-query";
import { Region } from "../../../components/errors/region";
import { Card } from "../../../components/ui/card";
import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { sessionQueryOptions, useSession } from "../../../lib/auth";
import { can } from "../../../lib/authorization";
import { getActivityQueryOptions } from "../../../features/activity/api/get-activity";
import { ActivityTable } from "../../../features/activity/components/activity-table";

export const makeLoader = (queryClient: QueryClient) => async () => {
  const session = queryClient.getQueryData(sessionQueryOptions().queryKey);
  if (session && can(session.role, "activity:view")) void queryClient.prefetchInfiniteQuery(getActivityQueryOptions());
  return null;
};

export function Component() {
  const session = useSession();
  return (
    <>
      <PageHeader title="Activity" description="Who did what in this team, newest first." />
      {can(session.role, "activity:view") ? (
        <Card bodyClassName="px-4 pt-1 pb-3">
          <Region loadingLabel="Loading activity…" errorTitle="Activity could not be loaded">
            <ActivityTable />
          </Region>
        </Card>
      ) : (
        <EmptyState title="Admins only">The activity log is visible to team admins.</EmptyState>
      )}
    </>
  );
}
