import type { RequestHandler } from "express";
import { ROLE_RANK, type Role } from "../../contracts/common";
import { AppError, ERRORS } from "../lib/errors";

export function roleAtLeast(actual: Role, required: Role): boolean {
  return ROLE_RANK[actual] >= ROLE_RANK[required];
}

/** 401 without a caller, 403 when the caller's role in the team is below `required`. */
export function requireRole(required: Role): RequestHandler {
  return (req, _res, next) => {
    const principal = req.principal;
    if (!principal) return next(new AppError(ERRORS.unauthenticated));
    if (!roleAtLeast(principal.role, required)) {
      return next(
        new AppError(ERRORS.forbidden, {
          message: `This needs the ${required} role; you are ${principal.role === "admin" ? "an" : "a"} ${principal.role}.`,
          details: { required, actual: principal.role },
        }),
      );
    }
    next();
  };
}
