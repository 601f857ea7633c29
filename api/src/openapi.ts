import { readFileSync } from "node:fs";
import path from "node:path";
import { z } from "zod";
import { ErrorBodySchema } from "../contracts/common";
import { SESSION_COOKIE } from "./http/session";
import type { RouteDef } from "./http/route";

type JsonSchema = Record<string, unknown>;

function jsonSchema(schema: z.ZodType, io: "input" | "output"): JsonSchema {
  const { $schema: _ignored, ...rest } = z.toJSONSchema(schema, { io, unrepresentable: "any" }) as JsonSchema;
  return rest;
}

/** `/api/runs/:id` → `/api/runs/{id}`; `/{*splat}` → `/{splat}`. */
export function openApiPath(expressPath: string): string {
  return expressPath.replace(/\{\*(\w+)\}/g, "{$1}").replace(/:(\w+)/g, "{$1}");
}

function parameters(schema: z.ZodType | undefined, location: "path" | "query") {
  if (!schema) return [];
  const object = jsonSchema(schema, "input");
  const properties = (object.properties ?? {}) as Record<string, JsonSchema>;
  const required = new Set((object.required as string[] | undefined) ?? []);
  return Object.entries(properties).map(([name, property]) => ({
    name,
    in: location,
    required: location === "path" || required.has(name),
    schema: property,
  }));
}

const ERROR_RESPONSE = { description: "Error", content: { "application/json": { schema: { $ref: "#/components/schemas/Error" } } } };

function operation(route: RouteDef) {
  const responses: Record<string, unknown> = {};
  const status = String(route.status ?? (route.schemas.response || route.raw ? 200 : 204));
  if (route.raw) {
    const produces = route.produces ?? { "application/octet-stream": "raw response" };
    responses[status] = {
      description: Object.values(produces).join("; "),
      content: Object.fromEntries(Object.keys(produces).map((type) => [type, {}])),
    };
  } else if (route.schemas.response) {
    responses[status] = { description: "OK", content: { "application/json": { schema: jsonSchema(route.schemas.response, "output") } } };
  } else {
    responses[status] = { description: "No content" };
  }
  if (route.schemas.body || route.schemas.query || route.schemas.params) responses["400"] = ERROR_RESPONSE;
  if (route.access !== "public") {
    responses["401"] = ERROR_RESPONSE;
    responses["403"] = ERROR_RESPONSE;
  }
  responses.default = ERROR_RESPONSE;
  return {
    summary: route.summary,
    tags: [route.tag],
    operationId: `${route.method}${openApiPath(route.path).replace(/[^A-Za-z0-9]+(.)?/g, (_m, c: string | undefined) => (c ?? "").toUpperCase())}`,
    "x-required-role": route.access,
    security: route.access === "public" ? [] : [{ session: [] }, { bearer: [] }],
    parameters: [...parameters(route.schemas.params, "path"), ...parameters(route.schemas.query, "query")],
    ...(route.schemas.body
      ? { requestBody: { required: true, content: { "application/json": { schema: jsonSchema(route.schemas.body, "input") } } } }
      : {}),
    responses,
  };
}

function packageVersion(): string {
  try {
    const pkg = JSON.parse(readFileSync(path.resolve(import.meta.dirname, "../../package.json"), "utf8")) as { version?: string };
    return pkg.version ?? "0.0.0";
  } catch {
    return "0.0.0";
  }
}

/** The OpenAPI 3.1 document of every route in the table, from the same zod contracts the server validates with. */
export function buildOpenApiDocument(routes: readonly RouteDef[]) {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const route of routes) {
    const key = openApiPath(route.path);
    paths[key] ??= {};
    paths[key][route.method] = operation(route);
  }
  return {
    openapi: "3.1.0",
    info: {
      title: "Stillpoint API",
      version: packageVersion(),
      description:
        "Cookie-authenticated mutations need the X-CSRF-Token header (its value is `csrfToken` from sign-in or /api/auth/me). " +
        "Scripts authenticate with `Authorization: Bearer <API token>` and need no CSRF header. " +
        "Errors are `{ error: { code, message, details } }`. `x-required-role` names the least role a route needs.",
    },
    components: {
      securitySchemes: {
        session: { type: "apiKey", in: "cookie", name: SESSION_COOKIE },
        bearer: { type: "http", scheme: "bearer" },
      },
      schemas: { Error: jsonSchema(ErrorBodySchema, "output") },
    },
    paths,
  };
}
