import type { Request } from "express";
import { z } from "zod";
import { UploadPageSchema, UploadQuerySchema } from "../../../contracts/uploads";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { defineRawRoute, defineRoute } from "../../http/route";
import { AppError, ERRORS } from "../../lib/errors";
import { handleTus, TUS_PATH, tusServer } from "./tus-server";
import { expiredError, expireUpload, isStale } from "./upload-expiry";
import type { UploadRow } from "./uploads.repo";
import { checkUploadSize, getUploadPage, ownedUpload, recordOffset, terminated } from "./uploads.service";

const TusParamsSchema = z.strictObject({ tusId: z.string().regex(/^[0-9a-f]{32}$/, "not an upload id") });
const TUS_PRODUCES = { "text/plain": "tus protocol answer (headers carry the state)" };

/**
 * Team scoping before the tus protocol checks, so another team's upload id is a plain 404 whatever the headers.
 * An expired upload answers 410 Gone, as tus's expiration extension asks; one past its expiry that the sweep has not
 * reached yet is expired on the spot, so the answer never depends on when the sweep last ran.
 */
async function requireOwned(deps: AppDeps, principal: Principal, tusId: string): Promise<UploadRow> {
  const row = await ownedUpload(deps, principal, tusId);
  if (!row) throw new AppError(ERRORS.notFound, { message: "There is no such upload." });
  if (!isStale(deps, row)) return row;
  if (row.state === "uploading") await expireUpload(deps, row);
  // Re-read: a PATCH that had every byte on disk may have completed it meanwhile.
  const now = await ownedUpload(deps, principal, tusId);
  if (!now || now.state === "expired") throw expiredError(deps, row);
  return now;
}

/** Size checks that must answer before the tus handler stores a byte. */
function checkCreation(deps: AppDeps, req: Request): void {
  const declared = req.get("upload-length");
  if (declared === undefined) {
    if (req.get("upload-defer-length") !== undefined) {
      throw new AppError(ERRORS.badRequest, { message: "Declare the file size with Upload-Length; deferred lengths are not accepted." });
    }
    return;
  }
  const size = Number(declared);
  if (Number.isSafeInteger(size) && size >= 0) checkUploadSize(deps, size);
}

export const uploadsRoutes = [
  defineRoute({
    method: "get",
    path: "/api/uploads",
    access: "engineer",
    tag: "uploads",
    summary: "The team's uploads (finished ones unless `state` says otherwise), newest first, with size limits and quota",
    query: UploadQuerySchema,
    response: UploadPageSchema,
    handler: ({ deps, principal, query }) => getUploadPage(deps, principal, query),
  }),
  defineRawRoute({
    method: "options",
    path: TUS_PATH,
    access: "public",
    tag: "uploads",
    summary: "tus capabilities (version, extensions, maximum size)",
    produces: TUS_PRODUCES,
    handler: ({ deps, req, res }) => handleTus(deps, req, res),
  }),
  defineRawRoute({
    method: "post",
    path: TUS_PATH,
    access: "engineer",
    tag: "uploads",
    summary:
      "tus creation (and creation-with-upload): `Upload-Length` and `Upload-Metadata: filename <base64>` required; refused with 413 over the size limit or the team quota; Upload-Expires says when an unfinished upload is removed",
    produces: TUS_PRODUCES,
    audit: "by-service",
    handler: async ({ deps, req, res }) => {
      checkCreation(deps, req);
      await handleTus(deps, req, res);
    },
  }),
  defineRawRoute({
    method: "get",
    path: `${TUS_PATH}/:tusId`,
    access: "engineer",
    tag: "uploads",
    summary: "HEAD: tus offset query (Upload-Offset, Upload-Length); 410 once an unfinished upload has expired; GET is not served",
    params: TusParamsSchema,
    produces: TUS_PRODUCES,
    handler: async ({ deps, principal, params, req, res }) => {
      if (req.method !== "HEAD") throw new AppError(ERRORS.routeNotFound, { message: "Use HEAD for the upload offset, or GET /api/uploads." });
      await requireOwned(deps, principal, params.tusId);
      await handleTus(deps, req, res);
    },
  }),
  defineRawRoute({
    method: "patch",
    path: `${TUS_PATH}/:tusId`,
    access: "engineer",
    tag: "uploads",
    summary:
      "tus: append bytes at Upload-Offset (Content-Type: application/offset+octet-stream); Upload-Expires until the last byte, which answers with Stillpoint-Upload-Id; 410 once expired",
    params: TusParamsSchema,
    produces: TUS_PRODUCES,
    audit: "by-service",
    handler: async ({ deps, principal, params, req, res }) => {
      await requireOwned(deps, principal, params.tusId);
      await handleTus(deps, req, res);
      const row = await ownedUpload(deps, principal, params.tusId);
      if (row && row.state === "uploading") {
        const upload = await tusServer(deps).datastore.getUpload(params.tusId).catch(() => null);
        if (upload && upload.offset !== row.offset) await recordOffset(deps, row, upload.offset);
      }
    },
  }),
  defineRawRoute({
    method: "delete",
    path: `${TUS_PATH}/:tusId`,
    access: "engineer",
    tag: "uploads",
    summary: "tus termination: delete an upload (uploader or admin; not while a graph uses it)",
    params: TusParamsSchema,
    produces: TUS_PRODUCES,
    audit: "by-service",
    handler: async ({ deps, principal, params, req, res, ip }) => {
      const row = await requireOwned(deps, principal, params.tusId);
      await handleTus(deps, req, res);
      if (res.statusCode === 204) await terminated(deps, principal, row, ip);
    },
  }),
];
