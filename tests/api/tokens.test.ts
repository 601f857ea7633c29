import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { CreatedTokenSchema, TokenListSchema } from "../../api/contracts/tokens";
import { SessionSchema } from "../../api/contracts/auth";
import type { RunningServer } from "../../api/src/server";
import { ApiClient, createTestTeam, signedIn, startTestServer, type TestTeam } from "./support";

describe("API tokens", () => {
  let server: RunningServer;
  let team: TestTeam;
  beforeAll(async () => {
    server = await startTestServer();
    team = await createTestTeam(server, "tokens");
  });
  afterAll(() => server.close());

  it("creates a prefixed token shown once, authenticates with it without CSRF, and stops after revocation", async () => {
    const engineer = await signedIn(server, team.email.engineer);
    const created = await engineer.post("/api/tokens", { name: "nightly export" });
    expect(created.status).toBe(201);
    const { id, token } = CreatedTokenSchema.parse(created.body);
    expect(token).toMatch(/^spt_[A-Za-z0-9_-]{40,}$/);

    const script = new ApiClient(server.url);
    script.bearer = token;
    const me = await script.get("/api/auth/me");
    expect(me.status).toBe(200);
    const session = SessionSchema.parse(me.body);
    expect(session.user.email).toBe(team.email.engineer);
    expect(session.role).toBe("engineer");
    // A mutation through the token needs no CSRF header and sets no cookie.
    const second = await script.post("/api/tokens", { name: "made by script" });
    expect(second.status).toBe(201);
    expect(script.cookies.size).toBe(0);

    const list = TokenListSchema.parse((await engineer.get("/api/tokens")).body);
    const listed = list.items.find((t) => t.id === id);
    expect(listed?.name).toBe("nightly export");
    expect(listed?.lastUsedAt).not.toBeNull();
    expect(JSON.stringify(list)).not.toContain(token);
    expect(listed?.hint).toBe(token.slice(0, 8));

    expect((await engineer.request("DELETE", `/api/tokens/${id}`)).status).toBe(204);
    const revoked = await script.get("/api/auth/me");
    expect(revoked.status).toBe(401);
    expect(revoked.body).toMatchObject({ error: { code: "invalid_token" } });
    const after = TokenListSchema.parse((await engineer.get("/api/tokens")).body);
    expect(after.items.find((t) => t.id === id)?.revokedAt).not.toBeNull();
  });

  it("refuses unknown and malformed tokens with 401", async () => {
    const script = new ApiClient(server.url);
    script.bearer = "spt_thisTokenWasNeverIssuedByStillpoint000000000";
    expect((await script.get("/api/team")).status).toBe(401);
    const malformed = await new ApiClient(server.url).request("GET", "/api/team", { headers: { authorization: "Basic abc" } });
    expect(malformed.status).toBe(401);
  });

  it("gives a token the user's current role, and nothing once the member is removed", async () => {
    const engineer = await signedIn(server, team.email.engineer);
    const { token } = CreatedTokenSchema.parse((await engineer.post("/api/tokens", { name: "role follows" })).body);
    const script = new ApiClient(server.url);
    script.bearer = token;
    const admin = await signedIn(server, team.email.admin);

    expect((await admin.request("PATCH", `/api/team/members/${team.userId.engineer}`, { json: { role: "viewer" } })).status).toBe(200);
    const denied = await script.post("/api/tokens", { name: "as viewer" });
    expect(denied.status).toBe(403);

    expect((await admin.request("PATCH", `/api/team/members/${team.userId.engineer}`, { json: { role: "engineer" } })).status).toBe(200);
    expect((await script.post("/api/tokens", { name: "engineer again" })).status).toBe(201);

    expect((await admin.request("DELETE", `/api/team/members/${team.userId.engineer}`)).status).toBe(204);
    expect((await script.get("/api/auth/me")).status).toBe(401);
    expect((await engineer.get("/api/auth/me")).status).toBe(401);
  });

  it("does not let one engineer revoke another's token", async () => {
    const other = await createTestTeam(server, "tokens-b");
    const owner = await signedIn(server, other.email.engineer);
    const { id } = CreatedTokenSchema.parse((await owner.post("/api/tokens", { name: "mine" })).body);
    const outsider = await signedIn(server, team.email.admin);
    expect((await outsider.request("DELETE", `/api/tokens/${id}`)).status).toBe(404);
  });
});
