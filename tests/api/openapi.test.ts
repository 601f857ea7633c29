import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openApiPath } from "../../api/src/openapi";
import { ROUTES } from "../../api/src/routes";
import type { RunningServer } from "../../api/src/server";
import { ApiClient, startTestServer } from "./support";

interface Operation {
  "x-required-role": string;
  parameters: Array<{ name: string; in: string }>;
  requestBody?: { content: Record<string, { schema: { properties?: Record<string, unknown>; additionalProperties?: boolean } }> };
  responses: Record<string, unknown>;
}

describe("GET /api/openapi.json", () => {
  let server: RunningServer;
  let doc: { openapi: string; paths: Record<string, Record<string, Operation>> };
  beforeAll(async () => {
    server = await startTestServer();
    const res = await new ApiClient(server.url).get<typeof doc>("/api/openapi.json");
    expect(res.status).toBe(200);
    doc = res.body;
  });
  afterAll(() => server.close());

  it("is an OpenAPI 3.1 document listing every route of the route table with its role", () => {
    expect(doc.openapi).toBe("3.1.0");
    for (const route of ROUTES) {
      const op = doc.paths[openApiPath(route.path)]?.[route.method];
      expect(op, `${route.method} ${route.path}`).toBeDefined();
      expect(op["x-required-role"]).toBe(route.access);
    }
    const count = Object.values(doc.paths).reduce((n, ops) => n + Object.keys(ops).length, 0);
    expect(count).toBe(ROUTES.length);
  });

  it("describes path parameters and strict request bodies from the zod contracts", () => {
    const patch = doc.paths["/api/team/members/{userId}"].patch;
    expect(patch.parameters).toEqual([expect.objectContaining({ name: "userId", in: "path" })]);
    const body = patch.requestBody?.content["application/json"].schema;
    expect(Object.keys(body?.properties ?? {})).toEqual(["role"]);
    expect(body?.additionalProperties).toBe(false);
    const signIn = doc.paths["/api/auth/sign-in"].post;
    expect(Object.keys(signIn.requestBody?.content["application/json"].schema.properties ?? {})).toEqual(["email", "password"]);
    expect(signIn.responses["200"]).toBeDefined();
    const activity = doc.paths["/api/activity"].get;
    expect(activity.parameters.map((p) => p.name).sort()).toEqual(["cursor", "limit"]);
  });
});
