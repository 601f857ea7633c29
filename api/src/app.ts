import { existsSync } from "node:fs";
import path from "node:path";
import express, { type Express } from "express";
import helmet from "helmet";
import { pinoHttp } from "pino-http";
import type { AppDeps } from "./deps";
import { authenticate } from "./http/authenticate";
import { errorHandler } from "./http/error-handler";
import { mountRoutes } from "./http/mount";
import type { RouteDef } from "./http/route";
import { createSessionLayer } from "./http/session";
import { AppError, ERRORS } from "./lib/errors";
import { redactUrl } from "./lib/logger";
import { ROUTES } from "./routes";

export interface BuiltApp {
  app: Express;
  /** Releases what the app holds beyond the shared deps (the session store's timer). */
  close(): Promise<void>;
}

function securityHeaders(production: boolean) {
  return helmet({
    contentSecurityPolicy: {
      directives: {
        // Plain-HTTP local use would break if browsers were told to upgrade every request.
        upgradeInsecureRequests: production ? [] : null,
      },
    },
    strictTransportSecurity: production,
  });
}

/** Builds the Express app: API routes from the table, JSON 404 under /api, then (optionally) the built web app. */
export function createApp(deps: AppDeps, routes: readonly RouteDef[] = ROUTES): BuiltApp {
  const app = express();
  const production = deps.config.env === "production";
  app.disable("x-powered-by");
  if (deps.config.trustProxy) app.set("trust proxy", 1);
  app.use(securityHeaders(production));
  app.use(
    pinoHttp({
      logger: deps.logger,
      autoLogging: { ignore: (req) => req.url === "/api/health" },
      serializers: {
        req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: redactUrl(req.url) }),
        res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
      },
      customLogLevel: (_req, res, error) => (error || res.statusCode >= 500 ? "error" : res.statusCode >= 400 ? "warn" : "info"),
    }),
  );

  const sessions = createSessionLayer(deps);
  app.use("/api", express.json({ limit: "1mb" }));
  app.use("/api", authenticate(deps, sessions.middleware));
  const router = express.Router();
  mountRoutes(router, routes, deps);
  app.use(router);
  app.use("/api", (req, _res, next) => {
    next(new AppError(ERRORS.routeNotFound, { message: `There is no API route ${req.method} ${req.originalUrl}.` }));
  });

  const webDir = deps.config.webDir ? path.resolve(deps.config.webDir) : null;
  if (webDir && existsSync(path.join(webDir, "index.html"))) {
    app.use(express.static(webDir, { index: false, maxAge: production ? "1h" : 0 }));
    // Client-side routes (/runs/12, /invite/<token>, ...) all load the single page.
    app.get("/{*splat}", (_req, res) => res.sendFile(path.join(webDir, "index.html")));
  }

  app.use(errorHandler(deps.logger));
  return { app, close: () => sessions.close() };
}
