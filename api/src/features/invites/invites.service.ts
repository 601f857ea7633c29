import type { AcceptInvite, CreateInvite, Invite, InvitePreview } from "../../../contracts/team";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { AppError, ERRORS } from "../../lib/errors";
import { assertPasswordPolicy, hashPassword, verifyPassword } from "../../lib/passwords";
import { randomSecret, sha256Hex } from "../../lib/secrets";
import { byPrincipal, recordActivity } from "../activity/activity.service";
import { findPrincipalRow, findRole, findUserByEmail, insertUser, upsertMembership } from "../team/team.repo";
import { claimInvite, findInvite, findInviteByHash, insertInvite, listPendingInvites, revokeInvite } from "./invites.repo";

export const INVITE_TTL_MS = 72 * 60 * 60 * 1000;

type InviteRow = Awaited<ReturnType<typeof listPendingInvites>>[number];

function toInvite(row: InviteRow): Invite {
  return { ...row, createdAt: row.createdAt.toISOString(), expiresAt: row.expiresAt.toISOString() };
}

export async function createInvite(deps: AppDeps, principal: Principal, input: CreateInvite, ip: string | null): Promise<Invite> {
  const existing = await findUserByEmail(deps.db, input.email);
  if (existing && (await findRole(deps.db, principal.teamId, existing.id))) throw new AppError(ERRORS.alreadyMember);
  const token = randomSecret();
  const expiresAt = new Date(Date.now() + INVITE_TTL_MS);
  const id = await insertInvite(deps.db, {
    teamId: principal.teamId,
    email: input.email,
    role: input.role,
    tokenHash: sha256Hex(token),
    invitedByUserId: principal.userId,
    expiresAt,
  });
  await recordActivity(deps.db, {
    ...byPrincipal(principal, ip),
    action: "team.invite-created",
    target: input.email,
    details: { inviteId: id, role: input.role },
  });
  const link = `${deps.publicUrl()}/invite/${token}`;
  await deps.mailer.send({
    to: input.email,
    teamId: principal.teamId,
    subject: `${principal.name} invites you to ${principal.teamName} on Stillpoint`,
    text:
      `Hello,\n\n${principal.name} invites you to join ${principal.teamName} on Stillpoint as ${input.role}.\n` +
      `Accept the invitation here within 72 hours:\n\n${link}\n\nThe link works once.\n`,
  });
  const rows = await listPendingInvites(deps.db, principal.teamId, new Date(0));
  const row = rows.find((r) => r.id === id);
  if (!row) throw new AppError(ERRORS.internal, { cause: new Error(`invite ${id} vanished`) });
  return toInvite(row);
}

export async function listInvites(deps: AppDeps, principal: Principal): Promise<Invite[]> {
  return (await listPendingInvites(deps.db, principal.teamId, new Date())).map(toInvite);
}

export async function cancelInvite(deps: AppDeps, principal: Principal, id: number, ip: string | null): Promise<void> {
  const invite = await findInvite(deps.db, principal.teamId, id);
  if (!invite) throw new AppError(ERRORS.notFound, { message: "There is no such invite in your team." });
  if (!invite.revokedAt && !invite.acceptedAt) await revokeInvite(deps.db, id);
  await recordActivity(deps.db, { ...byPrincipal(principal, ip), action: "team.invite-revoked", target: invite.email, details: { inviteId: id } });
}

/** The open invite behind a link, or the reason it cannot be used. */
async function openInvite(deps: AppDeps, token: string) {
  const invite = await findInviteByHash(deps.db, sha256Hex(token));
  if (!invite || invite.revokedAt) throw new AppError(ERRORS.notFound, { message: "This invitation is not known or was withdrawn." });
  if (invite.acceptedAt) throw new AppError(ERRORS.tokenUsed, { message: "This invitation has already been accepted." });
  if (invite.expiresAt.getTime() <= Date.now()) throw new AppError(ERRORS.tokenExpired, { message: "This invitation has expired." });
  return invite;
}

export async function previewInvite(deps: AppDeps, token: string): Promise<InvitePreview> {
  const invite = await openInvite(deps, token);
  const existing = await findUserByEmail(deps.db, invite.email);
  return {
    email: invite.email,
    team: { id: invite.teamId, name: invite.teamName },
    role: invite.role,
    expiresAt: invite.expiresAt.toISOString(),
    existingAccount: existing !== null,
  };
}

/** Creates the account (or, for an existing one, checks its password), adds the membership and returns the new principal. */
export async function acceptInvite(deps: AppDeps, token: string, input: AcceptInvite, ip: string | null): Promise<Principal> {
  const invite = await openInvite(deps, token);
  const existing = await findUserByEmail(deps.db, invite.email);
  if (existing && !(await verifyPassword(existing.passwordHash, input.password))) {
    throw new AppError(ERRORS.invalidCredentials, { message: "An account with this address exists; enter its password." });
  }
  if (!existing) assertPasswordPolicy(input.password, invite.email);
  const passwordHash = existing ? null : await hashPassword(input.password);
  const principal = await deps.db.transaction(async (tx) => {
    const userId = existing?.id ?? (await insertUser(tx, { email: invite.email, name: input.name, passwordHash: passwordHash ?? "" }));
    if (!(await claimInvite(tx, invite.id, userId))) throw new AppError(ERRORS.tokenUsed, { message: "This invitation has already been accepted." });
    await upsertMembership(tx, invite.teamId, userId, invite.role);
    return findPrincipalRow(tx, userId, invite.teamId);
  });
  if (!principal) throw new AppError(ERRORS.internal, { cause: new Error(`membership for invite ${invite.id} missing`) });
  const result: Principal = { ...principal, via: "session", tokenId: null };
  await recordActivity(deps.db, {
    ...byPrincipal(result, ip),
    action: "team.invite-accepted",
    target: invite.email,
    details: { inviteId: invite.id, role: invite.role, newAccount: !existing },
  });
  return result;
}
