import type { Config } from "./config";
import type { Db, DbPool } from "./lib/db";
import type { Logger } from "./lib/logger";
import type { Mailer } from "./lib/mail/mailer";

/** What request handlers and services may use; built once per server by server.ts. */
export interface AppDeps {
  config: Config;
  db: Db;
  pool: DbPool;
  mailer: Mailer;
  logger: Logger;
  sessionSecret: string;
  /** True when the development mail fake runs and GET /api/outbox is served. */
  outboxEnabled: boolean;
  /** Base URL for links in e-mails, known once the server listens. */
  publicUrl(): string;
}
