import type { AppDeps } from "../../deps";
import { AppError, ERRORS } from "../../lib/errors";
import { recordActivity } from "../activity/activity.service";
import { withUploadLock, tusServer } from "./tus-server";
import { findStaleUploads, markUploadExpired, type UploadRow } from "./uploads.repo";
import { expiresAt, expiryCutoff } from "./uploads.service";

const SWEEP_BATCH = 100;
const SWEEP_EVERY_MAX_MS = 15 * 60_000;

/** Expired already, or unfinished past its expiry but not swept yet. */
export function isStale(deps: AppDeps, row: UploadRow, now = Date.now()): boolean {
  return row.state === "expired" || (row.state === "uploading" && expiresAt(deps, row).getTime() < now);
}

function hoursText(ms: number): string {
  const hours = ms / 3_600_000;
  const shown = Number.isInteger(hours) ? String(hours) : hours.toFixed(2).replace(/0+$/, "");
  return `${shown} hour${hours === 1 ? "" : "s"}`;
}

/** The 410 a client gets when it tries to resume an upload the server has given up on. */
export function expiredError(deps: AppDeps, row: UploadRow): AppError {
  return new AppError(ERRORS.uploadExpired, {
    message: `This upload was not finished within ${hoursText(deps.config.uploads.expiryMs)} of its start, so its partial data was removed. Upload the file again.`,
    details: { uploadId: row.id, offset: row.offset, size: row.size, expiredAt: expiresAt(deps, row).toISOString() },
  });
}

/**
 * Expires one unfinished upload if it is still stale: marks the row, then deletes the partial file. Holds the tus lock
 * of the upload so that no PATCH writes meanwhile (a PATCH in flight is asked to stop).
 */
export async function expireUpload(deps: AppDeps, row: UploadRow, cutoff = expiryCutoff(deps)): Promise<boolean> {
  const store = tusServer(deps).datastore;
  const expired = await withUploadLock(deps, row.tusId, async () => {
    const stored = await store.getUpload(row.tusId).catch(() => null);
    // Every byte is on disk: the last PATCH marks the row complete right after it releases the lock.
    if (stored && stored.size !== undefined && stored.offset === stored.size) return false;
    if (!(await markUploadExpired(deps.db, row.id, cutoff))) return false;
    // A file already missing is what we want; the row is the record that it is gone.
    await store.remove(row.tusId).catch(() => undefined);
    return true;
  });
  if (expired) {
    await recordActivity(deps.db, {
      teamId: row.teamId,
      actorUserId: null,
      action: "upload.expired",
      target: `upload ${row.id} (${row.filename})`,
      details: { offset: row.offset, size: row.size },
    });
    deps.logger.info({ uploadId: row.id, offset: row.offset, size: row.size }, "unfinished upload expired");
  }
  return expired;
}

/** Expires every unfinished upload older than the expiry period; returns how many it removed. */
export async function sweepExpiredUploads(deps: AppDeps): Promise<number> {
  const cutoff = expiryCutoff(deps);
  let removed = 0;
  let afterId = 0;
  for (;;) {
    const rows = await findStaleUploads(deps.db, cutoff, afterId, SWEEP_BATCH);
    for (const row of rows) if (await expireUpload(deps, row, cutoff)) removed++;
    if (rows.length < SWEEP_BATCH) return removed;
    afterId = rows[rows.length - 1].id;
  }
}

export interface UploadSweeper {
  stop(): Promise<void>;
}

/** Sweeps once now, then every quarter of the expiry period (at most every 15 minutes); one sweep at a time. */
export function startUploadSweeper(deps: AppDeps): UploadSweeper {
  let running: Promise<void> | null = null;
  const tick = () => {
    running ??= sweepExpiredUploads(deps)
      .then(
        () => undefined,
        (error: unknown) => deps.logger.error({ err: error }, "upload expiry sweep failed"),
      )
      .finally(() => {
        running = null;
      });
  };
  tick();
  const timer = setInterval(tick, Math.max(1000, Math.min(SWEEP_EVERY_MAX_MS, deps.config.uploads.expiryMs / 4)));
  timer.unref();
  return {
    async stop() {
      clearInterval(timer);
      await running;
    },
  };
}
