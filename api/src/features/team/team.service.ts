import type { Role } from "../../../contracts/common";
import type { Team } from "../../../contracts/team";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { AppError, ERRORS } from "../../lib/errors";
import { byPrincipal, recordActivity } from "../activity/activity.service";
import { deleteMembership, findRole, listMembers, lockAdminCount, setRole } from "./team.repo";

export async function getTeam(deps: AppDeps, principal: Principal): Promise<Team> {
  const members = await listMembers(deps.db, principal.teamId);
  return {
    team: { id: principal.teamId, name: principal.teamName },
    members: members.map((m) => ({ ...m, joinedAt: m.joinedAt.toISOString() })),
  };
}

const memberNotFound = () => new AppError(ERRORS.notFound, { message: "There is no such member in your team." });

export async function changeRole(deps: AppDeps, principal: Principal, userId: number, role: Role, ip: string | null): Promise<Team> {
  const previous = await deps.db.transaction(async (tx) => {
    const current = await findRole(tx, principal.teamId, userId);
    if (!current) throw memberNotFound();
    if (current === "admin" && role !== "admin" && (await lockAdminCount(tx, principal.teamId)) <= 1) {
      throw new AppError(ERRORS.lastAdmin);
    }
    await setRole(tx, principal.teamId, userId, role);
    return current;
  });
  await recordActivity(deps.db, {
    ...byPrincipal(principal, ip),
    action: "team.role-changed",
    target: `user ${userId}`,
    details: { from: previous, to: role },
  });
  return getTeam(deps, principal);
}

export async function removeMember(deps: AppDeps, principal: Principal, userId: number, ip: string | null): Promise<void> {
  const previous = await deps.db.transaction(async (tx) => {
    const current = await findRole(tx, principal.teamId, userId);
    if (!current) throw memberNotFound();
    if (current === "admin" && (await lockAdminCount(tx, principal.teamId)) <= 1) throw new AppError(ERRORS.lastAdmin);
    await deleteMembership(tx, principal.teamId, userId);
    return current;
  });
  await recordActivity(deps.db, {
    ...byPrincipal(principal, ip),
    action: "team.member-removed",
    target: `user ${userId}`,
    details: { role: previous },
  });
}
