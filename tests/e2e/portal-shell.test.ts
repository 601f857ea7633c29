import { randomBytes } from "node:crypto";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { RunningServer } from "../../api/src/server";
import { recordActivity } from "../../api/src/features/activity/activity.service";
import { findTeamByName, findUserByEmail } from "../../api/src/features/team/team.repo";
import { ERRORS } from "../../api/src/lib/errors";
import { ACTIVITY_PAGE_SIZE } from "../../web/src/features/activity/api/get-activity";
import { DEMO_PASSWORD, DEMO_TEAM, DEMO_USERS, launchBrowser, screenshot, seedDemo, startPortal, type Browser } from "./support";

async function signIn(page: Page, baseUrl: string, email: string, password: string): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

async function signOut(page: Page): Promise<void> {
  await page.getByRole("group", { name: "Signed-in user" }).getByRole("button", { name: "Sign out" }).click();
  await page.waitForURL(/\/sign-in$/);
}

/** Opens the newest captured mail to `to` in the Outbox page; mail arrives through the fake SMTP server a moment late. */
async function openMail(page: Page, to: string) {
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Outbox" }).click();
  await page.getByRole("heading", { level: 1, name: "Outbox" }).waitFor();
  const captured = page.getByRole("list", { name: "Captured e-mails" }).getByRole("link").filter({ hasText: to });
  await expect
    .poll(
      async () => {
        if ((await captured.count()) > 0) return true;
        await page.getByRole("button", { name: /Refresh|Check again/ }).click();
        return false;
      },
      { timeout: 15_000, interval: 500 },
    )
    .toBe(true);
  await captured.first().click();
  return page.getByRole("article");
}

describe("portal shell in a real browser", () => {
  let server: RunningServer;
  let browser: Browser;
  let page: Page;
  const invitee = { email: `pilot-${randomBytes(3).toString("hex")}@kestrel.example`, name: "Brannoch Pilot", password: "gull-rock-lantern" };

  beforeAll(async () => {
    server = await startPortal();
    await seedDemo(server.deps.db);
    browser = await launchBrowser();
    page = browser.page;
  });

  afterAll(async () => {
    await browser?.close();
    await server?.close();
  });

  it("sends a signed-out visitor to sign-in and shows the API's message for a wrong password", async () => {
    await page.goto(`${server.url}/team`);
    await page.waitForURL(/\/sign-in\?next=%2Fteam$/);
    await page.getByRole("button", { name: "Sign in" }).waitFor();
    await screenshot(page, "01-sign-in");

    await page.getByLabel("E-mail").fill("admin@kestrel.example");
    await page.getByLabel("Password").fill("not-the-tide-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    const alert = page.getByRole("alert");
    await alert.waitFor();
    expect(await alert.textContent()).toContain(ERRORS.invalidCredentials.message);
    expect(page.url()).toMatch(/\/sign-in/);
    await screenshot(page, "02-sign-in-wrong-password");
  });

  it("signs the admin in through the page and lists the three demo users on the Team page", async () => {
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByLabel("Password").press("Enter");
    await page.waitForURL(`${server.url}/team`);

    const user = page.getByRole("group", { name: "Signed-in user" });
    expect(await user.textContent()).toContain("Admin");
    expect(await user.textContent()).toContain(DEMO_TEAM);

    const members = page.getByRole("table", { name: `Members of ${DEMO_TEAM}` });
    await members.waitFor();
    for (const demo of DEMO_USERS) {
      await members.getByRole("row").filter({ hasText: demo.email }).waitFor();
    }
    expect(await members.getByRole("row").count()).toBe(1 + DEMO_USERS.length);
    expect(await members.getByRole("combobox", { name: "Role of Morwen Tide" }).inputValue()).toBe("viewer");
    await screenshot(page, "03-team");
  });

  it("invites a new member, finds the e-mail in the Outbox and accepts it with a name and password", async () => {
    const form = page.getByRole("form", { name: "Invite a member" });
    await form.getByLabel("E-mail").fill(invitee.email);
    await form.getByLabel("Role").selectOption("engineer");
    await form.getByRole("button", { name: "Send invitation" }).click();
    await page.getByRole("status").filter({ hasText: `Invitation sent to ${invitee.email}` }).waitFor();
    await page.getByRole("table", { name: "Pending invitations" }).getByRole("row").filter({ hasText: invitee.email }).waitFor();
    await screenshot(page, "04-team-invited");

    const message = await openMail(page, invitee.email);
    expect(await message.textContent()).toContain(invitee.email);
    const link = message.getByRole("link").filter({ hasText: "/invite/" });
    const href = await link.first().getAttribute("href");
    expect(href).toMatch(new RegExp(`^${server.url}/invite/`));
    await screenshot(page, "05-outbox");

    await link.first().click();
    await page.waitForURL(/\/invite\//);
    const acceptForm = page.getByRole("form", { name: "Accept the invitation" });
    await acceptForm.waitFor();
    expect(await acceptForm.textContent()).toContain(invitee.email);
    expect(await acceptForm.textContent()).toContain("Engineer");
    await screenshot(page, "06-accept-invite");

    await acceptForm.getByLabel("Your name").fill(invitee.name);
    await acceptForm.getByLabel("Choose a password").fill(invitee.password);
    await acceptForm.getByRole("button", { name: /^Join / }).click();
    await page.waitForURL(`${server.url}/`);
    expect(await page.getByRole("group", { name: "Signed-in user" }).textContent()).toContain(invitee.name);
  });

  it("signs the new member in with the chosen password and gives them the invited role", async () => {
    await signOut(page);
    await signIn(page, server.url, invitee.email, invitee.password);
    await page.waitForURL(`${server.url}/`);
    const user = page.getByRole("group", { name: "Signed-in user" });
    expect(await user.textContent()).toContain("Engineer");
    expect(await user.textContent()).toContain(DEMO_TEAM);

    const nav = page.getByRole("navigation", { name: "Main" });
    expect(await nav.getByRole("link", { name: "Activity" }).count()).toBe(0);
    expect(await nav.getByRole("link", { name: "Outbox" }).count()).toBe(0);

    await nav.getByRole("link", { name: "Team" }).click();
    const members = page.getByRole("table", { name: `Members of ${DEMO_TEAM}` });
    await members.getByRole("row").filter({ hasText: invitee.email }).waitFor();
    expect(await members.getByRole("combobox").count()).toBe(0);
    expect(await page.getByRole("form", { name: "Invite a member" }).count()).toBe(0);
  });

  it("shows a created API token once, and hides token creation from viewers", async () => {
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "API tokens" }).click();
    await page.getByLabel("Token name").fill("ferry-timetable-export");
    await page.getByRole("button", { name: "Create token" }).click();
    const token = page.getByLabel("New API token");
    await token.waitFor();
    expect((await token.textContent())?.length ?? 0).toBeGreaterThan(20);
    await page.getByRole("table", { name: "Your API tokens" }).getByRole("row").filter({ hasText: "ferry-timetable-export" }).waitFor();
    await screenshot(page, "07-tokens");

    await signOut(page);
    await signIn(page, server.url, "viewer@kestrel.example", DEMO_PASSWORD);
    await page.waitForURL(`${server.url}/`);
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "API tokens" }).click();
    await page.getByText("Engineers and admins create tokens").waitFor();
    expect(await page.getByRole("button", { name: "Create token" }).count()).toBe(0);
    await screenshot(page, "08-tokens-viewer");
  });

  it("renders every screen of the shell for the admin, the activity log included", async () => {
    await signOut(page);
    await signIn(page, server.url, "admin@kestrel.example", DEMO_PASSWORD);
    await page.waitForURL(`${server.url}/`);
    const screens = [
      ["Overview", "09-overview"],
      ["Graphs", "10-graphs"],
      ["New run", "11-new-run"],
      ["Runs", "12-runs"],
      ["Compare", "13-compare"],
    ] as const;
    for (const [label, file] of screens) {
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: label, exact: true }).click();
      await page.getByRole("heading", { level: 1, name: label }).waitFor();
      await screenshot(page, file);
    }

    // More entries than one page, all newer than the invitation, so the invitation only shows after "Load more".
    const teamId = (await findTeamByName(server.deps.db, DEMO_TEAM))?.id ?? null;
    const viewerId = (await findUserByEmail(server.deps.db, "viewer@kestrel.example"))?.id ?? null;
    for (let i = 0; i < ACTIVITY_PAGE_SIZE + 10; i++) {
      await recordActivity(server.deps.db, { teamId, actorUserId: viewerId, action: "auth.signed-in", target: "viewer@kestrel.example" });
    }

    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Activity" }).click();
    const log = page.getByRole("table", { name: "Activity log, newest first" });
    await log.waitFor();
    expect(await log.getByRole("row").count()).toBe(1 + ACTIVITY_PAGE_SIZE);
    expect(await log.getByRole("row").filter({ hasText: invitee.email }).count()).toBe(0);
    await screenshot(page, "14-activity");

    await page.getByRole("button", { name: "Load more" }).click();
    await page.getByText("End of the log").waitFor();
    const rows = (await log.getByRole("row").count()) - 1;
    expect(rows).toBeGreaterThan(ACTIVITY_PAGE_SIZE + 10);
    expect(await page.getByText(`Showing ${rows} entries`).count()).toBe(1);
    expect(await log.getByRole("row").filter({ hasText: "team.invite-created" }).filter({ hasText: invitee.email }).count()).toBe(1);

    // A small laptop screen: the page itself must not scroll sideways (wide tables scroll inside their card).
    await page.setViewportSize({ width: 1024, height: 720 });
    for (const [label, file] of [["Team", "15-team-narrow"], ["Outbox", "16-outbox-narrow"], ["Activity", "17-activity-narrow"]] as const) {
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: label, exact: true }).click();
      await page.getByRole("heading", { level: 1, name: label }).waitFor();
      await expect.poll(() => page.getByRole("status").filter({ hasText: "Loading" }).count()).toBe(0);
      expect(await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);
      await screenshot(page, file);
    }
    await page.setViewportSize({ width: 1360, height: 860 });

    await page.goto(`${server.url}/`);
    await page.getByRole("heading", { level: 1, name: "Overview" }).waitFor();
    const focused = () => page.evaluate(() => document.activeElement?.textContent?.trim() ?? "");
    await page.keyboard.press("Tab");
    expect(await focused()).toBe("Skip to content");
    await page.keyboard.press("Tab");
    expect(await focused()).toBe("Overview");
    await page.keyboard.press("Tab");
    expect(await focused()).toBe("Graphs");
    await screenshot(page, "18-keyboard-focus");

    expect(browser.pageErrors).toEqual([]);
    expect(browser.consoleProblems).toEqual([]);
  });

  it("resets a forgotten password through the e-mailed link", async () => {
    const newPassword = "lighthouse-keeper-7";
    await signOut(page);
    await page.getByRole("link", { name: "Forgot your password?" }).click();
    await page.getByLabel("E-mail").fill("engineer@kestrel.example");
    await page.getByRole("button", { name: "Send reset link" }).click();
    await page.getByRole("status").filter({ hasText: "reset link is on its way" }).waitFor();
    await screenshot(page, "19-forgot-password");

    await signIn(page, server.url, "admin@kestrel.example", DEMO_PASSWORD);
    await page.waitForURL(`${server.url}/`);
    const message = await openMail(page, "engineer@kestrel.example");
    const href = (await message.getByRole("link").filter({ hasText: "/reset/" }).first().getAttribute("href")) ?? "";
    expect(href).toMatch(new RegExp(`^${server.url}/reset/`));
    await signOut(page);
    await page.goto(href);

    await page.getByRole("button", { name: "Save password" }).click();
    expect(await page.getByText("Use at least 10 characters.").count()).toBe(1);
    await page.getByLabel("New password", { exact: true }).fill(newPassword);
    expect(await page.getByText("Use at least 10 characters.").count()).toBe(0);
    await page.getByLabel("Repeat new password").fill(newPassword);
    await screenshot(page, "20-reset-password");
    await page.getByRole("button", { name: "Save password" }).click();
    await page.waitForURL(/\/sign-in$/);
    await page.getByRole("status").filter({ hasText: "Password saved" }).waitFor();

    await signIn(page, server.url, "engineer@kestrel.example", DEMO_PASSWORD);
    expect(await page.getByRole("alert").textContent()).toContain(ERRORS.invalidCredentials.message);
    await signIn(page, server.url, "engineer@kestrel.example", newPassword);
    await page.waitForURL(`${server.url}/`);
    expect(await page.getByRole("group", { name: "Signed-in user" }).textContent()).toContain("Engineer");
    expect(browser.pageErrors).toEqual([]);
    expect(browser.consoleProblems).toEqual([]);
  });
});
