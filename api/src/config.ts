import { z } from "zod";
import { parseDbUrl, type DbSettings } from "./lib/db";

const flag = (fallback: boolean) =>
  z
    .enum(["0", "1", "true", "false", "yes", "no", "on", "off"])
    .optional()
    .transform((value) => (value === undefined ? fallback : ["1", "true", "yes", "on"].includes(value)));

const EnvSchema = z.object({
  NODE_ENV: z.enum(["development", "test", "production"]).default("development"),
  STILLPOINT_PORT: z.coerce.number().int().min(0).max(65535).default(8080),
  STILLPOINT_HOST: z.string().min(1).default("127.0.0.1"),
  STILLPOINT_DATA_DIR: z.string().min(1).default(".data"),
  STILLPOINT_DB_URL: z.string().regex(/^(mysql|mariadb):\/\//, "must be a mysql:// URL").optional(),
  STILLPOINT_DB_HOST: z.string().default("127.0.0.1"),
  STILLPOINT_DB_PORT: z.coerce.number().int().min(1).max(65535).default(3407),
  STILLPOINT_DB_USER: z.string().default("stillpoint"),
  STILLPOINT_DB_PASSWORD: z.string().default(""),
  STILLPOINT_DB_NAME: z.string().regex(/^\w+$/).default("stillpoint"),
  STILLPOINT_SESSION_SECRET: z.string().min(32, "must be at least 32 characters").optional(),
  STILLPOINT_PUBLIC_URL: z.url().optional(),
  STILLPOINT_SMTP_URL: z.string().regex(/^smtps?:\/\//, "must be an smtp:// or smtps:// URL").optional(),
  STILLPOINT_MAIL_FROM: z.string().min(3).default("Stillpoint <stillpoint@kestrel.example>"),
  STILLPOINT_FAKE_SMTP: z.enum(["0", "1", "true", "false"]).optional(),
  STILLPOINT_DEMO: flag(false),
  STILLPOINT_LOG_LEVEL: z.enum(["fatal", "error", "warn", "info", "debug", "trace", "silent"]).optional(),
  STILLPOINT_SIGNIN_MAX_FAILURES: z.coerce.number().int().min(1).default(10),
  STILLPOINT_SIGNIN_WINDOW_MINUTES: z.coerce.number().positive().default(15),
  STILLPOINT_TRUST_PROXY: flag(false),
  STILLPOINT_WEB_DIR: z.string().optional(),
  STILLPOINT_MAX_UPLOAD_BYTES: z.coerce.number().int().positive().default(64 * 2 ** 30),
  STILLPOINT_TEAM_QUOTA_BYTES: z.coerce.number().int().positive().optional(),
  STILLPOINT_UPLOAD_EXPIRY_HOURS: z.coerce.number().positive().max(24 * 365).default(24),
});

export interface Config {
  env: "development" | "test" | "production";
  port: number;
  host: string;
  dataDir: string;
  db: DbSettings;
  /** Absent outside production: the server then keeps a generated secret in the data directory. */
  sessionSecret: string | undefined;
  publicUrl: string | undefined;
  mail: { from: string; smtpUrl: string | undefined; fake: boolean };
  demo: boolean;
  logLevel: string;
  signIn: { maxFailures: number; windowMs: number };
  trustProxy: boolean;
  /** Directory of the built web app to serve; absent means API only. */
  webDir: string | undefined;
  /**
   * Largest single upload; a team's `quotas.maxStorageBytes` (else `defaultQuotaBytes`, else none) bounds the sum.
   * An upload still unfinished `expiryMs` after its creation is removed and stops counting against the quota.
   */
  uploads: { maxBytes: number; defaultQuotaBytes: number | null; expiryMs: number };
}

export class ConfigError extends Error {}

/** Parses the environment once; every invalid variable is listed in one error. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  // An empty variable counts as unset, as in most shells' `VAR= command` idiom.
  const present = Object.fromEntries(Object.entries(env).filter(([, value]) => value !== undefined && value !== ""));
  const result = EnvSchema.safeParse(present);
  if (!result.success) {
    const lines = result.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`);
    throw new ConfigError(`Invalid environment:\n${lines.join("\n")}`);
  }
  const e = result.data;
  const production = e.NODE_ENV === "production";
  const problems: string[] = [];
  if (production && !e.STILLPOINT_SESSION_SECRET) problems.push("  STILLPOINT_SESSION_SECRET: required in production");
  const fake = e.STILLPOINT_FAKE_SMTP === undefined ? !production && !e.STILLPOINT_SMTP_URL : ["1", "true"].includes(e.STILLPOINT_FAKE_SMTP);
  if (production && fake) problems.push("  STILLPOINT_FAKE_SMTP: the fake mail server is for development only");
  if (production && !e.STILLPOINT_SMTP_URL) problems.push("  STILLPOINT_SMTP_URL: required in production");
  if (problems.length > 0) throw new ConfigError(`Invalid environment:\n${problems.join("\n")}`);

  const db: DbSettings = e.STILLPOINT_DB_URL
    ? parseDbUrl(e.STILLPOINT_DB_URL)
    : {
        host: e.STILLPOINT_DB_HOST,
        port: e.STILLPOINT_DB_PORT,
        user: e.STILLPOINT_DB_USER,
        password: e.STILLPOINT_DB_PASSWORD,
        database: e.STILLPOINT_DB_NAME,
      };
  return {
    env: e.NODE_ENV,
    port: e.STILLPOINT_PORT,
    host: e.STILLPOINT_HOST,
    dataDir: e.STILLPOINT_DATA_DIR,
    db,
    sessionSecret: e.STILLPOINT_SESSION_SECRET,
    publicUrl: e.STILLPOINT_PUBLIC_URL?.replace(/\/$/, ""),
    mail: { from: e.STILLPOINT_MAIL_FROM, smtpUrl: e.STILLPOINT_SMTP_URL, fake },
    demo: e.STILLPOINT_DEMO,
    logLevel: e.STILLPOINT_LOG_LEVEL ?? (e.NODE_ENV === "test" ? "silent" : "info"),
    signIn: { maxFailures: e.STILLPOINT_SIGNIN_MAX_FAILURES, windowMs: e.STILLPOINT_SIGNIN_WINDOW_MINUTES * 60_000 },
    trustProxy: e.STILLPOINT_TRUST_PROXY,
    webDir: e.STILLPOINT_WEB_DIR,
    uploads: {
      maxBytes: e.STILLPOINT_MAX_UPLOAD_BYTES,
      defaultQuotaBytes: e.STILLPOINT_TEAM_QUOTA_BYTES ?? null,
      expiryMs: Math.round(e.STILLPOINT_UPLOAD_EXPIRY_HOURS * 3_600_000),
    },
  };
}
