import {
  PasswordResetAcceptedSchema,
  PasswordResetConfirmSchema,
  PasswordResetRequestSchema,
  SessionSchema,
  SignInRequestSchema,
  TokenParamSchema,
} from "../../../contracts/auth";
import { limitPerIpAndEmail } from "../../http/rate-limit";
import { defineRoute } from "../../http/route";
import { endSession, SESSION_COOKIE, startSession } from "../../http/session";
import { AppError, ERRORS } from "../../lib/errors";
import { requestPasswordReset, resetPassword, sessionView, signIn } from "./auth.service";

export const authRoutes = [
  defineRoute({
    method: "post",
    path: "/api/auth/sign-in",
    access: "public",
    tag: "auth",
    summary: "Sign in with e-mail and password; sets the session cookie",
    body: SignInRequestSchema,
    response: SessionSchema,
    audit: "by-service",
    middleware: ({ config }) => [
      limitPerIpAndEmail({ max: config.signIn.maxFailures, windowMs: config.signIn.windowMs, failuresOnly: true }),
    ],
    handler: async ({ deps, req, body, ip }) => {
      const principal = await signIn(deps, body.email, body.password, ip);
      const csrfToken = await startSession(req, principal);
      return sessionView(principal, csrfToken);
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/auth/me",
    access: "viewer",
    tag: "auth",
    summary: "The signed-in caller, their team and role, and the CSRF token for mutations",
    response: SessionSchema,
    handler: async ({ principal, req }) => {
      if (principal.via !== "session" || !req.session.csrfToken) {
        return sessionView(principal, "");
      }
      return sessionView(principal, req.session.csrfToken);
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/auth/sign-out",
    access: "viewer",
    tag: "auth",
    summary: "End the session",
    audit: { action: "auth.signed-out" },
    handler: async ({ principal, req, res }) => {
      if (principal.via !== "session") {
        throw new AppError(ERRORS.validationFailed, { message: "API tokens have no session; revoke the token instead." });
      }
      await endSession(req);
      res.clearCookie(SESSION_COOKIE, { path: "/" });
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/auth/password-reset",
    access: "public",
    tag: "auth",
    summary: "E-mail a one-hour, single-use reset link when the address belongs to an account (always 202)",
    body: PasswordResetRequestSchema,
    response: PasswordResetAcceptedSchema,
    status: 202,
    audit: "by-service",
    middleware: () => [limitPerIpAndEmail({ max: 5, windowMs: 15 * 60_000, failuresOnly: false })],
    handler: async ({ deps, body, ip }) => {
      await requestPasswordReset(deps, body.email, ip);
      return { accepted: true as const };
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/auth/password-reset/:token",
    access: "public",
    tag: "auth",
    summary: "Set a new password with a reset link's token; ends all sessions of the account",
    params: TokenParamSchema,
    body: PasswordResetConfirmSchema,
    audit: "by-service",
    handler: ({ deps, params, body, ip }) => resetPassword(deps, params.token, body, ip),
  }),
];
