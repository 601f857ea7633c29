import { SessionSchema, TokenParamSchema } from "../../../contracts/auth";
import { AcceptInviteSchema, CreateInviteSchema, InviteListSchema, InviteParamsSchema, InvitePreviewSchema, InviteSchema } from "../../../contracts/team";
import { defineRoute } from "../../http/route";
import { startSession } from "../../http/session";
import { sessionView } from "../auth/auth.service";
import { acceptInvite, cancelInvite, createInvite, listInvites, previewInvite } from "./invites.service";

export const invitesRoutes = [
  defineRoute({
    method: "post",
    path: "/api/team/invites",
    access: "admin",
    tag: "team",
    summary: "Invite someone by e-mail; the link is single-use and expires in 72 h",
    body: CreateInviteSchema,
    response: InviteSchema,
    status: 201,
    audit: "by-service",
    handler: ({ deps, principal, body, ip }) => createInvite(deps, principal, body, ip),
  }),
  defineRoute({
    method: "get",
    path: "/api/team/invites",
    access: "admin",
    tag: "team",
    summary: "Open invitations of your team",
    response: InviteListSchema,
    handler: async ({ deps, principal }) => ({ items: await listInvites(deps, principal) }),
  }),
  defineRoute({
    method: "delete",
    path: "/api/team/invites/:id",
    access: "admin",
    tag: "team",
    summary: "Withdraw an invitation",
    params: InviteParamsSchema,
    audit: "by-service",
    handler: ({ deps, principal, params, ip }) => cancelInvite(deps, principal, params.id, ip),
  }),
  defineRoute({
    method: "get",
    path: "/api/invites/:token",
    access: "public",
    tag: "team",
    summary: "What an invitation link offers (410 when it expired or was used)",
    params: TokenParamSchema,
    response: InvitePreviewSchema,
    handler: ({ deps, params }) => previewInvite(deps, params.token),
  }),
  defineRoute({
    method: "post",
    path: "/api/invites/:token/accept",
    access: "public",
    tag: "team",
    summary: "Accept an invitation: creates the account and membership, then signs in",
    params: TokenParamSchema,
    body: AcceptInviteSchema,
    response: SessionSchema,
    audit: "by-service",
    handler: async ({ deps, req, params, body, ip }) => {
      const principal = await acceptInvite(deps, params.token, body, ip);
      const csrfToken = await startSession(req, principal);
      return sessionView(principal, csrfToken);
    },
  }),
];
