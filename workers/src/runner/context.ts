// What every job of a runner shares, and where things live under the data directory.
import path from "node:path";
import { graphRelDir, runRelDir, uploadRelPath } from "../../../api/src/lib/data-paths";
import type { Db } from "../../../api/src/lib/db";
import type { Logger } from "../../../api/src/lib/logger";
import type { Mailer } from "../../../api/src/lib/mail/mailer";
import type { RankPool } from "../engine/rank-pool";
import type { RunnerConfig } from "./config";

export interface RunnerContext {
  config: RunnerConfig;
  db: Db;
  logger: Logger;
  mailer: Mailer;
  pool: RankPool;
  /** Runs a database call, retrying it through connection losses (see db-retry.ts). */
  retry<T>(what: string, fn: () => Promise<T>): Promise<T>;
}

/** Why a job must stop early: the user canceled, the runner shuts down, or another runner took the claim over. */
export type StopCause = "cancel" | "shutdown" | "lease-lost";

/** Shared between the job and the heartbeat: the heartbeat sets `cause` and aborts. */
export interface JobControl {
  readonly controller: AbortController;
  cause: StopCause | null;
}

export function newJobControl(): JobControl {
  return { controller: new AbortController(), cause: null };
}

export function stopJob(job: JobControl, cause: StopCause): void {
  if (job.cause !== null) return;
  job.cause = cause;
  job.controller.abort(new Error(cause));
}

/** Stored paths are relative to the data directory; absolute ones (set by hand) are taken as they are. */
export function inDataDir(dataDir: string, stored: string): string {
  return path.isAbsolute(stored) ? stored : path.resolve(dataDir, stored);
}

export function uploadFile(dataDir: string, upload: { tusId: string; storagePath: string | null }): string {
  return inDataDir(dataDir, upload.storagePath ?? uploadRelPath(upload.tusId));
}

export const graphStorePath = graphRelDir;
export const runDirPath = runRelDir;
