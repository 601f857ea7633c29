import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ActivityPageSchema, type ActivityItem } from "../../api/contracts/activity";
import { CreatedTokenSchema } from "../../api/contracts/tokens";
import type { RunningServer } from "../../api/src/server";
import { ApiClient, createTestTeam, signedIn, startTestServer, unique, type TestTeam } from "./support";

async function allActivity(admin: ApiClient, limit: number): Promise<ActivityItem[]> {
  const items: ActivityItem[] = [];
  let cursor: string | null = null;
  do {
    const query: string = `/api/activity?limit=${limit}${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ""}`;
    const res = await admin.get(query);
    expect(res.status).toBe(200);
    const page = ActivityPageSchema.parse(res.body);
    expect(page.items.length).toBeLessThanOrEqual(limit);
    items.push(...page.items);
    cursor = page.nextCursor;
  } while (cursor);
  return items;
}

describe("activity log", () => {
  let server: RunningServer;
  let team: TestTeam;
  beforeAll(async () => {
    server = await startTestServer();
    team = await createTestTeam(server, "activity");
  });
  afterAll(() => server.close());

  it("records sign-ins, failures, role changes, invites, tokens and sign-outs with actor, target and ip", async () => {
    await new ApiClient(server.url).post("/api/auth/sign-in", { email: team.email.viewer, password: "wrong-password-x" });
    const engineer = await signedIn(server, team.email.engineer);
    const { id: tokenId } = CreatedTokenSchema.parse((await engineer.post("/api/tokens", { name: "audit me" })).body);
    await engineer.request("DELETE", `/api/tokens/${tokenId}`);
    await engineer.post("/api/auth/sign-out");
    const admin = await signedIn(server, team.email.admin);
    await admin.request("PATCH", `/api/team/members/${team.userId.viewer}`, { json: { role: "engineer" } });
    const invitee = `${unique("audit")}@kestrel.example`;
    await admin.post("/api/team/invites", { email: invitee, role: "viewer" });

    const items = await allActivity(admin, 3);
    const actions = items.map((i) => i.action);
    expect(actions).toEqual(
      expect.arrayContaining([
        "auth.sign-in-failed",
        "auth.signed-in",
        "token.created",
        "token.revoked",
        "auth.signed-out",
        "team.role-changed",
        "team.invite-created",
      ]),
    );
    const ids = items.map((i) => i.id);
    expect(ids).toEqual([...ids].sort((a, b) => b - a));
    expect(new Set(ids).size).toBe(ids.length);

    const roleChange = items.find((i) => i.action === "team.role-changed");
    expect(roleChange).toMatchObject({
      actor: { email: team.email.admin },
      target: `user ${team.userId.viewer}`,
      details: { from: "viewer", to: "engineer" },
    });
    expect(roleChange?.ip).toMatch(/127\.0\.0\.1/);
    expect(items.find((i) => i.action === "auth.sign-in-failed")).toMatchObject({ target: team.email.viewer, actor: { email: team.email.viewer } });
    expect(items.find((i) => i.action === "team.invite-created")?.target).toBe(invitee);
    expect(items.find((i) => i.action === "token.created")?.actor?.email).toBe(team.email.engineer);
  });

  it("marks actions taken with an API token and keeps teams apart", async () => {
    const engineer = await signedIn(server, team.email.engineer);
    const { token } = CreatedTokenSchema.parse((await engineer.post("/api/tokens", { name: "script" })).body);
    const script = new ApiClient(server.url);
    script.bearer = token;
    await script.post("/api/tokens", { name: "made by a script" });

    const admin = await signedIn(server, team.email.admin);
    const items = await allActivity(admin, 50);
    expect(items.find((i) => i.action === "token.created" && i.target?.includes("made by a script"))?.viaToken).toBe(true);

    const other = await createTestTeam(server, "activity-other");
    const otherAdmin = await signedIn(server, other.email.admin);
    const otherItems = await allActivity(otherAdmin, 50);
    expect(otherItems.every((i) => i.actor === null || i.actor.email === other.email.admin)).toBe(true);
  });

  it("refuses a malformed cursor with 400", async () => {
    const admin = await signedIn(server, team.email.admin);
    const res = await admin.get("/api/activity?cursor=nonsense");
    expect(res.status).toBe(400);
    expect(res.body).toMatchObject({ error: { code: "validation_failed" } });
    expect((await admin.get("/api/activity?limit=5&extra=1")).status).toBe(400);
  });
});
