import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type {} from "vitest";
import type { TestProject } from "vitest/node";
import { build } from "vite";

export const CHROMIUM_PATH = "/usr/bin/chromium";
const ROOT = path.resolve(import.meta.dirname, "../..");

declare module "vitest" {
  export interface ProvidedContext {
    webDistDir: string;
    chromiumPath: string;
  }
}

function ensureChromium(): void {
  if (existsSync(CHROMIUM_PATH)) return;
  if (process.getuid?.() !== 0) {
    throw new Error(`Browser tests need Debian's chromium at ${CHROMIUM_PATH}: run "apt-get install -y chromium" as root.`);
  }
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  execFileSync("apt-get", ["update"], { stdio: "inherit", env });
  execFileSync("apt-get", ["install", "-y", "chromium"], { stdio: "inherit", env });
  if (!existsSync(CHROMIUM_PATH)) throw new Error(`apt-get finished but ${CHROMIUM_PATH} is still missing.`);
}

export default async function setup(project: TestProject): Promise<() => void> {
  ensureChromium();
  // Build once per test run so the browser exercises the same bundle that production serves. The bundle goes to a
  // directory of its own: a build into dist/web elsewhere (another test run, npm run build) empties that folder and
  // would pull the assets out from under a running test.
  const webDist = mkdtempSync(path.join(tmpdir(), "stillpoint-web-"));
  // Vitest sets NODE_ENV=test, which would make Vite bundle React's development build; build what production serves.
  const nodeEnv = process.env.NODE_ENV;
  process.env.NODE_ENV = "production";
  try {
    await build({
      configFile: path.join(ROOT, "vite.config.ts"),
      mode: "production",
      logLevel: "warn",
      build: { outDir: webDist, emptyOutDir: true },
    });
  } finally {
    process.env.NODE_ENV = nodeEnv;
  }
  if (!existsSync(path.join(webDist, "index.html"))) throw new Error(`vite build did not produce ${webDist}/index.html`);
  project.provide("webDistDir", webDist);
  project.provide("chromiumPath", CHROMIUM_PATH);
  return () => rmSync(webDist, { recursive: true, force: true });
}
