import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { RouteDef } from "../../api/src/http/route";
import { ROUTES } from "../../api/src/routes";
import type { RunningServer } from "../../api/src/server";
import { ApiClient, createTestTeam, signedIn, startTestServer, type TestTeam } from "./support";

/** A concrete URL for a route pattern: every path parameter becomes a plausible value. */
function concretePath(route: RouteDef): string {
  return route.path.replace(/\{\*\w+\}/g, "x").replace(/:(\w+)/g, (_m, name: string) => (/id$/i.test(name) ? "1" : "placeholder-value-123"));
}

const byAccess = (access: RouteDef["access"]) => ROUTES.filter((r) => r.access === access);

describe("the route table", () => {
  it("gives every route an access level and every mutation an audit rule", () => {
    expect(ROUTES.length).toBeGreaterThan(10);
    for (const route of ROUTES) {
      expect(["public", "viewer", "engineer", "admin"]).toContain(route.access);
      if (!["get", "head", "options"].includes(route.method)) expect(route.audit, `${route.method} ${route.path}`).toBeDefined();
    }
    const keys = ROUTES.map((r) => `${r.method} ${r.path}`);
    expect(new Set(keys).size).toBe(keys.length);
  });

  it("declares the roles of the product's role table", () => {
    const access = (method: string, path: string) => ROUTES.find((r) => r.method === method && r.path === path)?.access;
    expect(access("post", "/api/tokens")).toBe("engineer");
    expect(access("patch", "/api/team/members/:userId")).toBe("admin");
    expect(access("post", "/api/team/invites")).toBe("admin");
    expect(access("get", "/api/activity")).toBe("admin");
    expect(access("get", "/api/team")).toBe("viewer");
    expect(access("get", "/api/health")).toBe("public");
  });
});

describe("role checks on every route", () => {
  let server: RunningServer;
  let team: TestTeam;
  const clients: Partial<Record<"viewer" | "engineer", ApiClient>> = {};
  beforeAll(async () => {
    server = await startTestServer();
    team = await createTestTeam(server, "roles");
    clients.viewer = await signedIn(server, team.email.viewer);
    clients.engineer = await signedIn(server, team.email.engineer);
  });
  afterAll(() => server.close());

  const cases: Array<{ who: "viewer" | "engineer"; route: RouteDef }> = [
    ...byAccess("engineer").map((route) => ({ who: "viewer" as const, route })),
    ...byAccess("admin").map((route) => ({ who: "viewer" as const, route })),
    ...byAccess("admin").map((route) => ({ who: "engineer" as const, route })),
  ];

  it.each(cases.map((c) => [c.who, c.route.method.toUpperCase(), c.route.path, c.route] as const))(
    "%s gets 403 on %s %s",
    async (who, method, _path, route) => {
      const client = clients[who];
      if (!client) throw new Error("client missing");
      const res = await client.request(method, concretePath(route), { json: method === "GET" ? undefined : {} });
      expect(res.status).toBe(403);
      expect(res.body).toMatchObject({ error: { code: "forbidden", details: { required: route.access, actual: who } } });
    },
  );

  it.each(ROUTES.filter((r) => r.access !== "public").map((r) => [r.method.toUpperCase(), r.path, r] as const))(
    "an anonymous caller gets 401 on %s %s",
    async (method, _path, route) => {
      const res = await new ApiClient(server.url).request(method, concretePath(route), { json: method === "GET" ? undefined : {} });
      expect(res.status).toBe(401);
      expect(res.body).toMatchObject({ error: { code: "unauthenticated" } });
    },
  );

  it("lets an engineer use an engineer route and an admin an admin route", async () => {
    const engineer = clients.engineer;
    if (!engineer) throw new Error("client missing");
    expect((await engineer.get("/api/tokens")).status).toBe(200);
    const admin = await signedIn(server, team.email.admin);
    expect((await admin.get("/api/activity")).status).toBe(200);
    expect((await admin.get("/api/team/invites")).status).toBe(200);
  });
});
