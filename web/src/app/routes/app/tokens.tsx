import type { QueryClient } from "@tanstack/react-query";
import { Region } from "../../../components/errors/region";
import { Card } from "../../../components/ui/card";
import { EmptyState } from "../../../components/ui/empty-state";
import { PageHeader } from "../../../components/ui/page-header";
import { sessionQueryOptions, useSession } from "../../../lib/auth";
import { can } from "../../../lib/authorization";
import { getTokensQueryOptions } from "../../../features/tokens/api/get-tokens";
import { CreateTokenForm } from "../../../features/tokens/components/create-token-form";
import { TokensTable } from "../../../features/tokens/components/tokens-table";

export const makeLoader = (queryClient: QueryClient) => async () => {
  const session = queryClient.getQueryData(sessionQueryOptions().queryKey);
  if (session && can(session.role, "tokens:create")) void queryClient.prefetchQuery(getTokensQueryOptions());
  return null;
};

export function Component() {
  const session = useSession();

  return (
    <>
      <PageHeader
        title="API tokens"
        description={
          <>
            Scripts send a token as <code className="num text-ink">Authorization: Bearer &lt;token&gt;</code> to fetch
            graphs, runs and score files without a browser session. A token acts with your role.
          </>
        }
      />
      {can(session.role, "tokens:create") ? (
        <>
          <Card title="New token">
            <CreateTokenForm />
          </Card>
          <Card title="Your tokens" bodyClassName="px-4 pt-1 pb-2">
            <Region loadingLabel="Loading tokens…" errorTitle="Tokens could not be loaded">
              <TokensTable />
            </Region>
          </Card>
        </>
      ) : (
        <EmptyState title="Engineers and admins create tokens">
          Viewers browse and download in the portal. If a script needs a token, ask an engineer or admin of your team.
        </EmptyState>
      )}
    </>
  );
}
