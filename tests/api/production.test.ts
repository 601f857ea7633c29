import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ConfigError, loadConfig } from "../../api/src/config";
import type { RunningServer } from "../../api/src/server";
import { ApiClient, createTestTeam, PASSWORD, startTestServer, type TestTeam } from "./support";

describe("production mode", () => {
  let server: RunningServer;
  let team: TestTeam;
  beforeAll(async () => {
    server = await startTestServer({
      NODE_ENV: "production",
      STILLPOINT_FAKE_SMTP: "",
      STILLPOINT_SMTP_URL: "smtp://127.0.0.1:2",
      STILLPOINT_TRUST_PROXY: "1",
      STILLPOINT_LOG_LEVEL: "silent",
    });
    team = await createTestTeam(server, "production");
  });
  afterAll(() => server?.close());

  it("marks the session cookie Secure behind a TLS-terminating proxy", async () => {
    const client = new ApiClient(server.url);
    const res = await client.request("POST", "/api/auth/sign-in", {
      json: { email: team.email.admin, password: PASSWORD },
      headers: { "x-forwarded-proto": "https" },
    });
    expect(res.status).toBe(200);
    const cookie = res.headers.getSetCookie().find((c) => c.startsWith("stillpoint.sid="));
    expect(cookie).toMatch(/; Secure/i);
    expect(cookie).toMatch(/; HttpOnly/i);
  });

  it("does not serve the outbox", async () => {
    const client = new ApiClient(server.url);
    await client.request("POST", "/api/auth/sign-in", {
      json: { email: team.email.admin, password: PASSWORD },
      headers: { "x-forwarded-proto": "https" },
    });
    const res = await client.request("GET", "/api/outbox", { headers: { "x-forwarded-proto": "https" } });
    expect(res.status).toBe(404);
  });

  it("refuses to start without a session secret and an SMTP URL, naming both", () => {
    expect(() => loadConfig({ NODE_ENV: "production" })).toThrow(ConfigError);
    expect(() => loadConfig({ NODE_ENV: "production" })).toThrow(/STILLPOINT_SESSION_SECRET[\s\S]*STILLPOINT_SMTP_URL/);
    expect(() => loadConfig({ STILLPOINT_PORT: "eighty" })).toThrow(/STILLPOINT_PORT/);
  });
});
