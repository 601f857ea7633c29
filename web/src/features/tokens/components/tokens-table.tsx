import { Button } from "../../../components/ui/button";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { TBody, TD, TH, THead, TR, Table } from "../../../components/ui/table";
import { formatDateTime, isoOrEmpty } from "../../../lib/format";
import { useRevokeToken } from "../api/revoke-token";
import { useTokens } from "../api/get-tokens";

export function TokensTable({ canRevoke }: { canRevoke: boolean }) {
  const { data } = useTokens();
  const revoke = useRevokeToken();

  if (data.tokens.length === 0) {
    return (
      <EmptyState title="No API tokens yet">
        Scripts and pipelines use a token to fetch score files without a browser session.
      </EmptyState>
    );
  }

  return (
    <div className="flex flex-col gap-3">
      {revoke.isError ? <ErrorBanner error={revoke.error} title="The token was not revoked" /> : null}
      <Table caption="API tokens" className="-mx-4">
        <THead>
          <TR>
            <TH>Name</TH>
            <TH>Created</TH>
            <TH>Last used</TH>
            {canRevoke ? <TH className="text-right">Actions</TH> : null}
          </TR>
        </THead>
        <TBody>
          {data.tokens.map((token) => (
            <TR key={token.id}>
              <TD className="font-medium">{token.name}</TD>
              <TD className="num text-ink-soft">
                <time dateTime={isoOrEmpty(token.createdAt)}>{formatDateTime(token.createdAt)}</time>
              </TD>
              <TD className="num text-ink-soft">
                {token.lastUsedAt ? (
                  <time dateTime={isoOrEmpty(token.lastUsedAt)}>{formatDateTime(token.lastUsedAt)}</time>
                ) : (
                  <span className="font-sans text-ink-muted">Never</span>
                )}
              </TD>
              {canRevoke ? (
                <TD className="text-right">
                  <Button
                    size="sm"
                    variant="danger"
                    aria-label={`Revoke token ${token.name}`}
                    busy={revoke.isPending && revoke.variables.id === token.id}
                    onClick={() => revoke.mutate({ id: token.id })}
                  >
                    Revoke
                  </Button>
                </TD>
              ) : null}
            </TR>
          ))}
        </TBody>
      </Table>
    </div>
  );
}
