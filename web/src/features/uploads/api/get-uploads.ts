import { queryOptions, useQuery } from "@tanstack/react-query";
import { UploadPageSchema, type UploadQuery } from "#contracts/uploads";
import { api } from "../../../lib/api-client";

export type { Upload, UploadLimits, UploadPage } from "#contracts/uploads";

export function getUploads({ state = "complete", limit = 100 }: Partial<Pick<UploadQuery, "state" | "limit">> = {}) {
  return api.get("/uploads", UploadPageSchema, { query: { state, limit } });
}

export const getUploadsQueryOptions = (state: UploadQuery["state"] = "complete") =>
  queryOptions({ queryKey: ["uploads", "list", state], queryFn: () => getUploads({ state }), staleTime: 5_000 });

/** Only engineers and admins may list uploads, so callers pass whether to ask at all. */
export function useUploads(enabled: boolean) {
  return useQuery({ ...getUploadsQueryOptions(), enabled });
}
