import path from "node:path";
import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import { migrate } from "drizzle-orm/mysql2/migrator";
import mysql from "mysql2/promise";
import * as schema from "../db/schema";

export interface DbSettings {
  host: string;
  port: number;
  user: string;
  password: string;
  database: string;
}

export type Db = MySql2Database<typeof schema>;
export type DbPool = mysql.Pool;

export const MIGRATIONS_FOLDER = path.resolve(import.meta.dirname, "../../../drizzle");

export function createPool(settings: DbSettings, connectionLimit = 10): DbPool {
  const pool = mysql.createPool({
    ...settings,
    connectionLimit,
    charset: "utf8mb4_unicode_ci",
    // Drizzle reads TIMESTAMP values as UTC strings, so every session must run in UTC.
    timezone: "Z",
    supportBigNumbers: true,
    enableKeepAlive: true,
  });
  pool.pool.on("connection", (connection) => {
    connection.query("SET time_zone = '+00:00'");
  });
  return pool;
}

export function createDb(pool: DbPool): Db {
  return drizzle(pool, { schema, mode: "default" });
}

/** Applies the generated migrations in drizzle/; the same code path runs at start and in the test setup. */
export async function migrateDatabase(settings: DbSettings): Promise<void> {
  const pool = createPool(settings, 1);
  try {
    await migrate(createDb(pool), { migrationsFolder: MIGRATIONS_FOLDER });
  } finally {
    await pool.end();
  }
}

export function parseDbUrl(url: string): DbSettings {
  const parsed = new URL(url);
  if (parsed.protocol !== "mysql:" && parsed.protocol !== "mariadb:") throw new Error("database URL must start with mysql://");
  return {
    host: parsed.hostname,
    port: parsed.port ? Number(parsed.port) : 3306,
    user: decodeURIComponent(parsed.username),
    password: decodeURIComponent(parsed.password),
    database: parsed.pathname.replace(/^\//, ""),
  };
}

/** A transaction handle; repos accept either it or the pool-backed database. */
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
export type Executor = Db | Tx;
