import type { ErrorRequestHandler } from "express";
import { ZodError } from "zod";
import type { ErrorBody } from "../../contracts/common";
import { redactUrl, type Logger } from "../lib/logger";
import { AppError, ERRORS } from "../lib/errors";

function bodyParserError(error: unknown): AppError | null {
  if (typeof error !== "object" || error === null || !("type" in error)) return null;
  const type = (error as { type: unknown }).type;
  if (type === "entity.parse.failed") return new AppError(ERRORS.invalidJson);
  if (type === "entity.too.large") return new AppError(ERRORS.payloadTooLarge);
  if ((typeof type === "string" && type.startsWith("encoding.")) || type === "charset.unsupported") {
    return new AppError(ERRORS.validationFailed, { message: "The request body encoding is not supported." });
  }
  return null;
}

/** Client errors raised by Express itself or its static middleware (http-errors with `expose`). */
function exposedClientError(error: unknown): AppError | null {
  if (typeof error !== "object" || error === null) return null;
  const { status, expose, message } = error as { status?: unknown; expose?: unknown; message?: unknown };
  if (typeof status !== "number" || status < 400 || status > 499 || expose !== true) return null;
  const spec = status === 404 ? ERRORS.notFound : { ...ERRORS.badRequest, status };
  return new AppError(spec, { message: typeof message === "string" ? message : undefined });
}

/** The single error middleware: every failure leaves as `{ error: { code, message, details } }`. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (error: unknown, req, res, next) => {
    if (res.headersSent) return next(error);
    let appError: AppError;
    if (error instanceof AppError) {
      appError = error;
    } else if (error instanceof ZodError) {
      const issues = error.issues.map((issue) => ({
        code: issue.code,
        path: issue.path,
        message: issue.message,
        ...(issue.code === "custom" && issue.params ? { params: issue.params } : {}),
      }));
      // One problem: say it in the message itself, so a person sees which field and why without reading details.
      const only = issues.length === 1 ? issues[0] : null;
      appError = new AppError(ERRORS.validationFailed, {
        message: only ? `${ERRORS.validationFailed.message} ${only.path.join(".") || "body"}: ${only.message}` : undefined,
        details: { issues },
      });
    } else {
      appError = bodyParserError(error) ?? exposedClientError(error) ?? new AppError(ERRORS.internal, { cause: error });
    }
    if (appError.status >= 500) {
      logger.error({ err: appError.cause ?? error, method: req.method, url: redactUrl(req.originalUrl) }, "request failed");
    }
    const body: ErrorBody = { error: { code: appError.code, message: appError.message, details: appError.details } };
    res.status(appError.status).json(body);
  };
}
