import "@uppy/core/css/style.min.css";
import "@uppy/dashboard/css/style.min.css";
import type Uppy from "@uppy/core";
import Dashboard from "@uppy/react/dashboard";
import { useEffect, useState } from "react";
import { Loading } from "../../../components/ui/loading";
import { formatBytes } from "../../../lib/format";
import type { UploadLimits } from "../api/get-uploads";
import { createUploader, MAX_FILES, tusIdOf } from "../api/uppy";

type UploadPanelProps = {
  limits: UploadLimits | null;
  /** Called with the tus id of each file the server has received in full. */
  onUploaded: (tusId: string) => void;
};

/**
 * Drag-and-drop upload with tus: pause, resume and retry in the dashboard; after a dropped connection or a closed tab,
 * adding the same file again continues from the server's offset.
 */
export function UploadPanel({ limits, onUploaded }: UploadPanelProps) {
  const maxBytes = limits?.maxUploadBytes ?? null;
  const [uppy, setUppy] = useState<Uppy | null>(null);

  useEffect(() => {
    const instance = createUploader();
    setUppy(instance);
    return () => instance.destroy();
  }, []);

  // Limits arrive after the dashboard is up; changing them must not replace the instance and drop its files.
  useEffect(() => {
    uppy?.setOptions({ restrictions: { maxFileSize: maxBytes, maxNumberOfFiles: MAX_FILES } });
  }, [uppy, maxBytes]);

  useEffect(() => {
    if (!uppy) return;
    const handler = (_file: unknown, response: { uploadURL?: string | null }) => {
      const tusId = tusIdOf(response.uploadURL);
      if (tusId) onUploaded(tusId);
    };
    uppy.on("upload-success", handler);
    return () => {
      uppy.off("upload-success", handler);
    };
  }, [uppy, onUploaded]);

  const note = [
    "CSV, TSV or space-separated edge lists, gzip welcome",
    maxBytes ? `up to ${formatBytes(maxBytes)} each` : null,
    limits?.quotaBytes ? `team storage ${formatBytes(limits.usedBytes)} of ${formatBytes(limits.quotaBytes)} used` : null,
    limits ? `unfinished uploads are removed after ${limits.unfinishedExpiryHours} h` : null,
  ]
    .filter(Boolean)
    .join(" · ");

  return (
    <div className="stillpoint-uppy">
      {uppy ? (
        <Dashboard
          uppy={uppy}
          width="100%"
          height={300}
          theme="light"
          note={null}
          proudlyDisplayPoweredByUppy={false}
          hideProgressDetails={false}
          showRemoveButtonAfterComplete
          doneButtonHandler={() => uppy.clear()}
        />
      ) : (
        <Loading label="Preparing the uploader…" />
      )}
      <p className="mt-2 text-xs text-ink-muted">{note}.</p>
    </div>
  );
}
