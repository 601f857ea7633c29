import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import type { TestProject } from "vitest/node";
import { migrateDatabase, type DbSettings } from "../../api/src/lib/db";
import { connectionUrl, startMariadb, stopMariadb, type DbInstance } from "../../scripts/db";

declare module "vitest" {
  export interface ProvidedContext {
    db: DbSettings;
    sessionSecret: string;
  }
}

const PREFIX = "stillpoint-test-";
const OWNER_FILE = "owner.pid";

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.unref();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      server.close(() => (address && typeof address === "object" ? resolve(address.port) : reject(new Error("no port"))));
    });
  });
}

function ownerAlive(dir: string): boolean {
  const file = path.join(dir, OWNER_FILE);
  // A directory without its owner file may be a run that is just starting.
  if (!existsSync(file)) return Date.now() - statSync(dir).mtimeMs < 10 * 60_000;
  const pid = Number(readFileSync(file, "utf8"));
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** Databases left behind by test runs that were killed before their teardown. */
async function reapAbandoned(): Promise<void> {
  for (const name of readdirSync(tmpdir())) {
    if (!name.startsWith(PREFIX)) continue;
    const dir = path.join(tmpdir(), name);
    if (ownerAlive(dir)) continue;
    await stopMariadb(dir).catch(() => false);
    rmSync(dir, { recursive: true, force: true });
  }
}

/** A throw-away MariaDB on a free port, migrated from drizzle/ exactly as the app does; stopped in teardown. */
export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  await reapAbandoned();
  const dataDir = mkdtempSync(path.join(tmpdir(), PREFIX));
  writeFileSync(path.join(dataDir, OWNER_FILE), String(process.pid));
  let instance: DbInstance | null = null;
  const teardown = async () => {
    await instance?.stop();
    rmSync(dataDir, { recursive: true, force: true });
  };
  try {
    // Another run may grab the port between our probe and the server's bind; try a few.
    for (let attempt = 1; instance === null; attempt++) {
      const port = await freePort();
      try {
        instance = await startMariadb({ dataDir, port, database: "stillpoint_test", log: () => {} });
      } catch (error) {
        if (attempt >= 3) throw error;
      }
    }
    const settings: DbSettings = {
      host: instance.host,
      port: instance.port,
      user: instance.user,
      password: instance.password,
      database: instance.database,
    };
    await migrateDatabase(settings);
    const sessionSecret = "test-session-secret-0123456789abcdef";
    project.provide("db", settings);
    project.provide("sessionSecret", sessionSecret);
    process.env.STILLPOINT_DB_URL = connectionUrl(settings);
    process.env.STILLPOINT_SESSION_SECRET = sessionSecret;
    return teardown;
  } catch (error) {
    await teardown();
    throw error;
  }
}
