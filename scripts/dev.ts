import concurrently from "concurrently";
import { createDb, createPool, migrateDatabase, parseDbUrl } from "../api/src/lib/db";
import { connectionUrl, dbOptionsFromEnv, startMariadb } from "./db";
import { seedDemo } from "./seed";

/**
 * Development: the private MariaDB, the API under `tsx watch` and the Vite dev server (which proxies /api).
 * Ctrl-C or SIGTERM to this process stops both children (concurrently kills their process trees) and the database.
 */
async function main(): Promise<void> {
  process.env.STILLPOINT_DEMO ??= "1";
  process.env.STILLPOINT_PORT ??= "8080";
  const database = process.env.STILLPOINT_DB_URL ? null : await startMariadb(dbOptionsFromEnv());
  if (database) process.env.STILLPOINT_DB_URL = connectionUrl(database);
  const settings = parseDbUrl(process.env.STILLPOINT_DB_URL ?? "");
  await migrateDatabase(settings);
  if (process.env.STILLPOINT_DEMO !== "0") {
    const pool = createPool(settings, 2);
    await seedDemo(createDb(pool)).finally(() => pool.end());
  }

  const { result } = concurrently(
    [
      { name: "api", command: "tsx watch --clear-screen=false api/src/server.ts", prefixColor: "blue" },
      { name: "web", command: "vite", prefixColor: "magenta" },
      { name: "runner", command: "tsx watch --clear-screen=false workers/src/runner/main.ts", prefixColor: "green" },
    ],
    { killOthersOn: ["failure"], prefix: "name", killSignal: "SIGTERM" },
  );
  console.log(`API on http://127.0.0.1:${process.env.STILLPOINT_PORT}, portal on http://localhost:5173 (demo password tidewater-demo)`);

  let signalled = false;
  for (const signal of ["SIGINT", "SIGTERM", "SIGHUP"] as const) process.once(signal, () => (signalled = true));
  const finish = async (code: number) => {
    if (database && !database.reused) await database.stop();
    process.exit(code);
  };
  // concurrently itself passes SIGINT/SIGTERM/SIGHUP on to its commands; the result settles once they are gone.
  result.then(
    () => finish(0),
    () => finish(signalled ? 0 : 1),
  );
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
