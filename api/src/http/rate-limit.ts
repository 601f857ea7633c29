import type { Request, RequestHandler } from "express";
import { ipKeyGenerator, rateLimit, type AugmentedRequest } from "express-rate-limit";
import { AppError, ERRORS } from "../lib/errors";

function emailOf(req: Request): string {
  const body: unknown = req.body;
  if (typeof body === "object" && body !== null && "email" in body && typeof body.email === "string") {
    return body.email.trim().toLowerCase();
  }
  return "";
}

/**
 * Limits attempts per client IP and e-mail address. With `failuresOnly`, answers below 400 do not count, so a
 * person who types the password right is never locked out by their own successes.
 */
export function limitPerIpAndEmail(options: { max: number; windowMs: number; failuresOnly: boolean }): RequestHandler {
  return rateLimit({
    windowMs: options.windowMs,
    limit: options.max,
    skipSuccessfulRequests: options.failuresOnly,
    standardHeaders: "draft-7",
    legacyHeaders: false,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? "unknown")}|${emailOf(req)}`,
    handler: (req, res, next, used) => {
      const resetTime = (req as AugmentedRequest)[used.requestPropertyName]?.resetTime;
      const seconds = resetTime ? Math.max(1, Math.ceil((resetTime.getTime() - Date.now()) / 1000)) : Math.ceil(options.windowMs / 1000);
      res.setHeader("Retry-After", String(seconds));
      next(new AppError(ERRORS.rateLimited, { message: `Too many attempts. Try again in ${Math.ceil(seconds / 60)} min.`, details: { retryAfterSeconds: seconds } }));
    },
  });
}
