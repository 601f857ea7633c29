import { StatusPill } from "../../../components/ui/badge";
import { Button } from "../../../components/ui/button";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { TBody, TD, TH, THead, TR, Table } from "../../../components/ui/table";
import { formatDateTime, isoOrEmpty } from "../../../lib/format";
import { useRevokeToken } from "../api/revoke-token";
import { useTokens } from "../api/get-tokens";

export function TokensTable() {
  const { data } = useTokens();
  const revoke = useRevokeToken();

  if (data.items.length === 0) {
    return (
      <EmptyState className="my-3" title="No API tokens yet">
        Scripts and pipelines use a token to fetch score files without a browser session.
      </EmptyState>
    );
  }

  return (
    <div className="flex flex-col gap-3">
      {revoke.isError ? <ErrorBanner error={revoke.error} title="The token was not revoked" /> : null}
      <Table caption="Your API tokens" className="-mx-4">
        <THead>
          <TR>
            <TH>Name</TH>
            <TH>Starts with</TH>
            <TH>Created</TH>
            <TH>Last used</TH>
            <TH>State</TH>
            <TH className="text-right">Actions</TH>
          </TR>
        </THead>
        <TBody>
          {data.items.map((token) => (
            <TR key={token.id} className={token.revokedAt ? "text-ink-muted" : undefined}>
              <TD className="font-medium">{token.name}</TD>
              <TD className="num text-ink-soft">{token.hint}…</TD>
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
              <TD>{token.revokedAt ? <StatusPill tone="neutral" label="Revoked" /> : <StatusPill tone="ok" label="Active" />}</TD>
              <TD className="text-right">
                {token.revokedAt ? null : (
                  <Button
                    size="sm"
                    variant="danger"
                    aria-label={`Revoke token ${token.name}`}
                    busy={revoke.isPending && revoke.variables.id === token.id}
                    onClick={() => revoke.mutate({ id: token.id })}
                  >
                    Revoke
                  </Button>
                )}
              </TD>
            </TR>
          ))}
        </TBody>
      </Table>
    </div>
  );
}
