import { z } from "zod";
import { ErrorBodySchema } from "../../../api/contracts/common";
import { paths } from "../config/paths";

export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly details: unknown;

  constructor(status: number, code: string, message: string, details?: unknown) {
    super(message);
    this.name = "ApiError";
    this.status = status;
    this.code = code;
    this.details = details;
  }
}

type Method = "GET" | "POST" | "PATCH" | "PUT" | "DELETE";

export type RequestOptions = {
  query?: Record<string, string | number | undefined | null>;
  signal?: AbortSignal;
  /** Public pages and the session probe handle 401 themselves instead of bouncing to sign-in. */
  on401?: "redirect" | "throw";
};

let csrfToken: string | null = null;

/** The session endpoints hand out the token; every cookie mutation must echo it. */
export function setCsrfToken(token: string | null): void {
  csrfToken = token;
}

/** For requests made outside this client (the tus uploader). */
export function getCsrfToken(): string | null {
  return csrfToken;
}

function buildUrl(path: string, query: RequestOptions["query"]): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query ?? {})) {
    if (value !== undefined && value !== null && value !== "") params.set(key, String(value));
  }
  const qs = params.toString();
  return `/api${path}${qs ? `?${qs}` : ""}`;
}

function redirectToSignIn(): void {
  const { pathname, search } = window.location;
  if (pathname === paths.auth.signIn.path) return;
  window.location.assign(paths.auth.signIn.getHref(pathname + search));
}

async function toApiError(response: Response): Promise<ApiError> {
  const text = await response.text().catch(() => "");
  let body: unknown = null;
  try {
    body = text ? JSON.parse(text) : null;
  } catch {
    body = null;
  }
  const parsed = ErrorBodySchema.safeParse(body);
  if (parsed.success) {
    const { code, message, details } = parsed.data.error;
    return new ApiError(response.status, code, message, details);
  }
  return new ApiError(
    response.status,
    `http_${response.status}`,
    `The server answered ${response.status}${response.statusText ? ` ${response.statusText}` : ""}.`,
  );
}

async function request<T>(
  method: Method,
  path: string,
  schema: z.ZodType<T> | null,
  body: unknown,
  options: RequestOptions = {},
): Promise<T> {
  const headers: Record<string, string> = { Accept: "application/json" };
  if (body !== undefined) headers["Content-Type"] = "application/json";
  if (method !== "GET" && csrfToken) headers["X-CSRF-Token"] = csrfToken;

  let response: Response;
  try {
    response = await fetch(buildUrl(path, options.query), {
      method,
      headers,
      credentials: "same-origin",
      body: body === undefined ? undefined : JSON.stringify(body),
      signal: options.signal,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === "AbortError") throw cause;
    throw new ApiError(0, "network_error", "The server could not be reached. Check your connection and try again.");
  }

  if (!response.ok) {
    const error = await toApiError(response);
    if (response.status === 401 && (options.on401 ?? "redirect") === "redirect") {
      setCsrfToken(null);
      redirectToSignIn();
    }
    throw error;
  }

  if (schema === null) return undefined as T;
  const text = await response.text();
  const data: unknown = text ? JSON.parse(text) : null;
  const result = schema.safeParse(data);
  if (!result.success) {
    throw new ApiError(
      response.status,
      "unexpected_response",
      `The server sent a response this page does not understand (${method} ${path}).`,
      z.treeifyError(result.error),
    );
  }
  return result.data;
}

export const api = {
  get: <T>(path: string, schema: z.ZodType<T>, options?: RequestOptions) =>
    request("GET", path, schema, undefined, options),
  post: <T>(path: string, body: unknown, schema: z.ZodType<T> | null, options?: RequestOptions) =>
    request("POST", path, schema, body, options),
  patch: <T>(path: string, body: unknown, schema: z.ZodType<T> | null, options?: RequestOptions) =>
    request("PATCH", path, schema, body, options),
  delete: <T>(path: string, schema: z.ZodType<T> | null, options?: RequestOptions) =>
    request("DELETE", path, schema, undefined, options),
};

export function getErrorMessage(error: unknown): string {
  if (error instanceof ApiError) return error.message;
  if (error instanceof Error && error.message) return error.message;
  if (typeof error === "string" && error) return error;
  return "Something went wrong.";
}
