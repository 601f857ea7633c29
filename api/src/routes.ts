import { z } from "zod";
import { activityRoutes } from "./features/activity/activity.routes";
import { authRoutes } from "./features/auth/auth.routes";
import { compareRoutes } from "./features/compare/compare.routes";
import { graphsRoutes } from "./features/graphs/graphs.routes";
import { healthRoutes } from "./features/health/health.routes";
import { invitesRoutes } from "./features/invites/invites.routes";
import { outboxRoutes } from "./features/outbox/outbox.routes";
import { overviewRoutes } from "./features/overview/overview.routes";
import { preferencesRoutes } from "./features/preferences/preferences.routes";
import { runsRoutes } from "./features/runs/runs.routes";
import { teamRoutes } from "./features/team/team.routes";
import { tokensRoutes } from "./features/tokens/tokens.routes";
import { uploadsRoutes } from "./features/uploads/uploads.routes";
import { defineRoute, type RouteDef } from "./http/route";
import { buildOpenApiDocument } from "./openapi";

const openApiRoute = defineRoute({
  method: "get",
  path: "/api/openapi.json",
  access: "public",
  tag: "meta",
  summary: "This OpenAPI document",
  response: z.record(z.string(), z.unknown()),
  handler: async () => buildOpenApiDocument(ROUTES),
});

/**
 * Every API route with the least role it needs. New features add their route arrays here; the app mounts this table,
 * the OpenAPI document is generated from it and the tests walk it.
 */
export const ROUTES: readonly RouteDef[] = [
  ...healthRoutes,
  ...authRoutes,
  ...teamRoutes,
  ...invitesRoutes,
  ...tokensRoutes,
  ...activityRoutes,
  ...outboxRoutes,
  ...uploadsRoutes,
  ...graphsRoutes,
  ...runsRoutes,
  ...compareRoutes,
  ...overviewRoutes,
  ...preferencesRoutes,
  openApiRoute,
];
