import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { SessionSchema } from "../../api/contracts/auth";
import { OutboxPageSchema } from "../../api/contracts/outbox";
import { InvitePreviewSchema, InviteSchema, TeamSchema } from "../../api/contracts/team";
import { invites, passwordResets } from "../../api/src/db/schema";
import type { RunningServer } from "../../api/src/server";
import { ApiClient, createTestTeam, PASSWORD, signedIn, startTestServer, unique, type TestTeam } from "./support";

/** The newest captured message to an address, read through the outbox as an admin would. */
async function lastMailTo(admin: ApiClient, to: string) {
  const page = OutboxPageSchema.parse((await admin.get("/api/outbox?limit=50")).body);
  const mail = page.items.find((m) => m.to.includes(to));
  if (!mail) throw new Error(`no mail to ${to}`);
  return mail;
}

function linkToken(text: string | null, kind: "invite" | "reset"): string {
  const match = new RegExp(`/${kind}/([A-Za-z0-9_-]+)`).exec(text ?? "");
  if (!match) throw new Error(`no ${kind} link in: ${text}`);
  return match[1];
}

describe("invites", () => {
  let server: RunningServer;
  let team: TestTeam;
  let admin: ApiClient;
  beforeAll(async () => {
    server = await startTestServer();
    team = await createTestTeam(server, "invites");
    admin = await signedIn(server, team.email.admin);
  });
  afterAll(() => server.close());

  it("e-mails a link whose token lets the invitee create an account, sign in and act with the given role", async () => {
    const email = `${unique("newcomer")}@kestrel.example`;
    const created = await admin.post("/api/team/invites", { email, role: "engineer" });
    expect(created.status).toBe(201);
    const invite = InviteSchema.parse(created.body);
    expect(new Date(invite.expiresAt).getTime() - Date.now()).toBeGreaterThan(71 * 3600_000);

    const mail = await lastMailTo(admin, email);
    expect(mail.subject).toContain(team.name);
    expect(mail.text).toContain(`${server.url}/invite/`);
    const token = linkToken(mail.text, "invite");
    const [stored] = await server.deps.db.select().from(invites).where(eq(invites.id, invite.id));
    expect(stored.tokenHash).not.toBe(token);
    expect(stored.tokenHash).toMatch(/^[0-9a-f]{64}$/);

    const visitor = new ApiClient(server.url);
    const preview = await visitor.get(`/api/invites/${token}`);
    expect(preview.status).toBe(200);
    expect(InvitePreviewSchema.parse(preview.body)).toMatchObject({ email, role: "engineer", team: { id: team.teamId }, existingAccount: false });

    const accepted = await visitor.post(`/api/invites/${token}/accept`, { name: "Fenella Quay", password: "salt-marsh-evening" });
    expect(accepted.status).toBe(200);
    expect(SessionSchema.parse(accepted.body)).toMatchObject({ role: "engineer", user: { email, name: "Fenella Quay" } });
    visitor.csrfToken = SessionSchema.parse(accepted.body).csrfToken;
    expect((await visitor.post("/api/tokens", { name: "newcomer token" })).status).toBe(201);

    const fresh = new ApiClient(server.url);
    const signIn = await fresh.signIn(email, "salt-marsh-evening");
    expect(signIn.status).toBe(200);
    expect(signIn.body.role).toBe("engineer");
    const members = TeamSchema.parse((await admin.get("/api/team")).body).members;
    expect(members.find((m) => m.email === email)?.role).toBe("engineer");

    const reused = await new ApiClient(server.url).post(`/api/invites/${token}/accept`, { name: "Again", password: "salt-marsh-evening" });
    expect(reused.status).toBe(410);
    expect(reused.body).toMatchObject({ error: { code: "token_used" } });
    expect((await new ApiClient(server.url).get(`/api/invites/${token}`)).status).toBe(410);
  });

  it("refuses an expired invite with 410", async () => {
    const email = `${unique("late")}@kestrel.example`;
    const invite = InviteSchema.parse((await admin.post("/api/team/invites", { email, role: "viewer" })).body);
    const token = linkToken((await lastMailTo(admin, email)).text, "invite");
    await server.deps.db.update(invites).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(invites.id, invite.id));
    const visitor = new ApiClient(server.url);
    const preview = await visitor.get(`/api/invites/${token}`);
    expect(preview.status).toBe(410);
    expect(preview.body).toMatchObject({ error: { code: "token_expired" } });
    expect((await visitor.post(`/api/invites/${token}/accept`, { name: "Late", password: "tidal-pools-at-dawn" })).status).toBe(410);
  });

  it("lists open invites and withdraws one, after which its link is unknown", async () => {
    const email = `${unique("withdrawn")}@kestrel.example`;
    const invite = InviteSchema.parse((await admin.post("/api/team/invites", { email, role: "viewer" })).body);
    const token = linkToken((await lastMailTo(admin, email)).text, "invite");
    const list = (await admin.get<{ items: Array<{ id: number }> }>("/api/team/invites")).body.items;
    expect(list.map((i) => i.id)).toContain(invite.id);
    expect((await admin.request("DELETE", `/api/team/invites/${invite.id}`)).status).toBe(204);
    expect((await admin.get<{ items: Array<{ id: number }> }>("/api/team/invites")).body.items.map((i) => i.id)).not.toContain(invite.id);
    expect((await new ApiClient(server.url).get(`/api/invites/${token}`)).status).toBe(404);
  });

  it("refuses to invite a current member (409) and keeps the last admin (409)", async () => {
    const again = await admin.post("/api/team/invites", { email: team.email.viewer, role: "viewer" });
    expect(again.status).toBe(409);
    expect(again.body).toMatchObject({ error: { code: "already_member" } });
    const demote = await admin.request("PATCH", `/api/team/members/${team.userId.admin}`, { json: { role: "viewer" } });
    expect(demote.status).toBe(409);
    expect(demote.body).toMatchObject({ error: { code: "last_admin" } });
  });

  it("applies the password policy to new accounts", async () => {
    const email = `${unique("weak")}@kestrel.example`;
    await admin.post("/api/team/invites", { email, role: "viewer" });
    const token = linkToken((await lastMailTo(admin, email)).text, "invite");
    const short = await new ApiClient(server.url).post(`/api/invites/${token}/accept`, { name: "Weak", password: "short" });
    expect(short.status).toBe(400);
    const same = await new ApiClient(server.url).post(`/api/invites/${token}/accept`, { name: "Weak", password: email });
    expect(same.status).toBe(400);
    expect(same.body).toMatchObject({ error: { code: "weak_password" } });
  });
});

describe("password reset", () => {
  let server: RunningServer;
  let team: TestTeam;
  let admin: ApiClient;
  beforeAll(async () => {
    server = await startTestServer();
    team = await createTestTeam(server, "reset");
    admin = await signedIn(server, team.email.admin);
  });
  afterAll(() => server.close());

  it("always answers 202, e-mails a single-use link, sets the password and ends old sessions", async () => {
    const unknown = await new ApiClient(server.url).post("/api/auth/password-reset", { email: "no-such-person@kestrel.example" });
    expect(unknown.status).toBe(202);

    const before = await signedIn(server, team.email.viewer);
    const res = await new ApiClient(server.url).post("/api/auth/password-reset", { email: team.email.viewer });
    expect(res.status).toBe(202);
    const token = linkToken((await lastMailTo(admin, team.email.viewer)).text, "reset");

    const visitor = new ApiClient(server.url);
    expect((await visitor.post(`/api/auth/password-reset/${token}`, { password: "new-tide-tables-2025" })).status).toBe(204);
    expect((await visitor.signIn(team.email.viewer, PASSWORD)).status).toBe(401);
    expect((await visitor.signIn(team.email.viewer, "new-tide-tables-2025")).status).toBe(200);
    expect((await before.get("/api/auth/me")).status).toBe(401);

    const reused = await visitor.post(`/api/auth/password-reset/${token}`, { password: "another-tide-table" });
    expect(reused.status).toBe(410);
    expect(reused.body).toMatchObject({ error: { code: "token_used" } });
  });

  it("refuses an expired reset link with 410", async () => {
    await new ApiClient(server.url).post("/api/auth/password-reset", { email: team.email.engineer });
    const token = linkToken((await lastMailTo(admin, team.email.engineer)).text, "reset");
    await server.deps.db.update(passwordResets).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(passwordResets.userId, team.userId.engineer));
    const res = await new ApiClient(server.url).post(`/api/auth/password-reset/${token}`, { password: "too-late-for-this" });
    expect(res.status).toBe(410);
    expect(res.body).toMatchObject({ error: { code: "token_expired" } });
    expect((await new ApiClient(server.url).signIn(team.email.engineer, PASSWORD)).status).toBe(200);
  });
});

describe("outbox", () => {
  it("is not served when the mail fake is off", async () => {
    const server = await startTestServer({ STILLPOINT_FAKE_SMTP: "0" });
    try {
      const team = await createTestTeam(server, "outbox");
      const admin = await signedIn(server, team.email.admin);
      const res = await admin.get("/api/outbox");
      expect(res.status).toBe(404);
    } finally {
      await server.close();
    }
  });
});
