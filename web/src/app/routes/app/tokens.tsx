import type { QueryClient } from "@tanstack/react-query";
import { Region } from "../../../components/errors/region";
import { Card } from "../../../components/ui/card";
import { PageHeader } from "../../../components/ui/page-header";
import { useSession } from "../../../lib/auth";
import { can } from "../../../lib/authorization";
import { getTokensQueryOptions } from "../../../features/tokens/api/get-tokens";
import { CreateTokenForm } from "../../../features/tokens/components/create-token-form";
import { TokensTable } from "../../../features/tokens/components/tokens-table";

export const makeLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(getTokensQueryOptions());
  return null;
};

export function Component() {
  const session = useSession();
  const canCreate = can(session.role, "tokens:create");

  return (
    <>
      <PageHeader
        title="API tokens"
        description={
          <>
            Scripts send a token as <code className="num text-ink">Authorization: Bearer &lt;token&gt;</code> to fetch
            graphs, runs and score files without a browser session.
          </>
        }
      />
      {canCreate ? (
        <Card title="New token">
          <CreateTokenForm />
        </Card>
      ) : null}
      <Card
        title="Tokens"
        description={canCreate ? undefined : "Viewers cannot create tokens; ask an engineer or admin if a script needs one."}
        bodyClassName="px-4 pt-1 pb-2"
      >
        <Region loadingLabel="Loading tokens…" errorTitle="Tokens could not be loaded">
          <TokensTable canRevoke={canCreate} />
        </Region>
      </Card>
    </>
  );
}
