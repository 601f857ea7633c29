import type { RequestHandler } from "express";
import type { AppDeps } from "../deps";
import { resolveSessionPrincipal } from "../features/auth/auth.service";
import { resolveTokenPrincipal } from "../features/tokens/tokens.service";
import { AppError, ERRORS } from "../lib/errors";

const BEARER = /^Bearer\s+(\S+)\s*$/i;

/**
 * Mounted on /api. A Bearer token decides on its own (no session is read or created); otherwise the session cookie
 * is read. Sets `req.principal` when the caller is known; routes decide what they require.
 */
export function authenticate(deps: AppDeps, sessionMiddleware: RequestHandler): RequestHandler {
  return (req, res, next) => {
    const header = req.get("authorization");
    if (header) {
      const match = BEARER.exec(header);
      if (!match) return next(new AppError(ERRORS.invalidToken, { message: "Use `Authorization: Bearer <token>`." }));
      resolveTokenPrincipal(deps, match[1])
        .then((principal) => {
          if (!principal) return next(new AppError(ERRORS.invalidToken));
          req.principal = principal;
          next();
        })
        .catch(next);
      return;
    }
    sessionMiddleware(req, res, (error?: unknown) => {
      if (error) return next(error);
      const { userId, teamId } = req.session ?? {};
      if (userId === undefined || teamId === undefined) return next();
      resolveSessionPrincipal(deps, userId, teamId)
        .then(async (principal) => {
          // A member who was removed or disabled loses the session at once.
          if (!principal) {
            await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
          } else {
            req.principal = principal;
          }
          next();
        })
        .catch(next);
    });
  };
}
