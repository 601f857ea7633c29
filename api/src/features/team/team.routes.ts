import { MemberParamsSchema, TeamSchema, UpdateMemberSchema } from "../../../contracts/team";
import { defineRoute } from "../../http/route";
import { changeRole, getTeam, removeMember } from "./team.service";

export const teamRoutes = [
  defineRoute({
    method: "get",
    path: "/api/team",
    access: "viewer",
    tag: "team",
    summary: "Your team and its members with their roles",
    response: TeamSchema,
    handler: ({ deps, principal }) => getTeam(deps, principal),
  }),
  defineRoute({
    method: "patch",
    path: "/api/team/members/:userId",
    access: "admin",
    tag: "team",
    summary: "Change a member's role (a team keeps at least one admin)",
    params: MemberParamsSchema,
    body: UpdateMemberSchema,
    response: TeamSchema,
    audit: "by-service",
    handler: ({ deps, principal, params, body, ip }) => changeRole(deps, principal, params.userId, body.role, ip),
  }),
  defineRoute({
    method: "delete",
    path: "/api/team/members/:userId",
    access: "admin",
    tag: "team",
    summary: "Remove a member from the team (a team keeps at least one admin)",
    params: MemberParamsSchema,
    audit: "by-service",
    handler: ({ deps, principal, params, ip }) => removeMember(deps, principal, params.userId, ip),
  }),
];
