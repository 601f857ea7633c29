import { createHash } from "node:crypto";
import { createReadStream } from "node:fs";
import { UPLOAD_STATES, type Upload, type UploadLimits, type UploadPage, type UploadQuery } from "../../../contracts/uploads";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { roleAtLeast } from "../../http/require-role";
import { decodeCursor, encodeCursor } from "../../lib/cursor";
import { dataPath, uploadRelPath } from "../../lib/data-paths";
import { AppError, ERRORS } from "../../lib/errors";
import { byPrincipal, recordActivity } from "../activity/activity.service";
import {
  abortUpload,
  completeUpload,
  countGraphsUsing,
  findUploadByTusId,
  insertUpload,
  listUploads,
  lockTeam,
  setUploadOffset,
  teamQuotaBytes,
  teamUsedBytes,
  type UploadRow,
} from "./uploads.repo";

const MAX_NAME = 200;

/**
 * A file name fit for display: the last path segment, control and bidi-override characters removed, trimmed.
 * Storage never uses it (files are named by upload id).
 */
export function displayName(raw: string | null | undefined): string {
  const last = (raw ?? "").split(/[\\/]/).pop() ?? "";
  const clean = last.replace(/[\u0000-\u001f\u007f-\u009f\u200e\u200f\u202a-\u202e\u2066-\u2069]/g, "").trim();
  const name = clean === "." || clean === ".." ? "" : clean;
  return (name || "upload").slice(0, MAX_NAME);
}

function bytesText(bytes: number): string {
  const units = ["bytes", "KiB", "MiB", "GiB", "TiB"];
  let value = bytes;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit++;
  }
  return unit === 0 ? `${bytes} bytes` : `${value.toFixed(value < 10 ? 1 : 0)} ${units[unit]}`;
}

/** Unfinished uploads created before this moment have expired. */
export function expiryCutoff(deps: AppDeps, now = Date.now()): Date {
  return new Date(now - deps.config.uploads.expiryMs);
}

/** When an unfinished upload stops being resumable. */
export function expiresAt(deps: AppDeps, row: Pick<UploadRow, "createdAt">): Date {
  return new Date(row.createdAt.getTime() + deps.config.uploads.expiryMs);
}

export async function uploadLimits(deps: AppDeps, teamId: number): Promise<UploadLimits> {
  const quota = (await teamQuotaBytes(deps.db, teamId)) ?? deps.config.uploads.defaultQuotaBytes;
  return {
    maxUploadBytes: deps.config.uploads.maxBytes,
    quotaBytes: quota,
    usedBytes: await teamUsedBytes(deps.db, teamId),
    unfinishedExpiryHours: deps.config.uploads.expiryMs / 3_600_000,
  };
}

/** Refuses a declared size over the server's limit, before anything is stored. */
export function checkUploadSize(deps: AppDeps, size: number): void {
  const max = deps.config.uploads.maxBytes;
  if (size > max) {
    throw new AppError(ERRORS.uploadTooLarge, {
      message: `The file is ${bytesText(size)}; uploads may be at most ${bytesText(max)}.`,
      details: { size, maxUploadBytes: max },
    });
  }
}

/** Records a new tus upload after checking the team's quota; the check and the insert hold the team row lock. */
export async function registerUpload(
  deps: AppDeps,
  principal: Principal,
  input: { tusId: string; size: number; metadata: Record<string, string> },
  ip: string | null,
): Promise<number> {
  checkUploadSize(deps, input.size);
  const filename = displayName(input.metadata.filename ?? input.metadata.name);
  const id = await deps.db.transaction(async (tx) => {
    await lockTeam(tx, principal.teamId);
    const quota = (await teamQuotaBytes(tx, principal.teamId)) ?? deps.config.uploads.defaultQuotaBytes;
    if (quota !== null) {
      const used = await teamUsedBytes(tx, principal.teamId);
      if (used + input.size > quota) {
        throw new AppError(ERRORS.quotaExceeded, {
          message: `This upload (${bytesText(input.size)}) would take the team over its storage quota: ${bytesText(used)} of ${bytesText(quota)} in use.`,
          details: { size: input.size, usedBytes: used, quotaBytes: quota },
        });
      }
    }
    return insertUpload(tx, {
      teamId: principal.teamId,
      userId: principal.userId,
      tusId: input.tusId,
      filename,
      contentType: input.metadata.filetype?.slice(0, 127) || null,
      size: input.size,
      metadata: { filename },
      storagePath: uploadRelPath(input.tusId),
    });
  });
  await recordActivity(deps.db, { ...byPrincipal(principal, ip), action: "upload.created", target: `upload ${id} (${filename})` });
  return id;
}

/** The upload behind a tus id, if the caller's team owns it; tus answers 404 otherwise. */
export async function ownedUpload(deps: AppDeps, principal: Principal, tusId: string): Promise<UploadRow | null> {
  const row = await findUploadByTusId(deps.db, tusId);
  return row && row.teamId === principal.teamId ? row : null;
}

export function sha256File(file: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const hash = createHash("sha256");
    createReadStream(file)
      .on("data", (chunk) => hash.update(chunk))
      .on("error", reject)
      .on("end", () => resolve(hash.digest("hex")));
  });
}

export async function recordOffset(deps: AppDeps, row: UploadRow, offset: number): Promise<void> {
  await setUploadOffset(deps.db, row.id, offset);
}

/** The last byte arrived: checksum the stored file and mark the upload complete. */
export async function finishUpload(deps: AppDeps, principal: Principal, row: UploadRow, size: number, ip: string | null): Promise<string> {
  const checksum = `sha256:${await sha256File(dataPath(deps.config.dataDir, row.storagePath ?? uploadRelPath(row.tusId)))}`;
  await completeUpload(deps.db, row.id, size, checksum);
  await recordActivity(deps.db, {
    ...byPrincipal(principal, ip),
    action: "upload.completed",
    target: `upload ${row.id} (${row.filename})`,
    details: { size, checksum },
  });
  return checksum;
}

/** tus termination: only the uploader or an admin, and never while a graph uses the file. */
export async function checkTermination(deps: AppDeps, principal: Principal, row: UploadRow): Promise<void> {
  if (row.userId !== principal.userId && !roleAtLeast(principal.role, "admin")) {
    throw new AppError(ERRORS.forbidden, { message: "Only the uploader or an admin may delete this upload." });
  }
  const using = await countGraphsUsing(deps.db, row.id);
  if (using > 0) {
    throw new AppError(ERRORS.conflict, { message: `This upload is the source of ${using} graph(s); delete them first.`, details: { graphs: using } });
  }
}

export async function terminated(deps: AppDeps, principal: Principal, row: UploadRow, ip: string | null): Promise<void> {
  await abortUpload(deps.db, row.id);
  await recordActivity(deps.db, { ...byPrincipal(principal, ip), action: "upload.deleted", target: `upload ${row.id} (${row.filename})` });
}

export function toUpload(deps: AppDeps, row: UploadRow, uploaderName: string | null): Upload {
  return {
    id: row.id,
    tusId: row.tusId,
    filename: row.filename,
    contentType: row.contentType,
    size: row.size,
    offset: row.offset,
    state: row.state,
    checksum: row.checksum,
    uploadedBy: row.userId === null ? null : { userId: row.userId, name: uploaderName ?? "" },
    createdAt: row.createdAt.toISOString(),
    completedAt: row.completedAt?.toISOString() ?? null,
    expiresAt: row.state === "uploading" ? expiresAt(deps, row).toISOString() : null,
  };
}

export async function getUploadPage(deps: AppDeps, principal: Principal, query: UploadQuery): Promise<UploadPage> {
  const states = query.state === "all" ? UPLOAD_STATES : [query.state];
  const rows = await listUploads(deps.db, principal.teamId, states, decodeCursor(query.cursor), query.limit + 1);
  const page = rows.slice(0, query.limit);
  const last = page.at(-1);
  return {
    items: page.map((r) => toUpload(deps, r.upload, r.uploaderName)),
    nextCursor: rows.length > query.limit && last ? encodeCursor(last.upload.id) : null,
    limits: await uploadLimits(deps, principal.teamId),
  };
}
