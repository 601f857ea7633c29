import { CreatedTokenSchema, CreateTokenSchema, TokenListSchema, TokenParamsSchema } from "../../../contracts/tokens";
import { defineRoute } from "../../http/route";
import { createToken, listOwnTokens, revokeTokenById } from "./tokens.service";

export const tokensRoutes = [
  defineRoute({
    method: "post",
    path: "/api/tokens",
    access: "engineer",
    tag: "tokens",
    summary: "Create an API token; the plain token is returned only in this answer",
    body: CreateTokenSchema,
    response: CreatedTokenSchema,
    status: 201,
    audit: "by-service",
    handler: ({ deps, principal, body, ip }) => createToken(deps, principal, body.name, ip),
  }),
  defineRoute({
    method: "get",
    path: "/api/tokens",
    access: "engineer",
    tag: "tokens",
    summary: "List your API tokens (never the tokens themselves)",
    response: TokenListSchema,
    handler: async ({ deps, principal }) => ({ items: await listOwnTokens(deps, principal) }),
  }),
  defineRoute({
    method: "delete",
    path: "/api/tokens/:id",
    access: "engineer",
    tag: "tokens",
    summary: "Revoke an API token",
    params: TokenParamsSchema,
    audit: "by-service",
    handler: ({ deps, principal, params, ip }) => revokeTokenById(deps, principal, params.id, ip),
  }),
];
