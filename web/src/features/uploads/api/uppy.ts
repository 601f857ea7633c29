import Uppy from "@uppy/core";
import Tus from "@uppy/tus";
import { getCsrfToken } from "../../../lib/api-client";

export const UPLOAD_ENDPOINT = "/api/uploads";

/**
 * One Uppy instance per upload panel. The instance id and the endpoint are fixed so a file added again after a reload
 * gets the same fingerprint, and tus finds its stored upload URL and resumes at the server's offset.
 */
export const MAX_FILES = 5;

export function createUploader(): Uppy {
  return new Uppy({
    id: "stillpoint-edge-list",
    autoProceed: false,
    restrictions: { maxNumberOfFiles: MAX_FILES },
  }).use(Tus, {
    endpoint: UPLOAD_ENDPOINT,
    withCredentials: true,
    // Large files go in pieces so the server records the offset often; a dropped connection loses one piece at most.
    chunkSize: 32 * 1024 * 1024,
    retryDelays: [0, 1000, 3000, 5000, 10000],
    removeFingerprintOnSuccess: true,
    allowedMetaFields: ["name", "type"],
    headers: (): Record<string, string> => {
      const csrf = getCsrfToken();
      return csrf ? { "X-CSRF-Token": csrf } : {};
    },
  });
}

/** The tus id is the last path segment of the upload URL the server created. */
export function tusIdOf(uploadUrl: string | null | undefined): string | null {
  if (!uploadUrl) return null;
  const last = uploadUrl.split("?")[0]?.split("/").filter(Boolean).pop();
  return last ?? null;
}
