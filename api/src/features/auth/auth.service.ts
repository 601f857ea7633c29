import type { PasswordResetConfirm, Session } from "../../../contracts/auth";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { AppError, ERRORS } from "../../lib/errors";
import { assertPasswordPolicy, hashPassword, verifyPassword } from "../../lib/passwords";
import { randomSecret, sha256Hex } from "../../lib/secrets";
import { byPrincipal, recordActivity } from "../activity/activity.service";
import {
  deleteSessionsOfUser,
  findFirstMembership,
  findPrincipalRow,
  findUserByEmail,
  findUserById,
  updateUserPassword,
  type PrincipalRow,
} from "../team/team.repo";
import { claimPasswordReset, findPasswordReset, insertPasswordReset, retireOpenResets } from "./auth.repo";

export const RESET_TTL_MS = 60 * 60 * 1000;

let dummyHash: Promise<string> | null = null;
/** Verifying against a throw-away hash keeps unknown addresses as slow as wrong passwords. */
function burnVerifyTime(password: string): Promise<boolean> {
  dummyHash ??= hashPassword(randomSecret());
  return dummyHash.then((hash) => verifyPassword(hash, password));
}

function toPrincipal(row: PrincipalRow, via: Principal["via"], tokenId: number | null = null): Principal {
  return { ...row, via, tokenId };
}

export function sessionView(principal: Principal, csrfToken: string): Session {
  return {
    user: { id: principal.userId, email: principal.email, name: principal.name },
    team: { id: principal.teamId, name: principal.teamName },
    role: principal.role,
    csrfToken,
  };
}

export async function signIn(deps: AppDeps, email: string, password: string, ip: string | null): Promise<Principal> {
  const user = await findUserByEmail(deps.db, email);
  const valid = user && !user.disabledAt ? await verifyPassword(user.passwordHash, password) : await burnVerifyTime(password);
  const membership = user ? await findFirstMembership(deps.db, user.id) : null;
  if (!user || !valid) {
    await recordActivity(deps.db, {
      teamId: membership?.teamId ?? null,
      actorUserId: user?.id ?? null,
      action: "auth.sign-in-failed",
      target: email,
      details: { reason: user ? "wrong password" : "unknown e-mail address" },
      ip,
    });
    throw new AppError(ERRORS.invalidCredentials);
  }
  if (!membership) throw new AppError(ERRORS.noTeam);
  const principal = toPrincipal(membership, "session");
  await recordActivity(deps.db, { ...byPrincipal(principal, ip), action: "auth.signed-in", target: email });
  return principal;
}

export async function resolveSessionPrincipal(deps: AppDeps, userId: number, teamId: number): Promise<Principal | null> {
  const row = await findPrincipalRow(deps.db, userId, teamId);
  return row ? toPrincipal(row, "session") : null;
}

export async function requestPasswordReset(deps: AppDeps, email: string, ip: string | null): Promise<void> {
  const user = await findUserByEmail(deps.db, email);
  if (!user || user.disabledAt) return;
  const token = randomSecret();
  await insertPasswordReset(deps.db, {
    userId: user.id,
    tokenHash: sha256Hex(token),
    expiresAt: new Date(Date.now() + RESET_TTL_MS),
    requestedIp: ip,
  });
  const membership = await findFirstMembership(deps.db, user.id);
  await recordActivity(deps.db, {
    teamId: membership?.teamId ?? null,
    actorUserId: user.id,
    action: "auth.password-reset-requested",
    target: email,
    ip,
  });
  const link = `${deps.publicUrl()}/reset/${token}`;
  await deps.mailer.send({
    to: user.email,
    teamId: membership?.teamId ?? null,
    subject: "Reset your Stillpoint password",
    text:
      `Hello ${user.name},\n\nsomeone (hopefully you) asked to reset the password of your Stillpoint account.\n` +
      `Choose a new password here within the next hour:\n\n${link}\n\n` +
      `The link works once. If you did not ask for this, ignore this message; your password stays as it is.\n`,
  });
}

export async function resetPassword(deps: AppDeps, token: string, input: PasswordResetConfirm, ip: string | null): Promise<void> {
  const reset = await findPasswordReset(deps.db, sha256Hex(token));
  if (!reset) throw new AppError(ERRORS.notFound, { message: "This reset link is not known." });
  if (reset.usedAt) throw new AppError(ERRORS.tokenUsed);
  if (reset.expiresAt.getTime() <= Date.now()) throw new AppError(ERRORS.tokenExpired);
  const user = await findUserById(deps.db, reset.userId);
  if (!user) throw new AppError(ERRORS.notFound, { message: "This reset link is not known." });
  assertPasswordPolicy(input.password, user.email);
  const passwordHash = await hashPassword(input.password);
  if (!(await claimPasswordReset(deps.db, reset.id))) throw new AppError(ERRORS.tokenUsed);
  await updateUserPassword(deps.db, reset.userId, passwordHash);
  await retireOpenResets(deps.db, reset.userId);
  // A new password ends every session that was signed in with the old one.
  await deleteSessionsOfUser(deps.db, reset.userId);
  const membership = await findFirstMembership(deps.db, reset.userId);
  await recordActivity(deps.db, {
    teamId: membership?.teamId ?? null,
    actorUserId: reset.userId,
    action: "auth.password-reset",
    ip,
  });
}
