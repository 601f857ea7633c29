import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { SessionSchema } from "../../api/contracts/auth";
import type { RunningServer } from "../../api/src/server";
import { ApiClient, createTestTeam, PASSWORD, signedIn, startTestServer, type TestTeam } from "./support";

describe("sign-in, session and CSRF", () => {
  let server: RunningServer;
  let team: TestTeam;
  beforeAll(async () => {
    server = await startTestServer();
    team = await createTestTeam(server, "auth");
  });
  afterAll(() => server.close());

  it("signs in, sets an HttpOnly SameSite=Lax session cookie and returns user, team, role and a CSRF token", async () => {
    const client = new ApiClient(server.url);
    const res = await client.post("/api/auth/sign-in", { email: team.email.engineer, password: PASSWORD });
    expect(res.status).toBe(200);
    const session = SessionSchema.parse(res.body);
    expect(session.user.email).toBe(team.email.engineer);
    expect(session.team).toEqual({ id: team.teamId, name: team.name });
    expect(session.role).toBe("engineer");
    expect(session.csrfToken.length).toBeGreaterThanOrEqual(20);
    const cookie = res.headers.getSetCookie().find((c) => c.startsWith("stillpoint.sid="));
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/; HttpOnly/i);
    expect(cookie).toMatch(/; SameSite=Lax/i);
    expect(cookie).not.toMatch(/; Secure/i);
    expect(cookie).toMatch(/; Path=\//);
  });

  it("accepts the address in any case and with spaces", async () => {
    const client = new ApiClient(server.url);
    const res = await client.signIn(`  ${team.email.viewer.toUpperCase()} `);
    expect(res.status).toBe(200);
    expect(res.body.role).toBe("viewer");
  });

  it("gives a new session id at sign-in (a planted id is not kept)", async () => {
    const client = new ApiClient(server.url);
    client.cookies.set("stillpoint.sid", "s%3Aplanted.invalid");
    await client.signIn(team.email.viewer);
    expect(client.cookies.get("stillpoint.sid")).not.toBe("s%3Aplanted.invalid");
    expect((await client.get("/api/auth/me")).status).toBe(200);
  });

  it("refuses a wrong password with 401 invalid_credentials and sets no cookie", async () => {
    const client = new ApiClient(server.url);
    const res = await client.post("/api/auth/sign-in", { email: team.email.admin, password: "not-the-password" });
    expect(res.status).toBe(401);
    expect(res.body).toMatchObject({ error: { code: "invalid_credentials" } });
    expect(client.cookies.size).toBe(0);
    const unknown = await client.post("/api/auth/sign-in", { email: "nobody@kestrel.example", password: "whatever-it-is" });
    expect(unknown.status).toBe(401);
    expect(unknown.body).toMatchObject({ error: { code: "invalid_credentials" } });
  });

  it("answers 429 with Retry-After after 10 failed attempts for one address, and only for that address", async () => {
    const local = await startTestServer();
    try {
      const client = new ApiClient(local.url);
      for (let i = 0; i < 10; i++) {
        const res = await client.post("/api/auth/sign-in", { email: team.email.viewer, password: `wrong-${i}-password` });
        expect(res.status).toBe(401);
      }
      const limited = await client.post("/api/auth/sign-in", { email: team.email.viewer, password: PASSWORD });
      expect(limited.status).toBe(429);
      expect(limited.body).toMatchObject({ error: { code: "rate_limited" } });
      expect(Number(limited.headers.get("retry-after"))).toBeGreaterThan(0);
      expect((await client.signIn(team.email.engineer)).status).toBe(200);
    } finally {
      await local.close();
    }
  });

  it("GET /api/auth/me returns the caller with the same CSRF token, 401 when not signed in", async () => {
    const anonymous = await new ApiClient(server.url).get("/api/auth/me");
    expect(anonymous.status).toBe(401);
    expect(anonymous.body).toMatchObject({ error: { code: "unauthenticated" } });

    const client = await signedIn(server, team.email.admin);
    const me = await client.get("/api/auth/me");
    expect(me.status).toBe(200);
    const session = SessionSchema.parse(me.body);
    expect(session.role).toBe("admin");
    expect(session.csrfToken).toBe(client.csrfToken);
  });

  it("signs out: the cookie stops working", async () => {
    const client = await signedIn(server, team.email.viewer);
    const cookie = client.cookies.get("stillpoint.sid");
    const res = await client.post("/api/auth/sign-out");
    expect(res.status).toBe(204);
    expect((await client.get("/api/auth/me")).status).toBe(401);
    const replay = new ApiClient(server.url);
    replay.cookies.set("stillpoint.sid", cookie ?? "");
    expect((await replay.get("/api/auth/me")).status).toBe(401);
  });

  it("refuses a cookie-authenticated mutation without or with a wrong X-CSRF-Token, accepts it with the token", async () => {
    const client = await signedIn(server, team.email.engineer);
    const missing = await client.post("/api/tokens", { name: "csrf check" }, { csrf: false });
    expect(missing.status).toBe(403);
    expect(missing.body).toMatchObject({ error: { code: "csrf_token_invalid" } });
    const wrong = await client.request("POST", "/api/tokens", {
      json: { name: "csrf check" },
      csrf: false,
      headers: { "x-csrf-token": "not-the-token" },
    });
    expect(wrong.status).toBe(403);
    const ok = await client.post("/api/tokens", { name: "csrf check" });
    expect(ok.status).toBe(201);
  });

  it("keeps the session across a server restart (new app instance, same database, same cookie)", async () => {
    const first = await startTestServer();
    const client = await signedIn(first, team.email.engineer);
    await first.close();
    const second = await startTestServer();
    try {
      client.baseUrl = second.url;
      const me = await client.get("/api/auth/me");
      expect(me.status).toBe(200);
      expect(SessionSchema.parse(me.body).user.email).toBe(team.email.engineer);
      expect((await client.post("/api/tokens", { name: "after restart" })).status).toBe(201);
    } finally {
      await second.close();
    }
  });

  it("rejects unknown fields with 400 and the error shape", async () => {
    const res = await new ApiClient(server.url).post("/api/auth/sign-in", {
      email: team.email.admin,
      password: PASSWORD,
      remember: true,
    });
    expect(res.status).toBe(400);
    expect(res.body).toEqual({
      error: {
        code: "validation_failed",
        message: expect.any(String),
        details: { issues: [expect.objectContaining({ code: "unrecognized_keys" })] },
      },
    });
  });

  it("answers malformed JSON with 400 invalid_json", async () => {
    const res = await fetch(`${server.url}/api/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: "{ not json",
    });
    expect(res.status).toBe(400);
    expect(await res.json()).toMatchObject({ error: { code: "invalid_json" } });
  });
});
