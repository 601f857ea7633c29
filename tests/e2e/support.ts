import { mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { inject } from "vitest";
import type { Role } from "../../api/contracts/common";
import { testConfig } from "../api/support";
import { findTeamByName, findUserByEmail, insertTeam, insertUser, upsertMembership } from "../../api/src/features/team/team.repo";
import type { Db } from "../../api/src/lib/db";
import { hashPassword } from "../../api/src/lib/passwords";
import { startServer, type RunningServer } from "../../api/src/server";

export const DEMO_PASSWORD = "tidewater-demo";
export const DEMO_TEAM = "Kestrel Isles Data Office";
export const DEMO_USERS: ReadonlyArray<{ email: string; name: string; role: Role }> = [
  { email: "admin@kestrel.example", name: "Isla Harbour", role: "admin" },
  { email: "engineer@kestrel.example", name: "Ferris Quay", role: "engineer" },
  { email: "viewer@kestrel.example", name: "Morwen Tide", role: "viewer" },
];

export const ARTIFACTS_DIR = path.resolve(import.meta.dirname, "../artifacts");

/** The real server (API, fake mail, built web app) on a free port against the test database. */
export function startPortal(): Promise<RunningServer> {
  return startServer(
    testConfig({
      STILLPOINT_DATA_DIR: ".test-data",
      STILLPOINT_WEB_DIR: inject("webDistDir"),
      STILLPOINT_LOG_LEVEL: "error",
    }),
  );
}

/** Creates the demo team and its three users unless they already exist. */
export async function seedDemo(db: Db): Promise<void> {
  const teamId = (await findTeamByName(db, DEMO_TEAM))?.id ?? (await insertTeam(db, DEMO_TEAM));
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  for (const user of DEMO_USERS) {
    const userId = (await findUserByEmail(db, user.email))?.id ?? (await insertUser(db, { ...user, passwordHash }));
    await upsertMembership(db, teamId, userId, user.role);
  }
}

export interface Browser {
  context: BrowserContext;
  page: Page;
  /** Uncaught exceptions thrown in the page; a healthy run has none. */
  pageErrors: string[];
  /** Console warnings and errors, except the 401s of the signed-out session probe and of wrong passwords. */
  consoleProblems: string[];
  close(): Promise<void>;
}

export async function launchBrowser(): Promise<Browser> {
  const profile = mkdtempSync(path.join(tmpdir(), "stillpoint-chromium-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: inject("chromiumPath"),
    headless: true,
    viewport: { width: 1360, height: 860 },
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
  const page = context.pages()[0] ?? (await context.newPage());
  const pageErrors: string[] = [];
  page.on("pageerror", (error) => pageErrors.push(error.message));
  const consoleProblems: string[] = [];
  page.on("console", (message) => {
    const expected401 = message.text().includes("status of 401");
    if ((message.type() === "error" && !expected401) || message.type() === "warning") {
      consoleProblems.push(`${message.type()}: ${message.text()}`);
    }
  });
  return {
    context,
    page,
    pageErrors,
    consoleProblems,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

export async function screenshot(page: Page, name: string): Promise<void> {
  mkdirSync(ARTIFACTS_DIR, { recursive: true });
  // Let fonts load and colour transitions finish so the picture shows what a person would see.
  await page.evaluate(() => document.fonts.ready);
  await page.waitForTimeout(250);
  await page.screenshot({ path: path.join(ARTIFACTS_DIR, `${name}.png`), fullPage: true });
}
