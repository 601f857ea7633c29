import type { QueryClient } from "@tanstack/react-query";
import { Region } from "../../../components/errors/region";
import { Card } from "../../../components/ui/card";
import { PageHeader } from "../../../components/ui/page-header";
import { sessionQueryOptions, useSession } from "../../../lib/auth";
import { can } from "../../../lib/authorization";
import { getInvitesQueryOptions } from "../../../features/team/api/get-invites";
import { getTeamQueryOptions } from "../../../features/team/api/get-team";
import { InviteForm } from "../../../features/team/components/invite-form";
import { MembersTable } from "../../../features/team/components/members-table";
import { PendingInvites } from "../../../features/team/components/pending-invites";

export const makeLoader = (queryClient: QueryClient) => async () => {
  const session = queryClient.getQueryData(sessionQueryOptions().queryKey);
  void queryClient.prefetchQuery(getTeamQueryOptions());
  if (session && can(session.role, "team:manage")) void queryClient.prefetchQuery(getInvitesQueryOptions());
  return null;
};

export function Component() {
  const session = useSession();
  const canManage = can(session.role, "team:manage");

  return (
    <>
      <PageHeader
        eyebrow={session.team.name}
        title="Team"
        description={
          canManage
            ? "Who can see this team's graphs and runs, and what each person may change."
            : "Who can see this team's graphs and runs. Only admins change roles or invite people."
        }
      />
      <Card title="Members" bodyClassName="px-4 pt-1 pb-2">
        <Region loadingLabel="Loading members…" errorTitle="Members could not be loaded">
          <MembersTable currentUserId={session.user.id} canManage={canManage} />
        </Region>
      </Card>
      {canManage ? (
        <>
          <Card title="Invite someone" description="They get an e-mail with a link that works once and expires.">
            <InviteForm />
          </Card>
          <Card title="Pending invitations" bodyClassName="px-4 pt-1 pb-2">
            <Region loadingLabel="Loading invitations…" errorTitle="Invitations could not be loaded">
              <PendingInvites />
            </Region>
          </Card>
        </>
      ) : null}
    </>
  );
}
