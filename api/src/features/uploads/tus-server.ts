import { randomBytes } from "node:crypto";
import type { Request as ExpressRequest, Response as ExpressResponse } from "express";
import { FileStore } from "@tus/file-store";
import { MemoryLocker, Server, type ServerOptions, type Upload as TusUpload } from "@tus/server";
import type { ErrorBody } from "../../../contracts/common";
import { UPLOAD_ID_HEADER } from "../../../contracts/uploads";
import type { AppDeps } from "../../deps";
import { clientIp } from "../../http/mount";
import type { Principal } from "../../http/principal";
import { uploadsDir } from "../../lib/data-paths";
import { AppError, ERRORS } from "../../lib/errors";
import { checkTermination, finishUpload, ownedUpload, registerUpload } from "./uploads.service";

export const TUS_PATH = "/api/uploads";

type TusRequest = Parameters<NonNullable<ServerOptions["onUploadCreate"]>>[0];
interface TusFailure {
  status_code: number;
  body: string;
}

/** The Express request behind a tus hook's web Request (srvx keeps the Node request it wraps). */
function expressRequest(req: TusRequest): ExpressRequest {
  const node = (req as { runtime?: { node?: { req: unknown } } }).runtime?.node?.req;
  if (!node) throw new Error("the tus handler runs outside Node's HTTP server");
  return node as ExpressRequest;
}

function principalOf(req: TusRequest): { principal: Principal; ip: string | null } {
  const express = expressRequest(req);
  // The route table's role check ran before the tus handler, so a principal is always present here.
  if (!express.principal) throw new AppError(ERRORS.unauthenticated);
  return { principal: express.principal, ip: clientIp(express) };
}

function tusFailure(error: AppError): TusFailure {
  const body: ErrorBody = { error: { code: error.code, message: error.message, details: error.details } };
  return { status_code: error.status, body: JSON.stringify(body) };
}

/** Hooks run inside the tus handler: our AppErrors become tus failures with the JSON error shape as body. */
function guarded<A extends unknown[], R>(hook: (...args: A) => Promise<R>): (...args: A) => Promise<R> {
  return async (...args) => {
    try {
      return await hook(...args);
    } catch (error) {
      if (error instanceof AppError) throw tusFailure(error);
      throw error;
    }
  };
}

/**
 * The file store with tus's expiration extension (Upload-Expires on creation and PATCH, 410 on a stale HEAD/PATCH).
 * Expiry applies to unfinished files only: a complete file drops its creation date, so tus never calls it gone.
 * Hazard: never call the tus server's `cleanUpExpiredUploads`: it reads offsets from the `.json` sidecar, which stays 0,
 * and would delete finished uploads too; the sweep in upload-expiry.ts removes stale uploads instead.
 */
class ExpiringFileStore extends FileStore {
  override async getUpload(id: string): Promise<TusUpload> {
    const upload = await super.getUpload(id);
    if (upload.size !== undefined && upload.offset === upload.size) upload.creation_date = undefined;
    return upload;
  }
}

interface TusHandle {
  server: Server;
  locker: MemoryLocker;
}

const servers = new WeakMap<AppDeps, TusHandle>();

/** One tus server per app: files under `<data dir>/uploads/<tusId>`, rows in `uploads`, team-scoped ids. */
export function tusServer(deps: AppDeps): Server {
  return tusHandle(deps).server;
}

/**
 * Runs `fn` holding the tus lock of one upload, as the PATCH handler does; a PATCH in flight is asked to stop first.
 */
export async function withUploadLock<T>(deps: AppDeps, tusId: string, fn: () => Promise<T>): Promise<T> {
  const lock = tusHandle(deps).locker.newLock(tusId);
  await lock.lock(new AbortController().signal, () => undefined);
  try {
    return await fn();
  } finally {
    await lock.unlock();
  }
}

function tusHandle(deps: AppDeps): TusHandle {
  const existing = servers.get(deps);
  if (existing) return existing;
  const locker = new MemoryLocker();
  const server = new Server({
    path: TUS_PATH,
    datastore: new ExpiringFileStore({
      directory: uploadsDir(deps.config.dataDir),
      expirationPeriodInMilliseconds: deps.config.uploads.expiryMs,
    }),
    locker,
    maxSize: deps.config.uploads.maxBytes,
    relativeLocation: true,
    respectForwardedHeaders: deps.config.trustProxy,
    exposedHeaders: [UPLOAD_ID_HEADER],
    // The portal calls the API from its own origin; no cross-origin caller needs tus's default `*`.
    allowedOrigins: [],
    namingFunction: () => randomBytes(16).toString("hex"),
    onIncomingRequest: guarded(async (req, uploadId) => {
      if (req.method === "POST") return;
      const { principal } = principalOf(req);
      const row = await ownedUpload(deps, principal, uploadId);
      if (!row) throw new AppError(ERRORS.notFound, { message: "There is no such upload." });
      if (req.method === "DELETE") await checkTermination(deps, principal, row);
    }),
    onUploadCreate: guarded(async (req, upload) => {
      if (upload.size === undefined) {
        throw new AppError(ERRORS.badRequest, { message: "Declare the file size with Upload-Length; deferred lengths are not accepted." });
      }
      const { principal, ip } = principalOf(req);
      const metadata = Object.fromEntries(Object.entries(upload.metadata ?? {}).map(([k, v]) => [k, v ?? ""]));
      await registerUpload(deps, principal, { tusId: upload.id, size: upload.size, metadata }, ip);
      return {};
    }),
    onUploadFinish: guarded(async (req, upload) => {
      const { principal, ip } = principalOf(req);
      const row = await ownedUpload(deps, principal, upload.id);
      if (!row) throw new AppError(ERRORS.notFound, { message: "There is no such upload." });
      await finishUpload(deps, principal, row, upload.offset, ip);
      return { headers: { [UPLOAD_ID_HEADER]: row.id } };
    }),
    onResponseError: (_req, error) => {
      if ("status_code" in error && error.body.startsWith("{")) return undefined;
      const status = "status_code" in error ? error.status_code : 500;
      if (status >= 500) deps.logger.error({ err: error }, "upload failed");
      const message = "status_code" in error ? error.body.trim() : "The upload failed on our side.";
      return tusFailure(new AppError({ status, code: status === 413 ? "upload_too_large" : "upload_protocol", message }));
    },
  });
  const handle = { server, locker };
  servers.set(deps, handle);
  return handle;
}

/**
 * Hands one request to the tus server. srvx ends responses with `res.end(callback)`; express-session's wrapper of
 * `res.end` takes that callback for a body chunk and fails, so the callback is moved to the `finish` event.
 */
export async function handleTus(deps: AppDeps, req: ExpressRequest, res: ExpressResponse): Promise<void> {
  const end = res.end.bind(res) as (...args: unknown[]) => ExpressResponse;
  res.end = ((...args: unknown[]) => {
    if (typeof args[0] === "function") {
      const done = args[0] as () => void;
      res.once("finish", done).once("close", done);
      return end();
    }
    return end(...args);
  }) as ExpressResponse["end"];
  await tusServer(deps).handle(req, res);
}
