import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import path from "node:path";
import { loadConfig, type Config } from "../api/src/config";
import { createDb, createPool, migrateDatabase } from "../api/src/lib/db";
import { createLogger } from "../api/src/lib/logger";
import { startServer } from "../api/src/server";
import { connectionUrl, dbOptionsFromEnv, startMariadb, type DbInstance } from "./db";
import { startRunnerProcess } from "./runner-process";
import { DEMO_PASSWORD, DEMO_TEAM, DEMO_USERS, seedDemo } from "./seed";

const ROOT = path.resolve(import.meta.dirname, "..");
const WEB_OUT = path.join(ROOT, "dist", "web");

/** A process started next to the HTTP server (e.g. the run scheduler), stopped before the database. */
export interface Sidecar {
  name: string;
  stop(): Promise<void>;
}

/**
 * Processes that run beside the API: the runner (ingests and runs, with its worker pool) as its own child process,
 * given the database URL, the absolute data directory and the server's URL for links in its e-mails.
 */
async function startSidecars(config: Config, serverUrl: string): Promise<Sidecar[]> {
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    STILLPOINT_DATA_DIR: path.resolve(config.dataDir),
    STILLPOINT_PUBLIC_URL: config.publicUrl ?? serverUrl,
  };
  return [startRunnerProcess(env)];
}

function buildWeb(): boolean {
  if (!existsSync(path.join(ROOT, "web", "index.html"))) {
    console.log("web/index.html does not exist yet: skipping the web build, serving the API only.");
    return false;
  }
  if (process.env.STILLPOINT_SKIP_WEB_BUILD === "1" && existsSync(path.join(WEB_OUT, "index.html"))) {
    console.log("STILLPOINT_SKIP_WEB_BUILD=1: serving the existing build in dist/web.");
    return true;
  }
  console.log("Building the web app (vite build)...");
  const vite = path.join(ROOT, "node_modules", ".bin", "vite");
  const result = spawnSync(vite, ["build", "--logLevel", "warn"], { cwd: ROOT, stdio: "inherit" });
  if (result.status !== 0) {
    console.error("The web build failed; serving the API only. Fix the build and restart to get the portal.");
    return false;
  }
  return true;
}

let database: DbInstance | null = null;

async function main(): Promise<void> {
  process.env.STILLPOINT_DEMO ??= "1";
  if (!process.env.STILLPOINT_DB_URL) {
    database = await startMariadb({ ...dbOptionsFromEnv(), log: (line) => console.log(line) });
    console.log(`MariaDB ${database.reused ? "already running" : "started"} on ${database.host}:${database.port} (pid ${database.pid}).`);
    process.env.STILLPOINT_DB_URL = connectionUrl(database);
  }
  const webBuilt = buildWeb();
  if (webBuilt) process.env.STILLPOINT_WEB_DIR ??= WEB_OUT;
  const config = loadConfig();

  await migrateDatabase(config.db);
  if (config.demo) {
    const pool = createPool(config.db, 2);
    try {
      await seedDemo(createDb(pool), console.log, config.dataDir);
    } finally {
      await pool.end();
    }
  }

  const logger = createLogger(config.logLevel);
  const server = await startServer(config, logger);
  const sidecars = await startSidecars(config, server.url);

  console.log(`\nStillpoint is running at ${server.url}${webBuilt ? "" : "  (API only: no web build)"}`);
  if (server.deps.outboxEnabled) console.log(`Outgoing mail is captured; admins read it at ${server.url}/outbox`);
  if (config.demo) {
    console.log(`\nDemo team "${DEMO_TEAM}", password "${DEMO_PASSWORD}" for every account:`);
    for (const user of DEMO_USERS) console.log(`  ${user.role.padEnd(9)} ${user.email}`);
  }
  console.log("\nPress Ctrl-C to stop.");

  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`\n${signal}: stopping...`);
    try {
      for (const sidecar of sidecars) await sidecar.stop();
      await server.close();
      await stopOwnDatabase();
      process.exit(0);
    } catch (error) {
      console.error(error);
      process.exit(1);
    }
  };
  process.on("SIGINT", () => void stop("SIGINT"));
  process.on("SIGTERM", () => void stop("SIGTERM"));
}

async function stopOwnDatabase(): Promise<void> {
  if (database && !database.reused) {
    await database.stop();
    console.log("MariaDB stopped.");
  } else if (database) {
    console.log("MariaDB was already running before start; it keeps running (npm run db:stop stops it).");
  }
}

main().catch(async (error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  await stopOwnDatabase().catch(() => undefined);
  process.exit(1);
});
