import { useState } from "react";
import { Badge } from "../../../components/ui/badge";
import { Button } from "../../../components/ui/button";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { Select } from "../../../components/ui/field";
import { TBody, TD, TH, THead, TR, Table } from "../../../components/ui/table";
import { ROLE_LABELS, ROLE_OPTIONS, ROLE_TONES, parseRole } from "../../../lib/auth";
import { formatDate, formatDateTime, isoOrEmpty } from "../../../lib/format";
import { useTeam, type Member } from "../api/get-team";
import { useRemoveMember } from "../api/remove-member";
import { useUpdateMemberRole } from "../api/update-member-role";

type MembersTableProps = { currentUserId: number; canManage: boolean };

export function MembersTable({ currentUserId, canManage }: MembersTableProps) {
  const { data } = useTeam();
  const updateRole = useUpdateMemberRole();
  const remove = useRemoveMember();
  const [confirming, setConfirming] = useState<number | null>(null);
  const mutationError = updateRole.error ?? remove.error;

  return (
    <div className="flex flex-col gap-3">
      {mutationError ? <ErrorBanner error={mutationError} title="The change was not saved" /> : null}
      <Table caption={`Members of ${data.team.name}`} className="-mx-4">
        <THead>
          <TR>
            <TH>Name</TH>
            <TH>E-mail</TH>
            <TH>Role</TH>
            <TH>Joined</TH>
            {canManage ? <TH className="text-right">Actions</TH> : null}
          </TR>
        </THead>
        <TBody>
          {data.members.map((member) => (
            <MemberRow
              key={member.userId}
              member={member}
              isSelf={member.userId === currentUserId}
              canManage={canManage}
              confirming={confirming === member.userId}
              onConfirm={(value) => setConfirming(value ? member.userId : null)}
              onRoleChange={(role) => updateRole.mutate({ userId: member.userId, role })}
              onRemove={() => remove.mutate({ userId: member.userId }, { onSettled: () => setConfirming(null) })}
              busy={
                (updateRole.isPending && updateRole.variables.userId === member.userId) ||
                (remove.isPending && remove.variables.userId === member.userId)
              }
            />
          ))}
        </TBody>
      </Table>
    </div>
  );
}

type MemberRowProps = {
  member: Member;
  isSelf: boolean;
  canManage: boolean;
  confirming: boolean;
  busy: boolean;
  onConfirm: (value: boolean) => void;
  onRoleChange: (role: Member["role"]) => void;
  onRemove: () => void;
};

function MemberRow({ member, isSelf, canManage, confirming, busy, onConfirm, onRoleChange, onRemove }: MemberRowProps) {
  const display = member.name || member.email;
  return (
    <TR aria-busy={busy || undefined}>
      <TD className="font-medium">
        {display}
        {isSelf ? <span className="ml-2 text-xs font-normal text-ink-muted">(you)</span> : null}
      </TD>
      <TD className="whitespace-nowrap text-ink-soft">{member.email}</TD>
      <TD>
        {canManage && !isSelf ? (
          <Select
            compact
            aria-label={`Role of ${display}`}
            value={member.role}
            options={ROLE_OPTIONS}
            disabled={busy}
            onChange={(event) => onRoleChange(parseRole(event.target.value))}
          />
        ) : (
          <Badge tone={ROLE_TONES[member.role]}>{ROLE_LABELS[member.role]}</Badge>
        )}
      </TD>
      <TD className="num text-ink-soft">
        <time dateTime={isoOrEmpty(member.joinedAt)} title={formatDateTime(member.joinedAt)}>
          {formatDate(member.joinedAt)}
        </time>
      </TD>
      {canManage ? (
        <TD className="text-right">
          {isSelf ? null : confirming ? (
            <span className="inline-flex items-center gap-1.5">
              <Button size="sm" variant="danger" busy={busy} onClick={onRemove}>
                Confirm removal
              </Button>
              <Button size="sm" variant="quiet" onClick={() => onConfirm(false)}>
                Keep
              </Button>
            </span>
          ) : (
            <Button size="sm" variant="quiet" aria-label={`Remove ${display}`} onClick={() => onConfirm(true)}>
              Remove
            </Button>
          )}
        </TD>
      ) : null}
    </TR>
  );
}
