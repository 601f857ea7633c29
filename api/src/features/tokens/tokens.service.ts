import type { CreatedToken, TokenSummary } from "../../../contracts/tokens";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { roleAtLeast } from "../../http/require-role";
import { AppError, ERRORS } from "../../lib/errors";
import { randomSecret, sha256Hex } from "../../lib/secrets";
import { byPrincipal, recordActivity } from "../activity/activity.service";
import { findToken, findTokenPrincipal, insertToken, listTokens, revokeToken, touchToken } from "./tokens.repo";

export const TOKEN_PREFIX = "spt_";
const HINT_LENGTH = TOKEN_PREFIX.length + 4;

export async function createToken(deps: AppDeps, principal: Principal, name: string, ip: string | null): Promise<CreatedToken> {
  const token = randomSecret(TOKEN_PREFIX);
  const id = await insertToken(deps.db, {
    teamId: principal.teamId,
    userId: principal.userId,
    name,
    tokenHash: sha256Hex(token),
    tokenHint: token.slice(0, HINT_LENGTH),
  });
  await recordActivity(deps.db, { ...byPrincipal(principal, ip), action: "token.created", target: `token ${id} (${name})` });
  return { id, name, token };
}

export async function listOwnTokens(deps: AppDeps, principal: Principal): Promise<TokenSummary[]> {
  const rows = await listTokens(deps.db, principal.teamId, principal.userId);
  return rows.map((row) => ({
    id: row.id,
    name: row.name,
    hint: row.hint,
    createdAt: row.createdAt.toISOString(),
    lastUsedAt: row.lastUsedAt?.toISOString() ?? null,
    revokedAt: row.revokedAt?.toISOString() ?? null,
  }));
}

/** Owners revoke their own tokens; admins may revoke any token of their team. */
export async function revokeTokenById(deps: AppDeps, principal: Principal, id: number, ip: string | null): Promise<void> {
  const token = await findToken(deps.db, principal.teamId, id);
  if (!token || (token.userId !== principal.userId && !roleAtLeast(principal.role, "admin"))) {
    throw new AppError(ERRORS.notFound, { message: "There is no such token." });
  }
  if (!token.revokedAt) await revokeToken(deps.db, id);
  await recordActivity(deps.db, { ...byPrincipal(principal, ip), action: "token.revoked", target: `token ${id} (${token.name})` });
}

export async function resolveTokenPrincipal(deps: AppDeps, token: string): Promise<Principal | null> {
  if (!token.startsWith(TOKEN_PREFIX)) return null;
  const row = await findTokenPrincipal(deps.db, sha256Hex(token));
  if (!row) return null;
  await touchToken(deps.db, row.tokenId);
  const { tokenId, ...rest } = row;
  return { ...rest, via: "token", tokenId };
}
