import { spawn, spawnSync } from "node:child_process";
import { randomBytes, createHash } from "node:crypto";
import { existsSync, mkdirSync, openSync, readFileSync, writeFileSync, rmSync, closeSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import mysql from "mysql2/promise";

export interface DbConnectionSettings {
  host: string;
  port: number;
  user: string;
  password: string;
  database: string;
}

export interface DbInstance extends DbConnectionSettings {
  pid: number;
  socket: string;
  root: string;
  reused: boolean;
  stop(): Promise<void>;
}

export interface StartOptions {
  /** The Stillpoint data directory; MariaDB lives in `<dataDir>/mariadb`. */
  dataDir: string;
  port: number;
  database?: string;
  log?: (line: string) => void;
}

interface InstanceFile {
  pid: number;
  port: number;
  socket: string;
}

const APP_USER = "stillpoint";
const DEFAULT_DATABASE = "stillpoint";
const READY_TIMEOUT_MS = 60_000;
const STOP_TIMEOUT_MS = 60_000;
// Unix socket paths are limited to 108 bytes; deep checkouts fall back to a hashed name in the temp dir.
const MAX_SOCKET_PATH = 100;

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

function findBinary(name: string): string | null {
  const dirs = [...(process.env.PATH ?? "").split(path.delimiter), "/usr/sbin", "/usr/bin", "/sbin", "/usr/local/sbin"];
  for (const dir of dirs) {
    if (!dir) continue;
    const candidate = path.join(dir, name);
    if (existsSync(candidate)) return candidate;
  }
  return null;
}

/** Installs Debian's mariadb-server when `mariadbd` is missing. Needs root. */
export function ensureMariadbInstalled(log: (line: string) => void = console.log): void {
  if (findBinary("mariadbd") && findBinary("mariadb-install-db")) return;
  if (typeof process.getuid === "function" && process.getuid() !== 0) {
    throw new Error(
      "MariaDB is not installed (no `mariadbd` found) and this process is not root. " +
        "Install it once with: sudo apt-get update && sudo apt-get install -y mariadb-server",
    );
  }
  log("MariaDB is not installed; installing mariadb-server with apt-get (about 20 s)...");
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  for (const args of [["update"], ["install", "-y", "mariadb-server"]]) {
    const result = spawnSync("apt-get", args, { stdio: ["ignore", "inherit", "inherit"], env });
    if (result.status !== 0) throw new Error(`apt-get ${args.join(" ")} failed with exit code ${result.status}`);
  }
  if (!findBinary("mariadbd")) throw new Error("mariadb-server was installed but `mariadbd` is still not found");
}

function instancePaths(dataDir: string) {
  const root = path.resolve(dataDir, "mariadb");
  let socket = path.join(root, "mariadb.sock");
  if (socket.length > MAX_SOCKET_PATH) {
    const hash = createHash("sha256").update(root).digest("hex").slice(0, 16);
    socket = path.join(tmpdir(), `stillpoint-${hash}.sock`);
  }
  return {
    root,
    data: path.join(root, "data"),
    socket,
    pidFile: path.join(root, "mariadb.pid"),
    errorLog: path.join(root, "error.log"),
    instanceFile: path.join(root, "instance.json"),
    passwordFile: path.join(root, "app-password"),
  };
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}

function readInstance(file: string): InstanceFile | null {
  if (!existsSync(file)) return null;
  try {
    const parsed = JSON.parse(readFileSync(file, "utf8")) as Partial<InstanceFile>;
    if (typeof parsed.pid === "number" && typeof parsed.port === "number" && typeof parsed.socket === "string") {
      return { pid: parsed.pid, port: parsed.port, socket: parsed.socket };
    }
  } catch {
    // A torn or foreign file means "no known instance".
  }
  return null;
}

function tail(file: string, lines = 20): string {
  if (!existsSync(file)) return "(no error log)";
  return readFileSync(file, "utf8").split("\n").slice(-lines).join("\n");
}

async function rootConnection(socket: string) {
  return mysql.createConnection({ socketPath: socket, user: "root", password: "", connectTimeout: 2_000 });
}

async function pingSocket(socket: string): Promise<boolean> {
  try {
    const conn = await rootConnection(socket);
    await conn.query("SELECT 1");
    await conn.end();
    return true;
  } catch {
    return false;
  }
}

function initialiseDataDir(paths: ReturnType<typeof instancePaths>, log: (line: string) => void): void {
  if (existsSync(path.join(paths.data, "mysql"))) return;
  const installer = findBinary("mariadb-install-db");
  if (!installer) throw new Error("`mariadb-install-db` not found");
  log(`Initialising a MariaDB data directory in ${paths.data}`);
  mkdirSync(paths.data, { recursive: true });
  const result = spawnSync(
    installer,
    [
      "--no-defaults",
      `--datadir=${paths.data}`,
      "--user=root",
      "--auth-root-authentication-method=normal",
      "--skip-test-db",
    ],
    { encoding: "utf8" },
  );
  if (result.status !== 0) {
    rmSync(paths.data, { recursive: true, force: true });
    throw new Error(`mariadb-install-db failed:\n${result.stdout}\n${result.stderr}`);
  }
}

async function waitUntilReady(pid: number, paths: ReturnType<typeof instancePaths>): Promise<void> {
  const deadline = Date.now() + READY_TIMEOUT_MS;
  while (Date.now() < deadline) {
    if (!isAlive(pid)) throw new Error(`mariadbd exited during start-up. Last lines of ${paths.errorLog}:\n${tail(paths.errorLog)}`);
    if (await pingSocket(paths.socket)) return;
    await sleep(100);
  }
  throw new Error(`mariadbd did not answer within ${READY_TIMEOUT_MS / 1000} s. Last lines of the log:\n${tail(paths.errorLog)}`);
}

function appPassword(paths: ReturnType<typeof instancePaths>): string {
  if (existsSync(paths.passwordFile)) return readFileSync(paths.passwordFile, "utf8").trim();
  const password = randomBytes(18).toString("base64url");
  writeFileSync(paths.passwordFile, password, { mode: 0o600 });
  return password;
}

async function prepareDatabase(socket: string, database: string, password: string): Promise<void> {
  const conn = await rootConnection(socket);
  try {
    await conn.query(`CREATE DATABASE IF NOT EXISTS \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    await conn.query(`CREATE USER IF NOT EXISTS ?@'127.0.0.1' IDENTIFIED BY ?`, [APP_USER, password]);
    await conn.query(`ALTER USER ?@'127.0.0.1' IDENTIFIED BY ?`, [APP_USER, password]);
    await conn.query(`GRANT ALL PRIVILEGES ON \`${database}\`.* TO ?@'127.0.0.1'`, [APP_USER]);
  } finally {
    await conn.end();
  }
}

async function stopPid(pid: number): Promise<void> {
  if (!isAlive(pid)) return;
  process.kill(pid, "SIGTERM");
  const deadline = Date.now() + STOP_TIMEOUT_MS;
  while (isAlive(pid)) {
    if (Date.now() > deadline) {
      process.kill(pid, "SIGKILL");
      await sleep(200);
      break;
    }
    await sleep(50);
  }
}

/** Stops the instance of this data directory, by its own PID, and waits until the process is gone. */
export async function stopMariadb(dataDir: string): Promise<boolean> {
  const paths = instancePaths(dataDir);
  const known = readInstance(paths.instanceFile);
  const pidFromFile = existsSync(paths.pidFile) ? Number(readFileSync(paths.pidFile, "utf8").trim()) : NaN;
  const pid = known?.pid ?? (Number.isInteger(pidFromFile) ? pidFromFile : null);
  if (pid === null || !isAlive(pid)) {
    rmSync(paths.instanceFile, { force: true });
    return false;
  }
  await stopPid(pid);
  rmSync(paths.instanceFile, { force: true });
  return true;
}

/**
 * Starts (or reuses) the private MariaDB of `dataDir` on 127.0.0.1, creates the database (utf8mb4) and an app user,
 * and returns the connection settings. A running instance of the same data directory is reused as it is.
 */
export async function startMariadb(options: StartOptions): Promise<DbInstance> {
  const log = options.log ?? console.log;
  const database = options.database ?? DEFAULT_DATABASE;
  if (!/^[A-Za-z0-9_]+$/.test(database)) throw new Error(`Invalid database name: ${database}`);
  ensureMariadbInstalled(log);
  const paths = instancePaths(options.dataDir);
  mkdirSync(paths.root, { recursive: true });

  const known = readInstance(paths.instanceFile);
  let pid: number;
  let port: number;
  let socket: string;
  let reused = false;
  if (known && isAlive(known.pid) && (await pingSocket(known.socket))) {
    ({ pid, port, socket } = known);
    reused = true;
  } else {
    initialiseDataDir(paths, log);
    const mariadbd = findBinary("mariadbd");
    if (!mariadbd) throw new Error("`mariadbd` not found");
    rmSync(paths.socket, { force: true });
    const logFd = openSync(paths.errorLog, "a");
    const child = spawn(
      mariadbd,
      [
        "--no-defaults",
        `--datadir=${paths.data}`,
        `--socket=${paths.socket}`,
        `--port=${options.port}`,
        "--bind-address=127.0.0.1",
        "--user=root",
        `--pid-file=${paths.pidFile}`,
        `--log-error=${paths.errorLog}`,
        "--character-set-server=utf8mb4",
        "--collation-server=utf8mb4_unicode_ci",
        "--skip-name-resolve",
        "--innodb-buffer-pool-size=128M",
      ],
      // Own process group: a Ctrl-C in the terminal reaches our stop logic, not the database directly.
      { detached: true, stdio: ["ignore", logFd, logFd] },
    );
    closeSync(logFd);
    child.unref();
    if (child.pid === undefined) throw new Error("mariadbd could not be spawned");
    pid = child.pid;
    port = options.port;
    socket = paths.socket;
    try {
      await waitUntilReady(pid, paths);
    } catch (error) {
      await stopPid(pid);
      throw error;
    }
    writeFileSync(paths.instanceFile, JSON.stringify({ pid, port, socket } satisfies InstanceFile));
  }

  const password = appPassword(paths);
  await prepareDatabase(socket, database, password);
  const instancePid = pid;
  return {
    host: "127.0.0.1",
    port,
    user: APP_USER,
    password,
    database,
    pid,
    socket,
    root: paths.root,
    reused,
    async stop() {
      await stopPid(instancePid);
      rmSync(paths.instanceFile, { force: true });
    },
  };
}

export function dbOptionsFromEnv(env: NodeJS.ProcessEnv = process.env): { dataDir: string; port: number } {
  const port = Number(env.STILLPOINT_DB_PORT ?? 3407);
  if (!Number.isInteger(port) || port <= 0 || port > 65535) throw new Error(`STILLPOINT_DB_PORT is not a port: ${env.STILLPOINT_DB_PORT}`);
  return { dataDir: env.STILLPOINT_DATA_DIR ?? ".data", port };
}

/** Connection URL for the instance, e.g. for STILLPOINT_DB_URL in child processes. */
export function connectionUrl(settings: DbConnectionSettings): string {
  const user = encodeURIComponent(settings.user);
  const password = encodeURIComponent(settings.password);
  return `mysql://${user}:${password}@${settings.host}:${settings.port}/${settings.database}`;
}

async function main(command: string | undefined): Promise<void> {
  const { dataDir, port } = dbOptionsFromEnv();
  if (command === "start") {
    const instance = await startMariadb({ dataDir, port });
    console.log(
      `MariaDB ${instance.reused ? "already running" : "started"} (pid ${instance.pid}) on ${instance.host}:${instance.port}, ` +
        `database ${instance.database}, user ${instance.user}`,
    );
  } else if (command === "stop") {
    const stopped = await stopMariadb(dataDir);
    console.log(stopped ? "MariaDB stopped." : "MariaDB was not running.");
  } else {
    console.error("usage: tsx scripts/db.ts start|stop");
    process.exitCode = 2;
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  main(process.argv[2]).catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exitCode = 1;
  });
}
