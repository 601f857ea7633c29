import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Page } from "playwright-core";
import { expect, inject } from "vitest";
import { testConfig } from "../api/support";
import { findTeamByName, findUserByEmail, updateUserPassword } from "../../api/src/features/team/team.repo";
import { hashPassword } from "../../api/src/lib/passwords";
import { startServer, type RunningServer } from "../../api/src/server";
import { startRunner, type Runner, type RunnerConfig } from "../../workers/src/runner/main";
import { runnerConfig } from "../api/runner-support";
import { DEMO_PASSWORD, DEMO_TEAM, DEMO_USERS, screenshot, seedDemo } from "./support";

export interface FlowPortal {
  server: RunningServer;
  dataDir: string;
  teamId: number;
  /** Stops the runner and starts a fresh one, e.g. with injected shard faults or without them again. */
  replaceRunner(overrides?: Partial<RunnerConfig>): Promise<void>;
  close(): Promise<void>;
}

/** The real server and an in-process runner sharing one temporary data directory; the runner serves the demo team only. */
export async function startFlowPortal(): Promise<FlowPortal> {
  const dataDir = mkdtempSync(path.join(tmpdir(), "stillpoint-e2e-data-"));
  const server = await startServer(
    testConfig({
      STILLPOINT_DATA_DIR: dataDir,
      STILLPOINT_WEB_DIR: inject("webDistDir"),
      STILLPOINT_LOG_LEVEL: "error",
    }),
  );
  await seedDemo(server.deps.db);
  // Other browser tests in this database may have changed a demo password (the reset flow does); put them back.
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  for (const demo of DEMO_USERS) {
    const user = await findUserByEmail(server.deps.db, demo.email);
    if (user) await updateUserPassword(server.deps.db, user.id, passwordHash);
  }
  const team = await findTeamByName(server.deps.db, DEMO_TEAM);
  if (!team) throw new Error("demo team missing after seeding");
  const teamId = team.id;
  let runner: Runner = await startRunner(runnerConfig(dataDir, teamId, { publicUrl: server.url }));
  return {
    server,
    dataDir,
    teamId,
    async replaceRunner(overrides = {}) {
      await runner.stop();
      runner = await startRunner(runnerConfig(dataDir, teamId, { publicUrl: server.url, ...overrides }));
    },
    async close() {
      await runner.stop();
      await server.close();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

export async function signInAs(page: Page, baseUrl: string, email: string): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`${baseUrl}/`);
}

export async function signOutOf(page: Page): Promise<void> {
  await page.getByRole("group", { name: "Signed-in user" }).getByRole("button", { name: "Sign out" }).click();
  await page.waitForURL(/\/sign-in/);
}

/** A JSON GET with the page's own session cookie. */
export async function apiGet<T>(page: Page, url: string): Promise<T> {
  const res = await page.request.get(url);
  expect(res.status(), `GET ${url}`).toBe(200);
  return (await res.json()) as T;
}

export const sha256File = (file: string) => `sha256:${createHash("sha256").update(readFileSync(file)).digest("hex")}`;

/**
 * A crawl of the Kestrel Isles as an edge list with URL ids: a ring over every page, links from each page to a few
 * portal pages, and a small link farm of throw-away pages all pointing at one "best ferry deals" page.
 */
export function writeKestrelCrawl(dir: string, name: string, pages: number, seed: number): { file: string; nodes: number } {
  const sites = ["council", "ferries", "harbour", "museum", "tourism"];
  const url = (v: number) => `https://${sites[v % sites.length]}.kestrel.example/p/${v}`;
  let state = seed >>> 0;
  const next = () => (state = (Math.imul(state, 1664525) + 1013904223) >>> 0);
  const lines = ["source,target"];
  for (let v = 0; v < pages; v++) lines.push(`${url(v)},${url((v + 1) % pages)}`);
  for (let i = 0; i < pages * 3; i++) {
    const u = next() % pages;
    const v = next() % Math.max(2, Math.floor(pages / 25));
    if (u !== v) lines.push(`${url(u)},${url(v)}`);
  }
  const deals = "https://best-ferry-deals.kestrel.example/";
  for (let f = 0; f < 40; f++) lines.push(`https://farm${f}.kestrel.example/,${deals}`);
  lines.push(`${deals},${url(0)}`);
  const file = path.join(dir, name);
  writeFileSync(file, `${lines.join("\n")}\n`);
  return { file, nodes: pages + 41 };
}

/** A large integer-id edge list (about `megabytes` MB) for the interrupted upload; it is never ingested. */
export function writeBulkEdges(dir: string, name: string, megabytes: number): string {
  const file = path.join(dir, name);
  const rows: string[] = [];
  let state = 99;
  let size = 0;
  while (size < megabytes * 1024 * 1024) {
    state = (Math.imul(state, 1103515245) + 12345) >>> 0;
    const line = `${state % 1_000_003},${(state >>> 7) % 1_000_003}\n`;
    rows.push(line);
    size += line.length;
  }
  writeFileSync(file, rows.join(""));
  return file;
}

/** A full-page screenshot from the top, so the sticky sidebar is drawn where a person sees it. */
export async function shot(page: Page, name: string): Promise<void> {
  await page.evaluate(() => window.scrollTo(0, 0));
  await screenshot(page, name);
}
