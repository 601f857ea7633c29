import { z } from "zod";
import { IdSchema, PageQuerySchema, pageSchema, TimestampSchema } from "./common";

export const UPLOAD_STATES = ["uploading", "complete", "aborted", "expired"] as const;
export const UploadStateSchema = z.enum(UPLOAD_STATES);
export type UploadState = z.infer<typeof UploadStateSchema>;

/** tus metadata keys the server reads on creation (`Upload-Metadata`); `filename` is shown, never used as a path. */
export const UPLOAD_METADATA_KEYS = { filename: "filename", filetype: "filetype" } as const;

/** Response header of the final tus PATCH (and of creation-with-upload) carrying the upload's numeric id. */
export const UPLOAD_ID_HEADER = "Stillpoint-Upload-Id";

/**
 * One upload as the portal lists it. `tusId` is the last segment of the tus URL (`/api/uploads/<tusId>`);
 * `id` is what `POST /api/graphs` takes as `uploadId`.
 * @example { "id": 3, "tusId": "4f0c…", "filename": "kestrel-crawl.csv.gz", "size": 182736451, "offset": 182736451,
 *            "state": "complete", "checksum": "sha256:…", … }
 */
export const UploadSchema = z.object({
  id: IdSchema,
  tusId: z.string(),
  filename: z.string(),
  contentType: z.string().nullable(),
  size: z.number().int().nonnegative().nullable(),
  offset: z.number().int().nonnegative(),
  state: UploadStateSchema,
  /** `sha256:<hex>` of the finished file; null until the upload completes. */
  checksum: z.string().nullable(),
  uploadedBy: z.object({ userId: IdSchema, name: z.string() }).nullable(),
  createdAt: TimestampSchema,
  completedAt: TimestampSchema.nullable(),
  /** While unfinished: when the server removes the partial data and the upload can no longer be resumed. */
  expiresAt: TimestampSchema.nullable(),
});
export type Upload = z.infer<typeof UploadSchema>;

/** Defaults to finished uploads; `state=all` includes unfinished, aborted (deleted) and expired ones. */
export const UploadQuerySchema = PageQuerySchema.extend({
  state: z.enum([...UPLOAD_STATES, "all"]).default("complete"),
});
export type UploadQuery = z.infer<typeof UploadQuerySchema>;

export const UploadLimitsSchema = z.object({
  /** Largest single upload the server accepts, in bytes. */
  maxUploadBytes: z.number().int().positive(),
  /** The team's storage quota in bytes (null: unlimited) and what its uploads use now (declared sizes). */
  quotaBytes: z.number().int().positive().nullable(),
  usedBytes: z.number().int().nonnegative(),
  /** Hours an upload may stay unfinished before it is removed (and stops counting against the quota). */
  unfinishedExpiryHours: z.number().positive(),
});
export type UploadLimits = z.infer<typeof UploadLimitsSchema>;

export const UploadPageSchema = pageSchema(UploadSchema).extend({ limits: UploadLimitsSchema });
export type UploadPage = z.infer<typeof UploadPageSchema>;
