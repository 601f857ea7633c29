import type { Request, RequestHandler, Router } from "express";
import type { AppDeps } from "../deps";
import { recordActivity } from "../features/activity/activity.service";
import { AppError, ERRORS } from "../lib/errors";
import { requireCsrf } from "./csrf";
import { requireRole } from "./require-role";
import type { RouteContext, RouteDef } from "./route";

export function clientIp(req: Request): string | null {
  return req.ip ?? req.socket.remoteAddress ?? null;
}

function handlerFor(route: RouteDef, deps: AppDeps): RequestHandler {
  return async (req, res) => {
    const ctx: RouteContext<"public", unknown, unknown, unknown> = {
      body: route.schemas.body ? route.schemas.body.parse(req.body ?? {}) : undefined,
      query: route.schemas.query ? route.schemas.query.parse(req.query) : undefined,
      params: route.schemas.params ? route.schemas.params.parse(req.params) : undefined,
      principal: req.principal ?? null,
      ip: clientIp(req),
      deps,
      req,
      res,
    };
    const result = await route.invoke(ctx);
    if (route.audit && route.audit !== "by-service" && ctx.principal) {
      await recordActivity(deps.db, {
        teamId: ctx.principal.teamId,
        actorUserId: ctx.principal.userId,
        actorTokenId: ctx.principal.tokenId,
        action: route.audit.action,
        target: route.audit.target?.(ctx.params, result) ?? null,
        ip: ctx.ip,
      });
    }
    if (route.raw) return;
    const schema = route.schemas.response;
    if (!schema) {
      res.status(route.status ?? 204).end();
      return;
    }
    const parsed = schema.safeParse(result);
    if (!parsed.success) {
      throw new AppError(ERRORS.internal, { cause: new Error(`response of ${route.method} ${route.path} broke its contract: ${parsed.error.message}`) });
    }
    res.status(route.status ?? 200).json(parsed.data);
  };
}

/** Mounts every route of the table: role check, then CSRF, then route middleware, then the parsed handler. */
export function mountRoutes(router: Router, routes: readonly RouteDef[], deps: AppDeps): void {
  for (const route of routes) {
    if (!["get", "head", "options"].includes(route.method) && route.audit === undefined) {
      throw new Error(`${route.method.toUpperCase()} ${route.path} must declare how it is audited`);
    }
    const chain: RequestHandler[] = [];
    if (route.access !== "public") chain.push(requireRole(route.access), requireCsrf);
    chain.push(...(route.middleware?.(deps) ?? []), handlerFor(route, deps));
    router[route.method](route.path, ...chain);
  }
}
