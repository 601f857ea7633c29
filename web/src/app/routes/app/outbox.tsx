import type { QueryClient } from "@tanstack/react-query";
import { Region } from "../../../components/errors/region";
import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { sessionQueryOptions, useSession } from "../../../lib/auth";
import { can } from "../../../lib/authorization";
import { getOutboxQueryOptions } from "../../../features/outbox/api/get-outbox";
import { OutboxView } from "../../../features/outbox/components/outbox-view";

export const makeLoader = (queryClient: QueryClient) => async () => {
  const session = queryClient.getQueryData(sessionQueryOptions().queryKey);
  if (session && can(session.role, "outbox:view")) void queryClient.prefetchQuery(getOutboxQueryOptions());
  return null;
};

export function Component() {
  const session = useSession();
  return (
    <>
      <PageHeader
        eyebrow="Development only"
        title="Outbox"
        description="While the mail fake is on, e-mail is captured here instead of being sent. Links in a message open in this browser."
      />
      {can(session.role, "outbox:view") ? (
        <Region loadingLabel="Loading captured e-mail…" errorTitle="The outbox could not be loaded">
          <OutboxView />
        </Region>
      ) : (
        <EmptyState title="Admins only">The outbox is visible to team admins.</EmptyState>
      )}
    </>
  );
}
