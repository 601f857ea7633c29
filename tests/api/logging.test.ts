import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { CreatedTokenSchema } from "../../api/contracts/tokens";
import { createLogger } from "../../api/src/lib/logger";
import { startServer, type RunningServer } from "../../api/src/server";
import { ApiClient, createTestTeam, PASSWORD, signedIn, testConfig, unique, type TestTeam } from "./support";

describe("request logging", () => {
  const lines: string[] = [];
  let server: RunningServer;
  let team: TestTeam;
  beforeAll(async () => {
    const logger = createLogger("debug", { write: (line: string) => void lines.push(line) });
    server = await startServer(testConfig(), logger);
    team = await createTestTeam(server, "logging");
  });
  afterAll(() => server.close());

  it("logs requests without passwords, cookies, CSRF tokens, API tokens or link secrets", async () => {
    const admin = await signedIn(server, team.email.admin);
    const engineer = await signedIn(server, team.email.engineer);
    const { token } = CreatedTokenSchema.parse((await engineer.post("/api/tokens", { name: "logged?" })).body);
    const script = new ApiClient(server.url);
    script.bearer = token;
    await script.get("/api/team");
    await admin.post("/api/team/invites", { email: `${unique("logged")}@kestrel.example`, role: "viewer" });
    const outbox = (await admin.get<{ items: Array<{ text: string }> }>("/api/outbox")).body;
    const inviteToken = /\/invite\/([A-Za-z0-9_-]+)/.exec(outbox.items[0].text)?.[1] ?? "missing";
    await new ApiClient(server.url).get(`/api/invites/${inviteToken}`);

    const log = lines.join("");
    expect(log).toContain("/api/team");
    expect(log).toContain("/api/invites/[redacted]");
    for (const secret of [PASSWORD, token, inviteToken, admin.csrfToken ?? "missing", admin.cookies.get("stillpoint.sid") ?? "missing"]) {
      expect(log).not.toContain(secret);
    }
  });
});
