import { createReadStream } from "node:fs";
import { pipeline } from "node:stream/promises";
import type { Request, Response } from "express";
import { AppError, ERRORS } from "../../lib/errors";
import type { ScoreFileOnDisk } from "./score-files";

export interface ByteRange {
  start: number;
  end: number;
}

/**
 * One byte range from a `Range` header over a file of `size` bytes: `bytes=a-b`, `bytes=a-`, `bytes=-n`.
 * Null means "send the whole file" (no header, another unit, or several ranges); "unsatisfiable" means 416.
 */
export function parseRange(header: string | undefined, size: number): ByteRange | null | "unsatisfiable" {
  if (!header) return null;
  const match = /^bytes=\s*(\d*)\s*-\s*(\d*)\s*$/.exec(header.trim());
  if (!match) return null;
  const [, from, to] = match;
  if (from === "" && to === "") return null;
  if (from === "") {
    const suffix = Number(to);
    if (suffix === 0 || size === 0) return "unsatisfiable";
    return { start: Math.max(0, size - suffix), end: size - 1 };
  }
  const start = Number(from);
  if (start >= size) return "unsatisfiable";
  const end = to === "" ? size - 1 : Math.min(Number(to), size - 1);
  if (end < start) return "unsatisfiable";
  return { start, end };
}

/** `attachment; filename="…"` with a plain ASCII fallback and the exact name in `filename*`. */
export function attachment(name: string): string {
  const ascii = name.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_");
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name)}`;
}

/** A name safe in any file system: letters, digits, dot, dash and underscore; runs of others become one dash. */
export function safeFileStem(raw: string): string {
  const stem = raw
    .normalize("NFKD")
    .replace(/[^A-Za-z0-9._-]+/g, "-")
    .replace(/^[-.]+|[-.]+$/g, "")
    .slice(0, 80);
  return stem || "graph";
}

/** Streams a file with validators and single-range support (206, 416); HEAD gets the headers only. */
export async function sendFileWithRanges(
  req: Request,
  res: Response,
  file: ScoreFileOnDisk,
  options: { contentType: string; filename: string },
): Promise<void> {
  const etag = `"${file.bytes.toString(16)}-${file.mtime.getTime().toString(16)}"`;
  res.setHeader("Accept-Ranges", "bytes");
  res.setHeader("ETag", etag);
  res.setHeader("Last-Modified", file.mtime.toUTCString());
  res.setHeader("Content-Type", options.contentType);
  res.setHeader("Content-Disposition", attachment(options.filename));
  res.setHeader("Cache-Control", "private, no-cache");

  const ifRange = req.get("if-range");
  const rangeAllowed = !ifRange || ifRange === etag || ifRange === file.mtime.toUTCString();
  const range = rangeAllowed ? parseRange(req.get("range"), file.bytes) : null;
  if (range === "unsatisfiable") {
    res.removeHeader("Content-Disposition");
    res.removeHeader("ETag");
    res.setHeader("Content-Range", `bytes */${file.bytes}`);
    throw new AppError(ERRORS.rangeNotSatisfiable, {
      message: `The file has ${file.bytes} bytes; the range ${req.get("range")} is outside it.`,
      details: { size: file.bytes },
    });
  }
  if (range) {
    res.status(206);
    res.setHeader("Content-Range", `bytes ${range.start}-${range.end}/${file.bytes}`);
    res.setHeader("Content-Length", String(range.end - range.start + 1));
  } else {
    res.status(200);
    res.setHeader("Content-Length", String(file.bytes));
  }
  if (req.method === "HEAD" || file.bytes === 0) {
    res.end();
    return;
  }
  const stream = createReadStream(file.path, range ? { start: range.start, end: range.end } : {});
  await pipeline(stream, res).catch((error: unknown) => {
    // A client that goes away mid-download is normal (it resumes with a range); anything else is ours.
    if (!res.destroyed && !res.writableEnded) throw error;
  });
}
