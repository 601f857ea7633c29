import type { RequestHandler } from "express";
import { AppError, ERRORS } from "../lib/errors";
import { safeEqual } from "../lib/secrets";

export const CSRF_HEADER = "x-csrf-token";
const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/** Cookie-authenticated mutations must echo the session's token; Bearer-token calls carry no ambient credential. */
export const requireCsrf: RequestHandler = (req, _res, next) => {
  if (SAFE_METHODS.has(req.method) || req.principal?.via !== "session") return next();
  const sent = req.get(CSRF_HEADER);
  const expected = req.session?.csrfToken;
  if (!sent || !expected || !safeEqual(sent, expected)) return next(new AppError(ERRORS.csrfInvalid));
  next();
};
