import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { setTimeout as sleep } from "node:timers/promises";
import { asc, eq } from "drizzle-orm";
import { inject } from "vitest";
import { graphs, runEvents, runIterations, runs, uploads } from "../../api/src/db/schema";
import { insertTeam, insertUser, upsertMembership } from "../../api/src/features/team/team.repo";
import { createDb, createPool, type Db, type DbPool, type DbSettings } from "../../api/src/lib/db";
import type { RankPool } from "../../workers/src/engine/rank-pool";
import type { RunnerConfig } from "../../workers/src/runner/config";
import { startRunner } from "../../workers/src/runner/main";
import { mulberry32 as prng } from "../../workers/src/core/prng";

export const ROOT = path.resolve(import.meta.dirname, "../..");

export function unique(label: string): string {
  return `${label}-${randomBytes(4).toString("hex")}`;
}

export function openDb(settings: DbSettings = inject("db")): { db: Db; pool: DbPool } {
  const pool = createPool(settings, 4);
  return { db: createDb(pool), pool };
}

export function tempDataDir(): string {
  return mkdtempSync(path.join(tmpdir(), "stillpoint-runner-"));
}

export function removeDir(dir: string): void {
  rmSync(dir, { recursive: true, force: true });
}

/** Short leases and heartbeats so takeovers happen within a test; one team only, so runners ignore other tests' rows. */
export function runnerConfig(dataDir: string, teamId: number, overrides: Partial<RunnerConfig> = {}): RunnerConfig {
  return {
    env: "test",
    db: inject("db"),
    dataDir,
    runnerId: unique("runner"),
    threads: 2,
    pollMs: 50,
    heartbeatMs: 200,
    leaseMs: 2_000,
    checkpointEvery: 10,
    retry: { attempts: 3, backoffMs: 10, taskTimeoutMs: 30_000 },
    faults: [],
    teams: [teamId],
    stopGraceMs: 5_000,
    mail: { from: "Stillpoint <stillpoint@kestrel.example>", smtpUrl: undefined, fake: true },
    publicUrl: "http://localhost:8080",
    logLevel: "silent",
    softwareVersion: "0.0.0-test",
    ...overrides,
  };
}

/** The same settings as environment variables, for a runner started as its own process. */
export function runnerEnv(dataDir: string, teamId: number, extra: Record<string, string> = {}, settings: DbSettings = inject("db")): NodeJS.ProcessEnv {
  const url = `mysql://${encodeURIComponent(settings.user)}:${encodeURIComponent(settings.password)}@${settings.host}:${settings.port}/${settings.database}`;
  return {
    PATH: process.env.PATH,
    HOME: process.env.HOME,
    NODE_ENV: "test",
    STILLPOINT_DB_URL: url,
    STILLPOINT_DATA_DIR: dataDir,
    STILLPOINT_FAKE_SMTP: "1",
    STILLPOINT_SESSION_SECRET: "test-session-secret-0123456789abcdef",
    STILLPOINT_RUNNER_ID: unique("child-runner"),
    STILLPOINT_RUNNER_THREADS: "2",
    STILLPOINT_RUNNER_POLL_MS: "50",
    STILLPOINT_RUNNER_HEARTBEAT_MS: "200",
    STILLPOINT_RUNNER_LEASE_MS: "2000",
    STILLPOINT_RUNNER_CHECKPOINT_EVERY: "10",
    STILLPOINT_RUNNER_TEAMS: String(teamId),
    ...extra,
  };
}

export interface ChildRunner {
  child: ChildProcess;
  output: () => string;
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
}

export function spawnRunner(env: NodeJS.ProcessEnv): ChildRunner {
  const child = spawn(process.execPath, ["--import", "tsx", path.join(ROOT, "workers/src/runner/main.ts")], {
    cwd: ROOT,
    env,
    stdio: ["ignore", "pipe", "pipe"],
  });
  let text = "";
  child.stdout?.on("data", (b: Buffer) => (text += b.toString()));
  child.stderr?.on("data", (b: Buffer) => (text += b.toString()));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) =>
    child.once("exit", (code, signal) => resolve({ code, signal })),
  );
  return { child, output: () => text, exited };
}

export async function waitFor<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs = 30_000, everyMs = 50): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value !== null && value !== undefined && value !== false) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await sleep(everyMs);
  }
}

export interface TestTeam {
  teamId: number;
  userId: number;
  email: string;
}

export async function createTeam(db: Db, label = "runner"): Promise<TestTeam> {
  const teamId = await insertTeam(db, unique(`Kestrel ${label}`));
  const email = `${unique("engineer")}@kestrel.example`;
  const userId = await insertUser(db, { email, name: "Ferry Data Engineer", passwordHash: "not-a-real-hash" });
  await upsertMembership(db, teamId, userId, "engineer");
  return { teamId, userId, email };
}

/** A finished upload as the API leaves it: the file under uploads/<tusId>, the row complete. */
export async function createUpload(db: Db, dataDir: string, team: TestTeam, filename: string, content: string | Buffer): Promise<{ id: number; file: string }> {
  const tusId = randomBytes(16).toString("hex");
  const file = path.join(dataDir, "uploads", tusId);
  mkdirSync(path.dirname(file), { recursive: true });
  writeFileSync(file, content);
  const size = Buffer.byteLength(content);
  const [row] = await db
    .insert(uploads)
    .values({ teamId: team.teamId, userId: team.userId, tusId, filename, size, offset: size, state: "complete", completedAt: new Date() })
    .$returningId();
  return { id: row.id, file };
}

export async function queueGraph(db: Db, team: TestTeam, uploadId: number, options: Record<string, unknown> = {}, name = unique("graph")): Promise<number> {
  const [row] = await db
    .insert(graphs)
    .values({ teamId: team.teamId, uploadId, createdByUserId: team.userId, name, options, status: "queued" })
    .$returningId();
  return row.id;
}

export async function queueRun(db: Db, team: TestTeam, graphId: number, parameters: Record<string, unknown>, notify = false): Promise<number> {
  const full = {
    damping: 0.85,
    tolerance: 1e-10,
    maxIterations: 200,
    dangling: "teleport",
    teleport: { kind: "uniform" },
    weighted: false,
    shards: "auto",
    topK: 20,
    ...parameters,
  };
  const [row] = await db
    .insert(runs)
    .values({ teamId: team.teamId, graphId, createdByUserId: team.userId, parameters: full, notify, status: "queued" })
    .$returningId();
  return row.id;
}

export async function graphRow(db: Db, id: number) {
  const [row] = await db.select().from(graphs).where(eq(graphs.id, id));
  return row;
}

export async function runRow(db: Db, id: number) {
  const [row] = await db.select().from(runs).where(eq(runs.id, id));
  return row;
}

export async function iterationRows(db: Db, runId: number) {
  return db.select().from(runIterations).where(eq(runIterations.runId, runId)).orderBy(asc(runIterations.k));
}

export async function eventRows(db: Db, runId: number) {
  return db.select().from(runEvents).where(eq(runEvents.runId, runId)).orderBy(asc(runEvents.id));
}

export async function waitForStatus(db: Db, runId: number, statuses: readonly string[], timeoutMs = 60_000) {
  return waitFor(`run ${runId} to reach ${statuses.join("/")}`, async () => {
    const row = await runRow(db, runId);
    return statuses.includes(row.status) ? row : null;
  }, timeoutMs);
}

export async function waitForGraph(db: Db, graphId: number, timeoutMs = 60_000) {
  return waitFor(`graph ${graphId} to finish its ingest`, async () => {
    const row = await graphRow(db, graphId);
    return row.status === "ready" || row.status === "rejected" ? row : null;
  }, timeoutMs);
}

/** A ready graph of `team` from an uploaded edge list, ingested by a runner that is stopped again; returns its id. */
export async function readyGraph(db: Db, dataDir: string, team: TestTeam, rankPool: RankPool, filename: string, content: string): Promise<number> {
  const runner = await startRunner(runnerConfig(dataDir, team.teamId), { pool: rankPool });
  try {
    const upload = await createUpload(db, dataDir, team, filename, content);
    const graphId = await queueGraph(db, team, upload.id);
    const graph = await waitForGraph(db, graphId);
    if (graph.status !== "ready") throw new Error(`graph ${graphId} was not ingested: ${graph.status}`);
    return graphId;
  } finally {
    await runner.stop();
  }
}


/**
 * A small skewed random graph as "source target" lines: every node has 0..6 out-links (some nodes dangling), targets
 * drawn towards low ids so that in-degrees vary. Deterministic for a seed.
 */
export function randomEdgeList(n: number, seed = 7): string {
  const rand = prng(seed);
  const lines: string[] = [];
  for (let u = 0; u < n; u++) {
    const out = u % 11 === 5 ? 0 : 1 + Math.floor(rand() * 6);
    for (let i = 0; i < out; i++) {
      const v = Math.floor(n * rand() ** 2);
      lines.push(`${u} ${v}`);
    }
  }
  return `${lines.join("\n")}\n`;
}

/**
 * A ferry loop: a directed ring with short chords on every third node and a dangling leaf on every 50th. Nearly
 * periodic, so power iteration contracts at close to the damping factor: with SLOW_RUN about a thousand iterations.
 */
export function ringEdgeList(n: number): string {
  const lines: string[] = [];
  for (let u = 0; u < n; u++) {
    lines.push(`${u} ${(u + 1) % n}`);
    if (u % 3 === 0) lines.push(`${u} ${(u + 7) % n}`);
    if (u % 50 === 0) lines.push(`${u} ${n + u / 50}`);
  }
  return `${lines.join("\n")}\n`;
}

/** With a ringEdgeList graph of a few thousand nodes: about a thousand iterations (a second or two), converging. */
export const SLOW_RUN = { damping: 0.99, tolerance: 1e-11, maxIterations: 10_000 } as const;
