import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { createApp } from "./app";
import { loadConfig, type Config } from "./config";
import type { AppDeps } from "./deps";
import { storeCapturedMail, storeDelivery } from "./features/outbox/outbox.service";
import { startUploadSweeper } from "./features/uploads/upload-expiry";
import { createDb, createPool } from "./lib/db";
import { createLogger, type Logger } from "./lib/logger";
import { startFakeSmtp, type FakeSmtp } from "./lib/mail/fake-smtp";
import { createMailer, type MailerOptions } from "./lib/mail/mailer";

export interface RunningServer {
  url: string;
  port: number;
  deps: AppDeps;
  fakeSmtp: FakeSmtp | null;
  close(): Promise<void>;
}

/** Outside production a generated secret is kept in the data directory, so sessions survive restarts. */
function sessionSecretFor(config: Config): string {
  if (config.sessionSecret) return config.sessionSecret;
  const file = path.resolve(config.dataDir, "session-secret");
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  mkdirSync(path.dirname(file), { recursive: true });
  const secret = randomBytes(32).toString("base64url");
  writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}

/** Starts everything the HTTP API needs: database pool, mail (the fake in development), the app, the listener. */
export async function startServer(config: Config, logger: Logger = createLogger(config.logLevel)): Promise<RunningServer> {
  const pool = createPool(config.db);
  const db = createDb(pool);
  const reportError = (error: unknown) => logger.error({ err: error }, "mail problem");
  const fakeSmtp = config.mail.fake ? await startFakeSmtp((mail) => storeCapturedMail(db, mail), reportError) : null;
  const transport: MailerOptions["transport"] = fakeSmtp
    ? { host: fakeSmtp.host, port: fakeSmtp.port }
    : (config.mail.smtpUrl ?? { jsonTransport: true });
  const mailer = createMailer({
    transport,
    from: config.mail.from,
    record: fakeSmtp ? undefined : (delivery) => storeDelivery(db, delivery),
    onError: reportError,
  });

  let publicUrl = config.publicUrl ?? "";
  const deps: AppDeps = {
    config,
    db,
    pool,
    mailer,
    logger,
    sessionSecret: sessionSecretFor(config),
    outboxEnabled: fakeSmtp !== null,
    publicUrl: () => publicUrl,
  };
  const built = createApp(deps);
  const server = built.app.listen(config.port, config.host);
  await new Promise<void>((resolve, reject) => {
    server.once("listening", resolve);
    server.once("error", reject);
  });
  const { port } = server.address() as AddressInfo;
  const shownHost = config.host === "0.0.0.0" || config.host === "::" ? "localhost" : config.host;
  const url = `http://${shownHost}:${port}`;
  publicUrl ||= url;
  const sweeper = startUploadSweeper(deps);

  let closing: Promise<void> | null = null;
  return {
    url,
    port,
    deps,
    fakeSmtp,
    close() {
      closing ??= (async () => {
        await new Promise<void>((resolve) => {
          server.close(() => resolve());
          server.closeIdleConnections();
        });
        await sweeper.stop();
        await built.close();
        mailer.close();
        await fakeSmtp?.close();
        await pool.end();
      })();
      return closing;
    },
  };
}

async function main(): Promise<void> {
  const config = loadConfig();
  const logger = createLogger(config.logLevel);
  const running = await startServer(config, logger);
  logger.info({ url: running.url, outbox: running.deps.outboxEnabled }, "Stillpoint API listening");
  const stop = (signal: string) => {
    logger.info({ signal }, "stopping");
    running.close().then(
      () => process.exit(0),
      (error: unknown) => {
        logger.error({ err: error }, "unclean stop");
        process.exit(1);
      },
    );
  };
  process.once("SIGINT", () => stop("SIGINT"));
  process.once("SIGTERM", () => stop("SIGTERM"));
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exit(1);
  });
}
