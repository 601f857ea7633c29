// Sessions and credentials: CSRF on every cookie mutation of the route table (uploads, graphs and runs included),
// session fixation, cookie flags, the password policy on reset, the sign-in and reset limits, and API tokens kept
// out of logs and out of the database in plain text.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { OutboxPageSchema } from "../../api/contracts/outbox";
import type { RouteDef } from "../../api/src/http/route";
import { createLogger } from "../../api/src/lib/logger";
import { ROUTES } from "../../api/src/routes";
import { startServer, type RunningServer } from "../../api/src/server";
import type { Runner } from "../../workers/src/runner/main";
import { tusUpload, waitFor } from "./portal-support";
import { removeDir, tempDataDir } from "./runner-support";
import { createTeams, runnerFor, seedTeam, type SeededTeam } from "./security-support";
import { ApiClient, createTestTeam, PASSWORD, signedIn, startTestServer, testConfig, type TestTeam } from "./support";

const SID = "stillpoint.sid";
const SAFE = new Set(["get", "head", "options"]);

function concretePath(route: RouteDef): string {
  return route.path.replace(/:(\w+)/g, (_m, name: string) => (name === "tusId" ? "0".repeat(32) : /id$/i.test(name) ? "1" : "kestrel-placeholder"));
}

function cookieHeader(client: ApiClient): string {
  return [...client.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
}

async function lastMailTo(admin: ApiClient, to: string): Promise<string> {
  const page = OutboxPageSchema.parse((await admin.get("/api/outbox?limit=50")).body);
  const mail = page.items.find((m) => m.to.includes(to));
  if (!mail) throw new Error(`no mail to ${to}`);
  return mail.text ?? "";
}

describe("CSRF on cookie-authenticated mutations", () => {
  let server: RunningServer;
  let runner: Runner;
  let dataDir: string;
  let seeded: SeededTeam;
  let admin: ApiClient;
  let engineer: ApiClient;

  beforeAll(async () => {
    dataDir = tempDataDir();
    server = await startTestServer({ STILLPOINT_DATA_DIR: dataDir });
    const [team] = await createTeams(server, ["csrf"]);
    runner = await runnerFor(dataDir, [team]);
    seeded = await seedTeam(server, team);
    admin = await signedIn(server, team.email.admin);
    engineer = await signedIn(server, team.email.engineer);
  });

  afterAll(async () => {
    await runner?.stop();
    await server?.close();
    removeDir(dataDir);
  });

  const mutations = ROUTES.filter((r) => r.access !== "public" && !SAFE.has(r.method));

  it("walks the upload, graph and run mutations", () => {
    const keys = mutations.map((r) => `${r.method} ${r.path}`);
    for (const key of ["post /api/uploads", "patch /api/uploads/:tusId", "delete /api/uploads/:tusId", "post /api/graphs", "post /api/graphs/:id/retry", "delete /api/graphs/:id", "post /api/runs", "post /api/runs/:id/cancel", "post /api/runs/:id/retry", "delete /api/runs/:id"]) {
      expect(keys).toContain(key);
    }
  });

  it.each(mutations.map((r) => [r.method.toUpperCase(), r.path, r] as const))("%s %s: 403 without the header and with another session's token", async (method, _p, route) => {
    const headers = { "tus-resumable": "1.0.0", "upload-length": "4", "content-type": "application/json" };
    const missing = await admin.request(method, concretePath(route), { json: {}, csrf: false, headers });
    expect(missing.status).toBe(403);
    expect(missing.body).toMatchObject({ error: { code: "csrf_token_invalid" } });
    const foreign = await admin.request(method, concretePath(route), { json: {}, csrf: false, headers: { ...headers, "x-csrf-token": engineer.csrfToken ?? "" } });
    expect(foreign.status).toBe(403);
    expect(foreign.body).toMatchObject({ error: { code: "csrf_token_invalid" } });
  });

  it("accepts the same graph, run and upload mutations with the session's token", async () => {
    const upload = await tusUpload(server, { cookie: cookieHeader(engineer), csrf: engineer.csrfToken }, Buffer.from("1 2\n2 3\n3 1\n"), "ferry-loop.txt");
    const graph = await engineer.post<{ id: number }>("/api/graphs", { uploadId: upload.uploadId, name: "Ferry loop" });
    expect(graph.status).toBe(202);
    const run = await engineer.post<{ id: number }>("/api/runs", { graphId: seeded.graphId, maxIterations: 5000, tolerance: 1e-15 });
    expect(run.status).toBe(202);
    expect((await engineer.post(`/api/runs/${run.body.id}/cancel`)).status).toBe(202);
    await waitFor("the run to end", async () => {
      const detail = await engineer.get<{ status: string }>(`/api/runs/${run.body.id}`);
      return ["queued", "running"].includes(detail.body.status) ? null : detail.body;
    });
    expect((await engineer.request("DELETE", `/api/runs/${run.body.id}`)).status).toBe(204);
    // A Bearer token carries no ambient credential, so it needs no CSRF header.
    expect((await seeded.api.post("/api/runs", { graphId: seeded.graphId })).status).toBe(202);
  });
});

describe("sessions and sign-in", () => {
  let server: RunningServer;
  let team: TestTeam;
  beforeAll(async () => {
    server = await startTestServer({ STILLPOINT_SIGNIN_MAX_FAILURES: "3" });
    team = await createTestTeam(server, "session");
  });
  afterAll(() => server.close());

  it("regenerates the session at sign-in: a planted valid session id gains nothing", async () => {
    const attacker = await signedIn(server, team.email.viewer);
    const planted = attacker.cookies.get(SID) ?? "";
    const victim = new ApiClient(server.url);
    victim.cookies.set(SID, planted);
    expect((await victim.get<{ role: string }>("/api/auth/me")).body.role).toBe("viewer");
    const res = await victim.signIn(team.email.admin);
    expect(res.status).toBe(200);
    expect(victim.cookies.get(SID)).toBeDefined();
    expect(victim.cookies.get(SID)).not.toBe(planted);
    expect(res.body.csrfToken).not.toBe(attacker.csrfToken);
    const replay = new ApiClient(server.url);
    replay.cookies.set(SID, planted);
    const me = await replay.get<{ role?: string }>("/api/auth/me");
    expect(me.status).toBe(401);
    expect((await victim.get<{ role: string }>("/api/auth/me")).body.role).toBe("admin");
  });

  it("sets a signed, HttpOnly, SameSite=Lax, host-only cookie for seven days, and clears it at sign-out", async () => {
    const client = new ApiClient(server.url);
    const res = await client.signIn(team.email.engineer);
    const cookie = res.headers.getSetCookie().find((c) => c.startsWith(`${SID}=`)) ?? "";
    expect(cookie).toMatch(/^stillpoint\.sid=s%3A[^;]+; /);
    expect(cookie).toMatch(/; HttpOnly/i);
    expect(cookie).toMatch(/; SameSite=Lax/i);
    expect(cookie).toMatch(/; Path=\//);
    expect(cookie).not.toMatch(/; Domain=/i);
    const expires = Date.parse(/; Expires=([^;]+)/i.exec(cookie)?.[1] ?? "");
    const days = (expires - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(6.9);
    expect(days).toBeLessThan(7.1);

    const value = client.cookies.get(SID) ?? "";
    const tampered = new ApiClient(server.url);
    tampered.cookies.set(SID, value.replace(/.$/, (c) => (c === "A" ? "B" : "A")));
    expect((await tampered.get("/api/auth/me")).status).toBe(401);
    const unsigned = new ApiClient(server.url);
    unsigned.cookies.set(SID, decodeURIComponent(value).slice(2).split(".")[0]);
    expect((await unsigned.get("/api/auth/me")).status).toBe(401);

    const out = await client.post("/api/auth/sign-out");
    expect(out.status).toBe(204);
    expect(out.headers.getSetCookie().find((c) => c.startsWith(`${SID}=`))).toMatch(/Expires=Thu, 01 Jan 1970/);
  });

  it("locks an address after 3 failures, also against the right password and other spellings of the address", async () => {
    const target = team.email.viewer;
    const client = new ApiClient(server.url);
    for (let i = 0; i < 3; i++) expect((await client.post("/api/auth/sign-in", { email: target, password: `tidewater-guess-${i}` })).status).toBe(401);
    for (const email of [target, target.toUpperCase(), `  ${target} `]) {
      const res = await client.post("/api/auth/sign-in", { email, password: PASSWORD });
      expect(res.status).toBe(429);
      expect(res.body).toMatchObject({ error: { code: "rate_limited" } });
      expect(Number(res.headers.get("retry-after"))).toBeGreaterThan(0);
      expect(client.cookies.has(SID)).toBe(false);
    }
    expect((await new ApiClient(server.url).signIn(team.email.admin)).status).toBe(200);
  });

  it("limits unknown addresses the same way, with the same answer as a wrong password", async () => {
    const client = new ApiClient(server.url);
    const ghost = "nobody-at-the-harbour@kestrel.example";
    const wrong = await client.post("/api/auth/sign-in", { email: team.email.engineer, password: "not-the-password-1" });
    const unknown = await client.post("/api/auth/sign-in", { email: ghost, password: "not-the-password-1" });
    expect(unknown.status).toBe(wrong.status);
    expect(unknown.body).toEqual(wrong.body);
    for (let i = 0; i < 2; i++) await client.post("/api/auth/sign-in", { email: ghost, password: `guess-number-${i}` });
    expect((await client.post("/api/auth/sign-in", { email: ghost, password: "guess-number-9" })).status).toBe(429);
  });

  it("does not count successful sign-ins towards the limit", async () => {
    for (let i = 0; i < 6; i++) expect((await new ApiClient(server.url).signIn(team.email.engineer)).status).toBe(200);
  });

  it("limits password-reset requests per address to 5 in the window", async () => {
    const client = new ApiClient(server.url);
    for (let i = 0; i < 5; i++) expect((await client.post("/api/auth/password-reset", { email: team.email.admin })).status).toBe(202);
    const limited = await client.post("/api/auth/password-reset", { email: team.email.admin });
    expect(limited.status).toBe(429);
    expect(limited.body).toMatchObject({ error: { code: "rate_limited" } });
  });
});

describe("password policy on reset", () => {
  let server: RunningServer;
  let team: TestTeam;
  beforeAll(async () => {
    server = await startTestServer();
    team = await createTestTeam(server, "policy");
  });
  afterAll(() => server.close());

  it("refuses short, over-long and e-mail-derived passwords, then accepts a good one", async () => {
    const admin = await signedIn(server, team.email.admin);
    await new ApiClient(server.url).post("/api/auth/password-reset", { email: team.email.engineer });
    const token = /\/reset\/([A-Za-z0-9_-]+)/.exec(await lastMailTo(admin, team.email.engineer))?.[1] ?? "";
    expect(token.length).toBeGreaterThan(10);
    const attempt = (password: string) => new ApiClient(server.url).post(`/api/auth/password-reset/${token}`, { password });
    for (const password of ["short", "nine-char", "x".repeat(201)]) {
      const res = await attempt(password);
      expect(res.status, password).toBe(400);
      expect(res.body, password).toMatchObject({ error: { code: "validation_failed" } });
    }
    const local = team.email.engineer.split("@")[0];
    for (const password of [team.email.engineer, team.email.engineer.toUpperCase(), ` ${local} `]) {
      const res = await attempt(password);
      expect(res.status, password).toBe(400);
      expect(res.body, password).toMatchObject({ error: { code: "weak_password", details: { problems: [expect.stringMatching(/e-mail/)] } } });
    }
    expect((await new ApiClient(server.url).signIn(team.email.engineer)).status).toBe(200);
    expect((await attempt("tidal-review-volume-12")).status).toBe(204);
    expect((await new ApiClient(server.url).signIn(team.email.engineer)).status).toBe(401);
    expect((await new ApiClient(server.url).signIn(team.email.engineer, "tidal-review-volume-12")).status).toBe(200);
  });
});

describe("API tokens stay secret", () => {
  const lines: string[] = [];
  let server: RunningServer;
  let runner: Runner;
  let dataDir: string;
  let seeded: SeededTeam;

  beforeAll(async () => {
    dataDir = tempDataDir();
    const logger = createLogger("debug", { write: (line: string) => void lines.push(line) });
    server = await startServer(testConfig({ STILLPOINT_DATA_DIR: dataDir }), logger);
    const [team] = await createTeams(server, ["token-logs"]);
    runner = await runnerFor(dataDir, [team]);
    seeded = await seedTeam(server, team);
  });

  afterAll(async () => {
    await runner?.stop();
    await server?.close();
    removeDir(dataDir);
  });

  it("never logs a token: uploads, graphs, runs, downloads, bad and revoked tokens, errors", async () => {
    const token = seeded.api.bearer ?? "";
    expect(token).toMatch(/^spt_/);
    const api = seeded.api;
    await tusUpload(server, { bearer: token }, Buffer.from("1 2\n2 1\n"), "token-log.txt", { chunkSize: 4 });
    await api.get(`/api/graphs/${seeded.graphId}`);
    await api.get(`/api/runs/${seeded.runId}/scores.csv`);
    await api.get(`/api/runs/${seeded.runId}/nodes/1`);
    await api.get("/api/no-such-route");
    await api.post("/api/runs", { graphId: seeded.graphId, damping: 7 });
    const forged = `${token.slice(0, -4)}abcd`;
    const unknown = await fetch(`${server.url}/api/graphs`, { headers: { authorization: `Bearer ${forged}` } });
    expect(unknown.status).toBe(401);
    expect(await unknown.text()).not.toContain(forged);
    await fetch(`${server.url}/api/graphs`, { headers: { authorization: `Token ${token}` } });
    await fetch(`${server.url}/api/graphs?token=${token}`, { headers: { authorization: `Bearer ${token}` } });
    const session = await signedIn(server, seeded.team.email.engineer);
    const second = await session.post<{ id: number; token: string }>("/api/tokens", { name: "to revoke" });
    expect((await session.request("DELETE", `/api/tokens/${second.body.id}`)).status).toBe(204);
    await fetch(`${server.url}/api/graphs`, { headers: { authorization: `Bearer ${second.body.token}` } });

    const log = lines.join("");
    expect(log).toContain(`/api/runs/${seeded.runId}/scores.csv`);
    for (const secret of [token, forged, second.body.token, token.slice(4), second.body.token.slice(4)]) expect(log).not.toContain(secret);
  });

  it("keeps only a hash and a short hint in the database", async () => {
    const token = seeded.api.bearer ?? "";
    const [tokenRows] = await server.deps.pool.query("SELECT * FROM api_tokens WHERE team_id = ?", [seeded.team.teamId]);
    const [activityRows] = await server.deps.pool.query("SELECT * FROM activity WHERE team_id = ?", [seeded.team.teamId]);
    const stored = JSON.stringify([tokenRows, activityRows]);
    expect(stored).not.toContain(token);
    expect(stored).not.toContain(token.slice(8));
    expect(stored).toContain(token.slice(0, 8));
  });
});
