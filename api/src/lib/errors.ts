export interface ErrorSpec {
  readonly status: number;
  readonly code: string;
  readonly message: string;
}

/** Every error the API answers with. Codes are part of the public contract; messages are for people. */
export const ERRORS = {
  validationFailed: { status: 400, code: "validation_failed", message: "The request is not valid." },
  badRequest: { status: 400, code: "bad_request", message: "The request cannot be handled." },
  invalidJson: { status: 400, code: "invalid_json", message: "The request body is not valid JSON." },
  weakPassword: { status: 400, code: "weak_password", message: "The password does not meet the password policy." },
  unauthenticated: { status: 401, code: "unauthenticated", message: "Sign in first." },
  invalidCredentials: { status: 401, code: "invalid_credentials", message: "The e-mail address or password is wrong." },
  invalidToken: { status: 401, code: "invalid_token", message: "The API token is unknown or revoked." },
  noTeam: { status: 403, code: "no_team", message: "This account is not a member of any team." },
  forbidden: { status: 403, code: "forbidden", message: "Your role does not allow this." },
  csrfInvalid: {
    status: 403,
    code: "csrf_token_invalid",
    message: "The X-CSRF-Token header is missing or does not match this session.",
  },
  notFound: { status: 404, code: "not_found", message: "Not found." },
  routeNotFound: { status: 404, code: "route_not_found", message: "There is no such API route." },
  unknownSeeds: { status: 400, code: "unknown_seeds", message: "Some seed ids are not nodes of the graph." },
  alreadyMember: { status: 409, code: "already_member", message: "This person is already a member of the team." },
  lastAdmin: { status: 409, code: "last_admin", message: "A team needs at least one admin." },
  conflict: { status: 409, code: "conflict", message: "The request conflicts with the current state." },
  graphNotReady: { status: 409, code: "graph_not_ready", message: "The graph is not ready for runs." },
  uploadNotComplete: { status: 409, code: "upload_not_complete", message: "The upload has not finished." },
  invalidState: { status: 409, code: "invalid_state", message: "This action does not fit the current status." },
  scoresNotAvailable: { status: 409, code: "scores_not_available", message: "This run has no score file." },
  tokenExpired: { status: 410, code: "token_expired", message: "This link has expired." },
  tokenUsed: { status: 410, code: "token_used", message: "This link has already been used." },
  uploadExpired: { status: 410, code: "upload_expired", message: "The upload was not finished in time and has been removed." },
  payloadTooLarge: { status: 413, code: "payload_too_large", message: "The request body is too large." },
  uploadTooLarge: { status: 413, code: "upload_too_large", message: "The file is larger than the upload limit." },
  quotaExceeded: { status: 413, code: "quota_exceeded", message: "The upload would exceed the team's storage quota." },
  rangeNotSatisfiable: { status: 416, code: "range_not_satisfiable", message: "The requested range is not in the file." },
  rateLimited: { status: 429, code: "rate_limited", message: "Too many attempts. Try again later." },
  internal: { status: 500, code: "internal_error", message: "Something went wrong on our side." },
  dbUnavailable: { status: 503, code: "db_unavailable", message: "The database does not answer." },
} as const satisfies Record<string, ErrorSpec>;

export type ErrorName = keyof typeof ERRORS;

export class AppError extends Error {
  readonly status: number;
  readonly code: string;
  readonly details: unknown;

  constructor(spec: ErrorSpec, options: { message?: string; details?: unknown; cause?: unknown } = {}) {
    super(options.message ?? spec.message, { cause: options.cause });
    this.name = "AppError";
    this.status = spec.status;
    this.code = spec.code;
    this.details = options.details ?? null;
  }
}
