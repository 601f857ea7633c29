import { Badge } from "../../../components/ui/badge";
import { Button } from "../../../components/ui/button";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { TBody, TD, TH, THead, TR, Table } from "../../../components/ui/table";
import { ROLE_LABELS, ROLE_TONES } from "../../../lib/auth";
import { formatDateTime, isoOrEmpty } from "../../../lib/format";
import { useInvites } from "../api/get-invites";
import { useRevokeInvite } from "../api/revoke-invite";

export function PendingInvites() {
  const { data } = useInvites();
  const revoke = useRevokeInvite();

  if (data.items.length === 0) {
    return <EmptyState className="my-3" title="No pending invitations">Invitations you send appear here until they are accepted.</EmptyState>;
  }

  return (
    <div className="flex flex-col gap-3">
      {revoke.isError ? <ErrorBanner error={revoke.error} title="The invitation was not revoked" /> : null}
      <Table caption="Pending invitations" className="-mx-4">
        <THead>
          <TR>
            <TH>E-mail</TH>
            <TH>Role</TH>
            <TH>Invited by</TH>
            <TH>Sent</TH>
            <TH>Expires</TH>
            <TH className="text-right">Actions</TH>
          </TR>
        </THead>
        <TBody>
          {data.items.map((invite) => (
            <TR key={invite.id}>
              <TD className="font-medium whitespace-nowrap">{invite.email}</TD>
              <TD>
                <Badge tone={ROLE_TONES[invite.role]}>{ROLE_LABELS[invite.role]}</Badge>
              </TD>
              <TD className="text-ink-soft">{invite.invitedBy ?? "—"}</TD>
              <TD className="num text-ink-soft">
                <time dateTime={isoOrEmpty(invite.createdAt)}>{formatDateTime(invite.createdAt)}</time>
              </TD>
              <TD className="num text-ink-soft">
                <time dateTime={isoOrEmpty(invite.expiresAt)}>{formatDateTime(invite.expiresAt)}</time>
              </TD>
              <TD className="text-right">
                <Button
                  size="sm"
                  variant="quiet"
                  aria-label={`Revoke the invitation for ${invite.email}`}
                  busy={revoke.isPending && revoke.variables.id === invite.id}
                  onClick={() => revoke.mutate({ id: invite.id })}
                >
                  Revoke
                </Button>
              </TD>
            </TR>
          ))}
        </TBody>
      </Table>
    </div>
  );
}
