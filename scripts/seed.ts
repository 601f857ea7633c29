import path from "node:path";
import { pathToFileURL } from "node:url";
import type { Role } from "../api/contracts/common";
import { loadConfig } from "../api/src/config";
import { findTeamByName, findUserByEmail, insertTeam, insertUser, upsertMembership } from "../api/src/features/team/team.repo";
import { createDb, createPool, type Db } from "../api/src/lib/db";
import { hashPassword } from "../api/src/lib/passwords";
import { seedDemoGraphs } from "./demo-seed";

export const DEMO_TEAM = "Kestrel Isles Data Office";
export const DEMO_PASSWORD = "tidewater-demo";
export const DEMO_USERS: ReadonlyArray<{ email: string; name: string; role: Role }> = [
  { email: "admin@kestrel.example", name: "Harbour Office Admin", role: "admin" },
  { email: "engineer@kestrel.example", name: "Ferry Data Engineer", role: "engineer" },
  { email: "viewer@kestrel.example", name: "Museum Analyst", role: "viewer" },
];

export interface DemoContext {
  db: Db;
  teamId: number;
  userIds: Record<Role, number>;
  /** Where demo uploads are written (the server's data directory). */
  dataDir: string;
  log: (line: string) => void;
}

/**
 * Idempotent demo data, in steps. Accounts come first; later steps (demo graphs, runs) receive the team and users
 * and must themselves be safe to run again on every start.
 */
export const DEMO_STEPS: Array<(ctx: DemoContext) => Promise<void>> = [
  (ctx) => seedDemoGraphs({ db: ctx.db, teamId: ctx.teamId, userId: ctx.userIds.engineer, dataDir: ctx.dataDir, log: ctx.log }),
];

async function ensureAccounts(db: Db, log: (line: string) => void): Promise<Omit<DemoContext, "db" | "log" | "dataDir">> {
  const teamId = (await findTeamByName(db, DEMO_TEAM))?.id ?? (await insertTeam(db, DEMO_TEAM));
  const userIds = {} as Record<Role, number>;
  for (const user of DEMO_USERS) {
    const existing = await findUserByEmail(db, user.email);
    const id = existing?.id ?? (await insertUser(db, { email: user.email, name: user.name, passwordHash: await hashPassword(DEMO_PASSWORD) }));
    if (!existing) log(`demo: created ${user.email}`);
    await upsertMembership(db, teamId, id, user.role);
    userIds[user.role] = id;
  }
  return { teamId, userIds };
}

export async function seedDemo(
  db: Db,
  log: (line: string) => void = console.log,
  dataDir = process.env.STILLPOINT_DATA_DIR || ".data",
): Promise<DemoContext> {
  const ctx: DemoContext = { db, log, dataDir, ...(await ensureAccounts(db, log)) };
  for (const step of DEMO_STEPS) await step(ctx);
  return ctx;
}

async function main(): Promise<void> {
  const config = loadConfig();
  const pool = createPool(config.db, 2);
  try {
    await seedDemo(createDb(pool), console.log, config.dataDir);
    console.log(`Demo team "${DEMO_TEAM}" is ready.`);
  } finally {
    await pool.end();
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exitCode = 1;
  });
}
